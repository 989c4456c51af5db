/**
 * Canonical serialisation used for every hash in the archive.
 *
 * Rules (compatible with RFC 8785, JSON Canonicalization Scheme, for the data we store):
 * - object keys sorted by UTF-16 code units (JavaScript's default string order), at every depth;
 * - no whitespace between tokens;
 * - strings and numbers written as ECMAScript JSON.stringify writes them (shortest round-trip numbers);
 * - object properties whose value is `undefined` are omitted (as JSON does);
 * - non-finite numbers, functions, symbols, bigints and `undefined` inside arrays are refused, because JSON
 *   would silently turn them into `null` and the stored record would no longer be what was hashed.
 * The text is hashed as UTF-8.
 */
import { createHash } from 'node:crypto';
import { ArchiveInputError } from './errors.ts';

/** Serialises `value` canonically (see the module comment); throws ArchiveInputError naming the bad path. */
export function canonicalJson(value: unknown): string {
  return write(value, '$');
}

/** SHA-256 of the UTF-8 bytes of `text`, as 64 lowercase hex digits. */
export function sha256Hex(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

/** SHA-256 hex of the canonical serialisation of `value`. */
export function canonicalHash(value: unknown): string {
  return sha256Hex(canonicalJson(value));
}

function write(value: unknown, path: string): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'string':
    case 'boolean':
      return JSON.stringify(value);
    case 'number':
      if (!Number.isFinite(value)) throw new ArchiveInputError(path, `non-finite number ${value} cannot be archived`);
      return JSON.stringify(value);
    case 'object':
      break;
    default:
      throw new ArchiveInputError(path, `a ${typeof value} cannot be archived`);
  }
  if (Array.isArray(value)) {
    return `[${value.map((item, i) => {
      if (item === undefined) throw new ArchiveInputError(`${path}[${i}]`, 'undefined inside an array cannot be archived');
      return write(item, `${path}[${i}]`);
    }).join(',')}]`;
  }
  const withJson = value as { toJSON?: () => unknown };
  if (typeof withJson.toJSON === 'function') return write(withJson.toJSON(), path);
  const record = value as Record<string, unknown>;
  const keys = Object.keys(record).filter((k) => record[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${write(record[k], `${path}.${k}`)}`).join(',')}}`;
}
