/**
 * Dispersion statistics against outside sources and against Monte Carlo:
 * - erfc, χ² quantiles and SplitMix64 outputs against published values;
 * - impact probability against the Rayleigh closed form and a Monte Carlo count;
 * - the linear covariance of a two-body flyby B-plane mapping against Monte Carlo samples (small errors
 *   pass), and a deliberately non-linear case that trips the check.
 */
import { describe, expect, it } from 'vitest';
import {
  bPlaneEllipse, binomialEstimate, checkLinearity, chiSquareSurvival, compareEllipses, createDispersionSampler,
  erfc, gatesCovarianceKm2S2, impactRadiusKm, linearTargetCovariance, probabilityInsideDisc, sampleCovariance,
  sampleRandom, splitMix64, subMatrix, type GatesErrors,
} from '../../planner/dispersion/index.ts';
import { GM_KM3_S2, RADIUS_KM, type Vec3 } from '../../propagator/index.ts';

describe('special functions', () => {
  describe('when compared with published values', () => {
    it('should match erf and erfc tables (Abramowitz & Stegun Table 7.1, from memory) to 1e-15', () => {
      expect(Math.abs(1 - erfc(0.5) - 0.5204998778130465)).toBeLessThan(1e-15);
      expect(Math.abs(1 - erfc(1) - 0.8427007929497149)).toBeLessThan(1e-15);
      expect(Math.abs(erfc(3) / 2.209049699858544e-5 - 1)).toBeLessThan(1e-13);
    });

    it('should be continuous where the series hands over to the continued fraction (x = 2.5)', () => {
      expect(Math.abs(erfc(2.5 - 1e-12) / erfc(2.5) - 1)).toBeLessThan(1e-11);
    });

    it('should reproduce the χ² table 5 % points 3.841, 5.991, 7.815 (1, 2, 3 dof; any statistics handbook)', () => {
      expect(chiSquareSurvival(3.841, 1)).toBeCloseTo(0.05, 4);
      expect(chiSquareSurvival(5.991, 2)).toBeCloseTo(0.05, 4);
      expect(chiSquareSurvival(7.815, 3)).toBeCloseTo(0.05, 4);
      // Two degrees of freedom in closed form: P(χ² > x) = exp(−x/2).
      expect(chiSquareSurvival(13.3, 2)).toBeCloseTo(Math.exp(-6.65), 14);
    });
  });
});

describe('SplitMix64', () => {
  describe('when seeded with 0', () => {
    // Reference outputs of Vigna's splitmix64.c seeded with 0 (from memory).
    it('should give e220a8397b1dcdaf, 6e789e6aa1b965f4, 06c45d188009454f', () => {
      let state = 0n;
      const outputs: string[] = [];
      for (let i = 0; i < 3; i += 1) {
        const [next, out] = splitMix64(state);
        state = next;
        outputs.push(out.toString(16).padStart(16, '0'));
      }
      expect(outputs).toEqual(['e220a8397b1dcdaf', '6e789e6aa1b965f4', '06c45d188009454f']);
    });
  });
});

/** 2-D Gaussian points N(mean, cov) from the project's seeded streams (one stream per point). */
function gaussianPoints(mean: [number, number], cov: number[][], n: number, seed: number): [number, number][] {
  const l11 = Math.sqrt(cov[0][0]);
  const l21 = cov[0][1] / l11;
  const l22 = Math.sqrt(cov[1][1] - l21 * l21);
  return Array.from({ length: n }, (_, i) => {
    const r = sampleRandom(seed, i);
    const z1 = r.normal();
    const z2 = r.normal();
    return [mean[0] + l11 * z1, mean[1] + l21 * z1 + l22 * z2];
  });
}

describe('probabilityInsideDisc', () => {
  describe('when the Gaussian is centred and circular', () => {
    // Rayleigh distribution of |B|: P(|B| < r) = 1 − exp(−r²/(2σ²)) (any probability text).
    for (const ratio of [0.1, 0.5, 1, 2, 4]) {
      it(`should equal the Rayleigh CDF to 1e-10 at r = ${ratio}σ`, () => {
        const sigma = 3000;
        const p = probabilityInsideDisc([0, 0], [[sigma * sigma, 0], [0, sigma * sigma]], ratio * sigma);
        expect(Math.abs(p + Math.expm1(-(ratio * ratio) / 2))).toBeLessThan(1e-10);
      });
    }
  });

  describe('when the Gaussian is offset and correlated', () => {
    it('should agree with a 200 000-point Monte Carlo count within 4 binomial standard errors', () => {
      const mean: [number, number] = [2500, -1200];
      const cov = [[4.0e6, 1.5e6], [1.5e6, 1.2e6]];
      const radius = 2200;
      const exact = probabilityInsideDisc(mean, cov, radius);
      const points = gaussianPoints(mean, cov, 200000, 3);
      const hits = points.filter(([t, r]) => t * t + r * r < radius * radius).length;
      const estimate = binomialEstimate(hits, points.length);
      expect(exact).toBeGreaterThan(0.05);
      expect(Math.abs(estimate.probability - exact)).toBeLessThan(4 * estimate.standardError);
    });
  });

  describe('when the ellipse is far from the disc', () => {
    it('should give a tiny but non-negative probability that matches the one-dimensional tail', () => {
      // A 1 km-wide ellipse 40 km from a 10 km disc along T: P ≈ Q(30)·(chord width) → below 1e-190.
      const p = probabilityInsideDisc([40, 0], [[1, 0], [0, 1e-4]], 10);
      expect(p).toBeGreaterThanOrEqual(0);
      expect(p).toBeLessThan(1e-150);
    });
  });
});

describe('impactRadiusKm', () => {
  describe('when v∞ = 3 km/s at Mars (GM and radius from propagator/constants)', () => {
    // b = R·sqrt(1 + 2μ/(R v∞²)) = 3396.19·sqrt(1 + 2·42828.375816/(3396.19·9)) = 3396.19·sqrt(3.80238) ≈ 6622.4 km.
    it('should be about 6622 km', () => {
      expect(impactRadiusKm(RADIUS_KM.mars, GM_KM3_S2.mars, 3)).toBeCloseTo(6622.4, 0);
    });
  });
});

// ---- Linear versus Monte Carlo on an analytic two-body flyby mapping ----

const MU = GM_KM3_S2.mars;
const cross = (a: number[], b: number[]): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const dot = (a: number[], b: number[]): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const unit = (a: number[]): Vec3 => { const n = Math.hypot(a[0], a[1], a[2]); return [a[0] / n, a[1] / n, a[2] / n]; };

/**
 * B·T, B·R (km) and time to periapsis (s) of the two-body hyperbola through (r, v) about Mars; T in the
 * plane of the frame's xy (T = Ŝ×ẑ/|Ŝ×ẑ|, R = Ŝ×T). Standard B-plane relations (e.g. Vallado,
 * Fundamentals of Astrodynamics and Applications, B-plane targeting section): Ŝ = ê/e + sqrt(1 − 1/e²)(ĥ×ê),
 * B = (h/v∞)(Ŝ×ĥ); time from the hyperbolic Kepler equation e·sinh F − F = M.
 */
function flybyTargets(r: Vec3, v: Vec3): number[] {
  const rn = Math.hypot(...r);
  const v2 = dot(v, v);
  const h = cross(r, v);
  const hn = Math.hypot(...h);
  const eVec = [0, 1, 2].map((i) => ((v2 - MU / rn) * r[i] - dot(r, v) * v[i]) / MU);
  const e = Math.hypot(eVec[0], eVec[1], eVec[2]);
  const vInf = Math.sqrt(v2 - (2 * MU) / rn);
  const eHat = unit(eVec);
  const hHat = unit(h);
  const p = cross(hHat, eHat);
  const s = [0, 1, 2].map((i) => eHat[i] / e + Math.sqrt(1 - 1 / (e * e)) * p[i]);
  const bVec = cross(s, hHat).map((x) => (x * hn) / vInf);
  const tHat = unit(cross(s, [0, 0, 1]));
  const rHat = cross(s, tHat);
  const a = -MU / (vInf * vInf);
  const coshF = (1 - rn / a) / e;
  const f = Math.sign(dot(r, v)) * Math.acosh(coshF);
  const meanAnomaly = e * Math.sinh(f) - f;
  const timeToPeriapsis = -meanAnomaly / Math.sqrt(MU / (-a) ** 3);
  return [dot(bVec, tHat), dot(bVec, rHat), timeToPeriapsis];
}

/** The approach: 2e6 km out along the incoming asymptote direction, aimed 9000 km off centre, v∞ 3 km/s. */
const S_IN = unit([0.6, 0.75, -0.28]);
const AIM = cross(S_IN, [0, 0, 1]).map((x) => x * (9000 / Math.hypot(...cross(S_IN, [0, 0, 1]))));
const R0: Vec3 = [0, 1, 2].map((i) => -2e6 * S_IN[i] + AIM[i]) as Vec3;
const V0: Vec3 = S_IN.map((x) => x * Math.sqrt(9 + (2 * MU) / Math.hypot(...R0))) as Vec3;

/** Targets after a burn at the initial point. */
const afterBurn = (dv: Vec3): number[] => flybyTargets(R0, [V0[0] + dv[0], V0[1] + dv[1], V0[2] + dv[2]]);

/** Central-difference sensitivity ∂targets/∂Δv (3×3) at the nominal burn — the linear model. */
function sensitivity(dv: Vec3): number[][] {
  const h = 1e-7;
  const columns = [0, 1, 2].map((k) => {
    const plus = [...dv] as Vec3;
    const minus = [...dv] as Vec3;
    plus[k] += h;
    minus[k] -= h;
    const fp = afterBurn(plus);
    const fm = afterBurn(minus);
    return fp.map((x, i) => (x - fm[i]) / (2 * h));
  });
  return [0, 1, 2].map((i) => columns.map((col) => col[i]));
}

function compare(dv: Vec3, errors: GatesErrors, samples: number) {
  const linear = linearTargetCovariance([{ sensitivity: sensitivity(dv), covarianceKm2S2: gatesCovarianceKm2S2(dv, errors) }]);
  const sampler = createDispersionSampler({ burnDeltaVKmS: [dv], executionErrors: errors });
  const rows = Array.from({ length: samples }, (_, i) => afterBurn(sampler.draw(2026, i).burnDeltaVKmS[0]));
  return { linear, rows, check: checkLinearity(rows, afterBurn(dv), linear.total) };
}

describe('linear dispersion versus Monte Carlo', () => {
  describe('when a 2 m/s burn has small Gates errors (1 mm/s, 1 %, 1 mm/s, 0.5°), 2000 samples', () => {
    const errors = { fixedMagnitudeMS: 1, proportionalMagnitudeFraction: 0.01, fixedPointingMS: 1, proportionalPointingDeg: 0.5 };
    const { linear, rows, check } = compare([0.0012, -0.0009, 0.0013], errors, 2000);

    it('should pass the χ² mean and covariance tests at significance 1e-3', () => {
      expect(check.passed, check.message).toBe(true);
    });

    it('should match the B-plane ellipse axes within 4 standard errors of a sample σ (4/sqrt(2(N−1)) ≈ 6.3 %)', () => {
      const lin = bPlaneEllipse(subMatrix(linear.total, [0, 1]));
      const mc = bPlaneEllipse(subMatrix(sampleCovariance(rows), [0, 1]));
      const { axisRatioError } = compareEllipses(lin, mc);
      expect(lin.semiMajorKm).toBeGreaterThan(1);
      expect(axisRatioError).toBeLessThan(4 / Math.sqrt(2 * 1999));
      expect(Math.abs(check.sigmaRatios[2] - 1)).toBeLessThan(4 / Math.sqrt(2 * 1999));
    });
  });

  describe('when a 1.5 km/s braking burn has a 20 % magnitude error, so arrival time ∝ 1/v bends', () => {
    // v after the burn is 1.5 ± 0.3 km/s: E[1/v] exceeds 1/E[v] by ~σ²/v² = 4 %, about 9 standard errors of
    // the sample mean at N = 2000, and the time spread is skewed.
    const errors = { fixedMagnitudeMS: 1, proportionalMagnitudeFraction: 0.2, fixedPointingMS: 1, proportionalPointingDeg: 2 };
    const { check } = compare(S_IN.map((x) => -1.5 * x) as Vec3, errors, 2000);

    it('should fail the linearity check', () => {
      expect(check.passed).toBe(false);
      expect(Math.min(check.meanPValue, check.covariancePValue)).toBeLessThan(1e-6);
    });
  });

  describe('when the linear model is exactly right (Gaussian samples of the predicted covariance)', () => {
    // Calibration: with H0 true the covariance test's p-value is uniform, so at α = 0.05 about 5 % of
    // 400 independent seeded trials reject; binomial σ = sqrt(0.05·0.95/400) ≈ 1.1 %, limit 4σ.
    it('should reject at about the nominal 5 % rate', () => {
      const cov = [[4, 1.2, 0.3], [1.2, 2, -0.4], [0.3, -0.4, 1]];
      const l = [[2, 0, 0], [0.6, Math.sqrt(2 - 0.36), 0], [0, 0, 0]];
      l[2][0] = 0.3 / 2;
      l[2][1] = (-0.4 - l[2][0] * l[1][0]) / l[1][1];
      l[2][2] = Math.sqrt(1 - l[2][0] ** 2 - l[2][1] ** 2);
      let rejections = 0;
      for (let trial = 0; trial < 400; trial += 1) {
        const rows = Array.from({ length: 100 }, (_, i) => {
          const r = sampleRandom(trial, i);
          const z = [r.normal(), r.normal(), r.normal()];
          return l.map((row) => row.reduce((acc, v, j) => acc + v * z[j], 0));
        });
        const check = checkLinearity(rows, [0, 0, 0], cov, { significance: 0.05 });
        if (check.covariancePValue < 0.05) rejections += 1;
      }
      expect(Math.abs(rejections / 400 - 0.05)).toBeLessThan(4 * Math.sqrt((0.05 * 0.95) / 400));
    });
  });
});
