/**
 * The canonical serialisation behind every archive hash, checked against RFC 8785 (JSON Canonicalization
 * Scheme) examples and the FIPS 180-2 SHA-256 test vector.
 */
import { describe, expect, it } from 'vitest';
import { canonicalJson, sha256Hex } from '../../archive/index.ts';
import { InvalidInputError } from '../../contract/errors.ts';
import { referenceCanonicalJson } from '../contract/canonical-json-reference.ts';
import { randomValues } from '../contract/canonical-json-values.ts';

/** The text, or the refusal (class, code, field, message), of one writer on `value`. */
function outcome(write: (value: unknown) => string, value: unknown): string {
  try {
    return `text ${write(value)}`;
  } catch (e) {
    if (!(e instanceof InvalidInputError)) throw e;
    return `refused ${e.code} ${e.field} ${e.message}`;
  }
}

/** The value of IEEE 754 binary64 bit pattern `hex` (16 hex digits). */
function binary64(hex: string): number {
  const view = new DataView(new ArrayBuffer(8));
  view.setBigUint64(0, BigInt(`0x${hex}`));
  return view.getFloat64(0);
}

describe('canonical JSON', () => {
  describe('when given the RFC 8785 §3.2.2 sample', () => {
    it('should reproduce the RFC\'s canonical text (numbers, escapes, key order)', () => {
      // RFC 8785 §3.2.2 input and output (typed from memory; reproduced exactly).
      const input = JSON.parse('{"numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001],'
        + ' "string": "\\u20ac$\\u000F\\u000aA\'\\u0042\\u0022\\u005c\\\\\\"\\/", "literals": [null, true, false]}');
      expect(canonicalJson(input)).toBe('{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],'
        + '"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}');
    });
  });

  describe('when keys are outside ASCII', () => {
    it('should sort them by UTF-16 code units as RFC 8785 §3.2.3 shows', () => {
      // RFC 8785 §3.2.3 sorting example (from memory): \r, 1, U+0080, ö, €, 😀 (surrogate pair D83D), U+FB33.
      const keys = ['\u20ac', '\r', '\ufb33', '1', '\ud83d\ude00', '\u0080', '\u00f6'];
      const object = Object.fromEntries(keys.map((k, i) => [k, i]));
      const sorted = ['\r', '1', '\u0080', '\u00f6', '\u20ac', '\ud83d\ude00', '\ufb33'];
      // Compare the text itself: JSON.parse would reorder the integer-like key '1' first.
      expect(canonicalJson(object)).toBe(`{${sorted.map((k) => `${JSON.stringify(k)}:${keys.indexOf(k)}`).join(',')}}`);
    });
  });

  describe('when values JSON would silently alter', () => {
    it('should refuse them, naming the path', () => {
      expect(() => canonicalJson({ a: { b: [0, Infinity] } })).toThrow('$.a.b[1]: non-finite number Infinity');
      expect(() => canonicalJson({ a: [undefined] })).toThrow('$.a[0]');
      expect(() => canonicalJson({ a: 1n })).toThrow('$.a: a bigint');
      expect(canonicalJson({ a: undefined, b: 1 })).toBe('{"b":1}');
    });
  });

  describe('when numbers sit at the edges of their shortest form', () => {
    it('should write the RFC 8785 Appendix B values', () => {
      // RFC 8785 Appendix B, IEEE 754 bit pattern → canonical text (a selection, typed from memory).
      const cases: [string, string][] = [
        ['0000000000000000', '0'], ['8000000000000000', '0'], ['0000000000000001', '5e-324'],
        ['8000000000000001', '-5e-324'], ['7fefffffffffffff', '1.7976931348623157e+308'],
        ['4340000000000000', '9007199254740992'], ['444b1ae4d6e2ef50', '1e+21'], ['444b1ae4d6e2ef4f', '999999999999999900000'],
        ['3eb0c6f7a0b5ed8d', '0.000001'], ['3eb0c6f7a0b5ed8c', '9.999999999999997e-7'],
      ];
      for (const [hex, text] of cases) expect(canonicalJson([binary64(hex)]), hex).toBe(`[${text}]`);
    });
  });

  describe('when keys look like array indices', () => {
    it('should still order them by UTF-16 code units, at any depth', () => {
      // Engines enumerate "0", "9", "10" first and numerically; the canonical order is "0" < "01" < "10" < "9" < "a".
      const object = { a: 4, 10: 1, 9: 2, '01': 5, 0: 3 };
      expect(canonicalJson(object)).toBe('{"0":3,"01":5,"10":1,"9":2,"a":4}');
      expect(canonicalJson({ z: [{ y: { 2: true, 10: null, b: 'x' } }], a: {} }))
        .toBe('{"a":{},"z":[{"y":{"10":null,"2":true,"b":"x"}}]}');
      expect(canonicalJson({ '4294967295': 1, '4294967294': 2, '-1': 3 })).toBe('{"-1":3,"4294967294":2,"4294967295":1}');
    });
  });

  describe('when values are unusual but valid JSON', () => {
    it('should write them as the ECMAScript JSON.stringify does', () => {
      // ECMA-262 (2019 onwards, "well-formed JSON.stringify"): lone surrogates are escaped as \uXXXX, lower case.
      expect(canonicalJson(['\ud800', 'x\udc00', '\ud83d\ude00', '\u2028'])).toBe('["\\ud800","x\\udc00","😀","\u2028"]');
      expect(canonicalJson({ b: [], a: {}, c: [[], [{}]], d: { e: { f: {} } } }))
        .toBe('{"a":{},"b":[],"c":[[],[{}]],"d":{"e":{"f":{}}}}');
      // JSON.parse makes "__proto__" an ordinary own key; it is data like any other.
      expect(canonicalJson(JSON.parse('{"b":1,"__proto__":{"y":1,"x":2}}'))).toBe('{"__proto__":{"x":2,"y":1},"b":1}');
      expect(canonicalJson({ toJSON: 5, a: 1 })).toBe('{"a":1,"toJSON":5}');
    });
    it('should write what toJSON returns for objects, and ignore toJSON on arrays', () => {
      expect(canonicalJson({ at: new Date(Date.UTC(2031, 2, 1)) })).toBe('{"at":"2031-03-01T00:00:00.000Z"}');
      expect(canonicalJson({ w: { toJSON: () => ({ b: [1], a: -0 }) } })).toBe('{"w":{"a":0,"b":[1]}}');
      const tagged = Object.assign([3, 1], { toJSON: () => 'not used' });
      expect(canonicalJson({ v: tagged })).toBe('{"v":[3,1]}');
      class Tagged extends Array<number> { toJSON(): string { return 'not used'; } }
      expect(canonicalJson(Tagged.from([2, 4]))).toBe('[2,4]');
      expect(() => canonicalJson({ a: { toJSON: () => undefined } })).toThrow('$.a: a undefined has no JSON form');
      // A hole reads as undefined.
      expect(() => canonicalJson({ a: [1, , 2] })).toThrow('$.a[1]: undefined inside an array');
    });
  });

  describe('when compared with the earlier writer on generated values', () => {
    it('should give the same text for every valid value', () => {
      const values = randomValues(1, 3000, 0);
      const differing = values.filter((v) => outcome(canonicalJson, v) !== outcome(referenceCanonicalJson, v));
      expect(differing.map((v) => outcome(referenceCanonicalJson, v))).toEqual([]);
      // The generator reaches the cases that matter (otherwise this test could not fail for them).
      const texts = values.map((v) => canonicalJson(v)).join('\n');
      for (const piece of ['"10":', '"__proto__":', '"toJSON":', '\\ud800', '1e+21', '5e-324', '{}', '[]', '.000Z"']) {
        expect(texts, piece).toContain(piece);
      }
    });
    it('should refuse the same values with the same path and message', () => {
      const values = randomValues(2, 3000, 0.04);
      const outcomes = values.map((v) => outcome(canonicalJson, v));
      const differing = values.filter((v, i) => outcomes[i] !== outcome(referenceCanonicalJson, v));
      expect(differing.map((v) => outcome(referenceCanonicalJson, v))).toEqual([]);
      const refused = outcomes.filter((o) => o.startsWith('refused NOT_JSON $.'));
      expect(refused.length).toBeGreaterThan(100); // 237 in this stream: refusals below the root are well exercised
      for (const kind of ['non-finite number', 'a function', 'a symbol', 'a bigint', 'undefined inside an array', ']', '.']) {
        expect(refused.some((o) => o.includes(kind)), kind).toBe(true);
      }
    });
  });

  describe('when hashing', () => {
    it('should give the FIPS 180-2 SHA-256 value for "abc"', () => {
      // FIPS 180-2 Appendix B.1 (common published test vector).
      expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    });
  });
});
