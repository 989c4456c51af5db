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
 *
 * How (this runs on every submission's problem hash and every archive entry): one walk checks the value and
 * builds a copy whose objects get their keys inserted already sorted (arrays of primitives are taken as they
 * are), then the engine's JSON.stringify writes the copy in one go: no text is built piece by piece in script,
 * and the garbage is a few small objects instead of a string per token. Engines enumerate array-index keys
 * ("0", "10", "9") before all others, in numeric order whatever the insertion order, so once an object with a
 * key starting with a digit is met, the copy is written by a small recursive writer that sorts every object's
 * keys itself instead.
 */
import { InvalidInputError } from './errors.ts';

/** One call's walk: the path from the root (pushed and popped; made text only for an error) and whether an
 * object with a digit-led key (a possible array index) was copied. */
interface Walk {
  parts: (string | number)[];
  digitKeys: boolean;
}

/** Serialises `value` canonically (see the module comment); throws InvalidInputError (code NOT_JSON) naming
 * the bad path (`$.a.b[1]`). */
export function canonicalJson(value: unknown): string {
  const walk: Walk = { parts: [], digitKeys: false };
  const copy = checkedCopy(value, walk);
  return walk.digitKeys ? writeSorted(copy) : JSON.stringify(copy);
}

/** Field path of the value at `parts` below `$`, built only for an error message (hashing sits on the
 * submission path, so no path text is made while walking). */
function refuse(parts: readonly (string | number)[], message: string): never {
  const path = parts.reduce<string>((p, k) => (typeof k === 'number' ? `${p}[${k}]` : `${p}.${k}`), '$');
  throw new InvalidInputError(path, message, 'NOT_JSON');
}

/** `value` checked and copied: primitives as they are, arrays item by item (see arrayCopy), objects with their keys
 * inserted in canonical order and `undefined` properties left out, `toJSON` (of a non-array) replaced by its
 * result. The walk visits in canonical order, so the first refusal is the first bad value of the text. */
function checkedCopy(value: unknown, walk: Walk): unknown {
  switch (typeof value) {
    case 'string':
    case 'boolean':
      return value;
    case 'number':
      if (!Number.isFinite(value)) refuse(walk.parts, `non-finite number ${value} has no JSON form`);
      return value;
    case 'object':
      if (value === null) return null;
      break;
    default:
      refuse(walk.parts, `a ${typeof value} has no JSON form`);
  }
  if (Array.isArray(value)) return arrayCopy(value, walk);
  const withJson = value as { toJSON?: () => unknown };
  if (typeof withJson.toJSON === 'function') return checkedCopy(withJson.toJSON(), walk);
  return objectCopy(value as Record<string, unknown>, walk);
}

/** `array` itself when its items are checked primitives and it has no `toJSON` (JSON.stringify would call it,
 * the canonical rule does not): vectors, most of a problem's arrays, are then not copied. Otherwise a plain
 * array of the items' copies. */
function arrayCopy(array: readonly unknown[], walk: Walk): readonly unknown[] {
  let copy: unknown[] | undefined;
  for (let i = 0; i < array.length; i++) {
    walk.parts.push(i);
    const item = array[i];
    if (item === undefined) refuse(walk.parts, 'undefined inside an array has no JSON form');
    const itemCopy = checkedCopy(item, walk);
    walk.parts.pop();
    if (copy === undefined && itemCopy !== item) copy = plainPrefix(array, i);
    copy?.push(itemCopy);
  }
  if (copy !== undefined) return copy;
  return typeof (array as { toJSON?: unknown }).toJSON === 'function' ? plainPrefix(array, array.length) : array;
}

/** The first `n` items of `array` in a new plain array (not `slice`, which keeps a subclass and its `toJSON`). */
function plainPrefix(array: readonly unknown[], n: number): unknown[] {
  const out: unknown[] = [];
  for (let i = 0; i < n; i++) out.push(array[i]);
  return out;
}

/** A new plain object holding the copies of `record`'s own enumerable properties, keys inserted in canonical
 * order (which JSON.stringify keeps for keys that are not array indices), `undefined` ones left out. */
function objectCopy(record: Record<string, unknown>, walk: Walk): Record<string, unknown> {
  const keys = sortedInPlace(Object.keys(record));
  const copy: Record<string, unknown> = {};
  for (const k of keys) {
    const field = record[k];
    if (field === undefined) continue;
    const first = k.charCodeAt(0);
    if (first >= 0x30 && first <= 0x39) walk.digitKeys = true;
    walk.parts.push(k);
    const fieldCopy = checkedCopy(field, walk);
    walk.parts.pop();
    // Assigning "__proto__" would set the copy's prototype; JSON.parse makes it an ordinary own key.
    if (k === '__proto__') {
      Object.defineProperty(copy, k, { value: fieldCopy, enumerable: true, writable: true, configurable: true });
    } else {
      copy[k] = fieldCopy;
    }
  }
  return copy;
}

/** The canonical JSON of a checked copy, every object's keys sorted here: for copies holding a digit-led key,
 * which JSON.stringify would put first (see the module comment). Rare, so written plainly. */
function writeSorted(value: unknown): string {
  if (typeof value !== 'object' || value === null) return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(writeSorted).join(',')}]`;
  const record = value as Record<string, unknown>;
  return `{${Object.keys(record).sort().map((k) => `${JSON.stringify(k)}:${writeSorted(record[k])}`).join(',')}}`;
}

/** `keys` sorted by UTF-16 code units (the order of Array.prototype.sort without a comparator, which is what
 * RFC 8785 asks for), in place by insertion: objects here have a few dozen keys at most, and the built-in sort
 * allocates working storage on every call, which on the submission path was most of the hash's garbage.
 * Exported for the tests' reference writer (test/contract/canonical-json-reference.ts) only. */
export function sortedInPlace(keys: string[]): string[] {
  for (let i = 1; i < keys.length; i++) {
    const key = keys[i]!;
    let j = i - 1;
    while (j >= 0 && keys[j]! > key) { keys[j + 1] = keys[j]!; j--; }
    keys[j + 1] = key;
  }
  return keys;
}
