/**
 * Third-body acceleration in Battin's f(q) form against the same physics evaluated in 50-digit decimal
 * arithmetic (decimal.js, a general-purpose arbitrary-precision library). Source of the form: Battin,
 * An Introduction to the Mathematics and Methods of Astrodynamics (AIAA 1999), §8.4. The direct +
 * indirect difference -gm (d/|d|^3 + s/|s|^3) subtracts two nearly equal vectors when |r| ≪ |s|; the
 * test shows that the naive double-precision difference loses about log10(|s|/|r|) digits while f(q)
 * stays at round-off.
 */
import { Decimal } from 'decimal.js';
import { describe, expect, it } from 'vitest';
import { addThirdBody } from '../../propagator/forces/index.ts';

const D = Decimal.clone({ precision: 50 });

// Integer-valued inputs are exact in both float64 and decimal, so the reference sees the same problem.
const GM = 126712764; // km^3/s^2, a Jupiter-like value (integer so it is exact in both)
const R = [7000, -1200, 3100]; // spacecraft from the central body, km
const S_DIRECTION = [5, 3, -2];

function exactAcceleration(s: number[]): Decimal[] {
  const r = R.map((v) => new D(v));
  const sd = s.map((v) => new D(v));
  const d = r.map((v, i) => v.minus(sd[i]));
  const norm3 = (v: Decimal[]): Decimal => v[0].pow(2).plus(v[1].pow(2)).plus(v[2].pow(2)).sqrt().pow(3);
  const dn3 = norm3(d);
  const sn3 = norm3(sd);
  return d.map((di, i) => di.div(dn3).plus(sd[i].div(sn3)).times(-GM));
}

function relativeError(value: number[], exact: Decimal[]): number {
  const diff = value.map((v, i) => new D(v).minus(exact[i]));
  const norm = (v: Decimal[]): Decimal => v[0].pow(2).plus(v[1].pow(2)).plus(v[2].pow(2)).sqrt();
  return norm(diff).div(norm(exact)).toNumber();
}

function naive(s: number[]): number[] {
  const d = R.map((v, i) => v - s[i]);
  const dn3 = Math.hypot(...d) ** 3;
  const sn3 = Math.hypot(...s) ** 3;
  return d.map((di, i) => -GM * (di / dn3 + s[i] / sn3));
}

describe('third-body acceleration in f(q) form (Battin §8.4) against 50-digit decimal.js', () => {
  const ratios = [1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8];
  describe('when the perturbing body is 1e2 to 1e8 times farther than the spacecraft', () => {
    for (const ratio of ratios) {
      // |s| / |r| ≈ ratio: scale the direction to |R| * ratio and round to integers (exact inputs).
      const scale = (Math.hypot(...R) * ratio) / Math.hypot(...S_DIRECTION);
      const s = S_DIRECTION.map((v) => Math.round(v * scale));
      const exact = exactAcceleration(s);
      const acc = new Float64Array(3);
      addThirdBody(GM, R[0], R[1], R[2], s[0], s[1], s[2], acc, null);
      const fqError = relativeError(Array.from(acc), exact);
      const naiveError = relativeError(naive(s), exact);

      it(`should agree to ~1e-15 relative at ratio ${ratio.toExponential(0)} (f(q) ${fqError.toExponential(1)}, naive ${naiveError.toExponential(1)})`, () => {
        expect(fqError).toBeLessThan(2e-15);
      });
      if (ratio >= 1e4) {
        it(`should show the naive difference losing digits at ratio ${ratio.toExponential(0)}`, () => {
          // Loss of about log10(ratio) digits: at least ratio * 1e-19 relative, far above f(q).
          expect(naiveError).toBeGreaterThan(ratio * 1e-19);
          expect(naiveError).toBeGreaterThan(10 * fqError);
        });
      }
    }
  });
});
