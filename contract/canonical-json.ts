/**
 * The one canonical JSON rule, behind every hash of the project (the archive's entry chain, the planner's
 * problem hash, the queue's request hash, the console's re-check of the chain). The hash itself is SHA-256
 * hex of this text's UTF-8 bytes, computed where a digest is at hand (node:crypto in the server rooms,
 * WebCrypto in the browser): this room uses no Node API.
 *
 * Rules (compatible with RFC 8785, JSON Canonicalization Scheme, for the data we store):
 * - object keys sorted by UTF-16 code units (JavaScript's default string order), at every depth;
 * - no whitespace between tokens;
 * - strings and numbers written as ECMAScript JSON.stringify writes them (shortest round-trip numbers);
 * - object properties whose value is `undefined` are omitted (as JSON does);
 * - non-finite numbers, functions, symbols, bigints and `undefined` inside arrays are refused, because JSON
 *   would silently turn them into `null` and the stored record would no longer be what was hashed.
 */
import { InvalidInputError } from './errors.ts';

/** Serialises `value` canonically (see the module comment); throws InvalidInputError (code NOT_JSON) naming
 * the bad path (`$.a.b[1]`). */
export function canonicalJson(value: unknown): string {
  const out: string[] = [];
  write(value, [], out);
  return out.join('');
}

/** Field path of the value at `parts` below `$`, built only for an error message (hashing sits on the
 * submission path, so no path text is made while writing). */
function refuse(parts: readonly (string | number)[], message: string): never {
  const path = parts.reduce<string>((p, k) => (typeof k === 'number' ? `${p}[${k}]` : `${p}.${k}`), '$');
  throw new InvalidInputError(path, message, 'NOT_JSON');
}

/** Appends the canonical JSON of `value` to `out`; `parts` is the path from the root (pushed and popped). */
function write(value: unknown, parts: (string | number)[], out: string[]): void {
  if (value === null) { out.push('null'); return; }
  switch (typeof value) {
    case 'string':
    case 'boolean':
      out.push(JSON.stringify(value));
      return;
    case 'number':
      if (!Number.isFinite(value)) refuse(parts, `non-finite number ${value} has no JSON form`);
      out.push(JSON.stringify(value));
      return;
    case 'object':
      break;
    default:
      refuse(parts, `a ${typeof value} has no JSON form`);
  }
  if (Array.isArray(value)) {
    out.push('[');
    for (let i = 0; i < value.length; i++) {
      if (i > 0) out.push(',');
      parts.push(i);
      if (value[i] === undefined) refuse(parts, 'undefined inside an array has no JSON form');
      write(value[i], parts, out);
      parts.pop();
    }
    out.push(']');
    return;
  }
  const withJson = value as { toJSON?: () => unknown };
  if (typeof withJson.toJSON === 'function') { write(withJson.toJSON(), parts, out); return; }
  const record = value as Record<string, unknown>;
  const keys = Object.keys(record).filter((k) => record[k] !== undefined).sort();
  out.push('{');
  keys.forEach((k, i) => {
    out.push(i > 0 ? ',' : '', JSON.stringify(k), ':');
    parts.push(k);
    write(record[k], parts, out);
    parts.pop();
  });
  out.push('}');
}
