/**
 * The canonical serialisation behind every archive hash, checked against RFC 8785 (JSON Canonicalization
 * Scheme) examples and the FIPS 180-2 SHA-256 test vector.
 */
import { describe, expect, it } from 'vitest';
import { canonicalJson, sha256Hex } from '../../archive/index.ts';

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

  describe('when hashing', () => {
    it('should give the FIPS 180-2 SHA-256 value for "abc"', () => {
      // FIPS 180-2 Appendix B.1 (common published test vector).
      expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    });
  });
});
