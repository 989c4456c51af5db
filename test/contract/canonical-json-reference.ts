/**
 * The canonical JSON writer as it stood before the copy-then-JSON.stringify rewrite (contract/canonical-json.ts
 * at commit 1f3e786, kept as it was but for the comments; its in-place key sort is still the module's, imported).
 * The reference the rewrite is checked against, text for text and refusal for refusal, on generated values
 * (test/archive/canonical-json.test.ts); bench/canonical-json.bench.ts times it as the peer. The key order itself
 * is pinned by the literal texts of those tests (RFC 8785 §3.2.3 and the array-index-like keys).
 */
import { sortedInPlace } from '../../contract/canonical-json.ts';
import { InvalidInputError } from '../../contract/errors.ts';

/** The canonical JSON of `value` by the earlier writer; throws InvalidInputError (code NOT_JSON) naming the
 * bad path (`$.a.b[1]`). */
export function referenceCanonicalJson(value: unknown): string {
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
