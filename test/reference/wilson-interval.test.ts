/**
 * The 95 % Wilson score interval of a binomial proportion (Wilson 1927, J. Am. Stat. Assoc. 22:209–212)
 * against the worked examples of R. G. Newcombe, "Two-sided confidence intervals for the single proportion:
 * comparison of seven methods", Statistics in Medicine 17 (1998) 857–872, Table II, method 3 (score method
 * without continuity correction), printed to 4 decimals (values written from memory; the 0/20 upper bound is
 * also the closed form (z²/n)/(1 + z²/n) = 0.16113). Limit: half a unit in the 4th decimal, the table's own
 * rounding. The boundary cases 0/n and n/n must be exactly 0 and 1 (the score interval's bound is zero by
 * construction there; a difference of nearly equal terms used to print 1e-19).
 */
import { describe, expect, it } from 'vitest';
import { binomialEstimate } from '../../planner/dispersion/index.ts';

const NEWCOMBE_1998_TABLE_II: [hits: number, n: number, lower: number, upper: number][] = [
  [81, 263, 0.2553, 0.3662],
  [15, 148, 0.0624, 0.1605],
  [0, 20, 0.0, 0.1611],
  [1, 29, 0.0061, 0.1718],
];

describe('binomialEstimate (Wilson 95 % score interval)', () => {
  describe('when compared with Newcombe (1998) Table II', () => {
    it.each(NEWCOMBE_1998_TABLE_II)('should reproduce %i/%i within the table rounding', (hits, n, lower, upper) => {
      const e = binomialEstimate(hits, n);
      expect(Math.abs(e.lower95 - lower), `lower ${e.lower95} vs ${lower}`).toBeLessThanOrEqual(5e-5);
      expect(Math.abs(e.upper95 - upper), `upper ${e.upper95} vs ${upper}`).toBeLessThanOrEqual(5e-5);
    });
  });

  describe('when no sample or every sample hits', () => {
    it.each([1, 7, 20, 10_000, 1_000_000])('should give exactly 0 / exactly 1 for n = %i', (n) => {
      const none = binomialEstimate(0, n);
      expect(none.lower95).toBe(0);
      // Closed form of the upper bound at 0 hits: (z²/n)/(1 + z²/n) (Wilson 1927).
      const z2n = 1.959963984540054 ** 2 / n;
      expect(Math.abs(none.upper95 - z2n / (1 + z2n))).toBeLessThan(1e-15);
      const all = binomialEstimate(n, n);
      expect(all.upper95).toBe(1);
      expect(Math.abs(all.lower95 - 1 / (1 + z2n))).toBeLessThan(1e-15);
    });
  });
});
