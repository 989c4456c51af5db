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
  return write(value, []);
}

/** Field path of the value at `parts` below `$`, built only for an error message (hashing sits on the
 * submission path, so no path text is made while writing). */
function refuse(parts: readonly (string | number)[], message: string): never {
  const path = parts.reduce<string>((p, k) => (typeof k === 'number' ? `${p}[${k}]` : `${p}.${k}`), '$');
  throw new InvalidInputError(path, message, 'NOT_JSON');
}

/** The canonical JSON of `value`; `parts` is the path from the root (pushed and popped). Built by string
 * concatenation (no array of pieces to join) and without intermediate key lists: this runs on every
 * submission's problem hash. */
function write(value: unknown, parts: (string | number)[]): string {
  switch (typeof value) {
    case 'string':
      return JSON.stringify(value);
    case 'number':
      if (!Number.isFinite(value)) refuse(parts, `non-finite number ${value} has no JSON form`);
      return JSON.stringify(value);
    case 'boolean':
      return value ? 'true' : 'false';
    case 'object':
      if (value === null) return 'null';
      break;
    default:
      refuse(parts, `a ${typeof value} has no JSON form`);
  }
  if (Array.isArray(value)) {
    let text = '[';
    for (let i = 0; i < value.length; i++) {
      parts.push(i);
      if (value[i] === undefined) refuse(parts, 'undefined inside an array has no JSON form');
      text += (i > 0 ? ',' : '') + write(value[i], parts);
      parts.pop();
    }
    return `${text}]`;
  }
  const withJson = value as { toJSON?: () => unknown };
  if (typeof withJson.toJSON === 'function') return write(withJson.toJSON(), parts);
  const record = value as Record<string, unknown>;
  const keys = sortedInPlace(Object.keys(record));
  let text = '{';
  let first = true;
  for (const k of keys) {
    const field = record[k];
    if (field === undefined) continue;
    parts.push(k);
    text += `${first ? '' : ','}${JSON.stringify(k)}:${write(field, parts)}`;
    parts.pop();
    first = false;
  }
  return `${text}}`;
}

/** `keys` sorted by UTF-16 code units (the order of Array.prototype.sort without a comparator, which is what
 * RFC 8785 asks for), in place by insertion: objects here have a few dozen keys at most, and the built-in sort
 * allocates working storage on every call, which on the submission path was most of the hash's garbage. */
function sortedInPlace(keys: string[]): string[] {
  for (let i = 1; i < keys.length; i++) {
    const key = keys[i]!;
    let j = i - 1;
    while (j >= 0 && keys[j]! > key) { keys[j + 1] = keys[j]!; j--; }
    keys[j + 1] = key;
  }
  return keys;
}
