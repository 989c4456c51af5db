/**
 * Generated values for comparing contract/canonical-json.ts with the earlier writer
 * (canonical-json-reference.ts): nested objects and arrays with keys in random insertion order, keys that are
 * or look like array indices, "__proto__" and "toJSON" as ordinary keys, objects with a toJSON method, strings
 * with escapes, lone surrogates and non-ASCII text, numbers at the edges of the shortest round-trip form, and
 * now and then a value JSON would alter (which both must refuse alike). Seeded, so every run sees the same values.
 */
import { sampleRandom, type SampleRandom } from '../../planner/dispersion/random.ts';

const KEYS = ['a', 'b', 'B', '', 'é', '\u20ac', '\ud83d\ude00', '\ufb33', '\r', 'toJSON', '__proto__', 'constructor',
  '0', '1', '9', '10', '01', '1a', '-1', '4294967294', '4294967295', ' 1', 'x.y', '"q"'];
const STRINGS = ['', 'plain', 'quote " and \\ backslash', 'tab\tnew\nline\u0000\u001f\u007f', '\u2028\u2029',
  '\ud800', '\udc00x', 'a\ud83d', '\ud83d\ude00', 'ö€\ufb33', '</script>', '1', '-0'];
const NUMBERS = [0, -0, 1, -1, 0.1, 1e21, 1e20, 999999999999999900000, 1e-6, 1e-7, 5e-324, Number.MAX_VALUE,
  Number.MAX_SAFE_INTEGER, -Number.MAX_SAFE_INTEGER, 2 ** 53, 4.35, 0.002, 333333333.33333329, 1e30, 1e-27];
/** Values JSON would alter; `undefined` is refused only inside an array (or as the whole value). */
const REFUSED: readonly (() => unknown)[] = [() => Infinity, () => -Infinity, () => NaN, () => () => 1,
  () => Symbol('s'), () => 10n, () => undefined];

/** An object holding `value` as its toJSON result (the canonical form is that of the result). */
class Wrapped {
  constructor(private readonly inner: unknown) {}
  toJSON(): unknown { return this.inner; }
}

function pick<T>(r: SampleRandom, items: readonly T[]): T {
  return items[Math.floor(r.uniform() * items.length)]!;
}

function primitive(r: SampleRandom): unknown {
  const u = r.uniform();
  if (u < 0.35) return pick(r, STRINGS);
  if (u < 0.55) return pick(r, NUMBERS);
  if (u < 0.75) return (r.uniform() - 0.5) * 10 ** Math.floor(r.uniform() * 40 - 20);
  if (u < 0.85) return r.uniform() < 0.5;
  return null;
}

/** A random value of nesting depth at most `depth`; `refusals` is the chance of a value JSON would alter. */
export function randomValue(r: SampleRandom, depth: number, refusals: number): unknown {
  if (r.uniform() < refusals) return pick(r, REFUSED)();
  const u = depth > 0 ? r.uniform() : 0;
  if (u < 0.4) return primitive(r);
  if (u < 0.6) return Array.from({ length: Math.floor(r.uniform() * 4) }, () => randomValue(r, depth - 1, refusals));
  if (u < 0.65) {
    return r.uniform() < 0.5 ? new Wrapped(randomValue(r, depth - 1, refusals)) : new Date(Math.floor(r.uniform() * 4e12));
  }
  const record: Record<string, unknown> = {};
  for (let n = Math.floor(r.uniform() * 6); n > 0; n--) {
    const value = r.uniform() < 0.1 ? undefined : randomValue(r, depth - 1, refusals);
    // defineProperty: a plain assignment of "__proto__" would set the prototype, not add a key.
    Object.defineProperty(record, pick(r, KEYS), { value, enumerable: true, writable: true, configurable: true });
  }
  return record;
}

/** The `count` values of the seeded stream `seed`. */
export function randomValues(seed: number, count: number, refusals: number): unknown[] {
  return Array.from({ length: count }, (_, i) => randomValue(sampleRandom(seed, i), 4, refusals));
}
