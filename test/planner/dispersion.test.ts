/**
 * Unit checks of the dispersion pieces: Gates covariance, ellipses, linear mapping, seeded sampling,
 * batch-split invariance and cancellation. Published-value checks live in
 * test/reference/dispersion-linear-vs-monte-carlo.test.ts.
 */
import { describe, expect, it } from 'vitest';
import {
  bPlaneEllipse, compareEllipses, createDispersionSampler, gatesCovarianceKm2S2, linearTargetCovariance, mergeSampleBatches,
  runSampleRange, sampleCovariance, sampleMean, sampleRandom, choleskySemidefinite, type DrawnSample,
} from '../../planner/dispersion/index.ts';
import type { Vec3 } from '../../propagator/index.ts';

const GATES = { fixedMagnitudeMS: 3, proportionalMagnitudeFraction: 0.02, fixedPointingMS: 4, proportionalPointingDeg: 1 };

describe('gatesCovarianceKm2S2', () => {
  describe('when the burn lies along x', () => {
    // Gates (1963): σ_mag² = 0.003² + (0.02·0.5)² km²/s², σ_point² = 0.004² + (0.5·π/180)² per transverse axis.
    it('should put the magnitude variance along x and the pointing variance across it', () => {
      const p = gatesCovarianceKm2S2([0.5, 0, 0], GATES);
      const mag = 0.003 ** 2 + (0.02 * 0.5) ** 2;
      const point = 0.004 ** 2 + ((0.5 * Math.PI) / 180) ** 2;
      expect(p[0][0]).toBeCloseTo(mag, 15);
      expect(p[1][1]).toBeCloseTo(point, 15);
      expect(p[2][2]).toBeCloseTo(point, 15);
      expect(Math.abs(p[0][1]) + Math.abs(p[0][2]) + Math.abs(p[1][2])).toBeLessThan(1e-18);
    });
  });

  describe('when the burn points in a general direction', () => {
    it('should be rotation-equivariant: ûᵀPû = σ_mag² and the trace is σ_mag² + 2σ_point²', () => {
      const dv: Vec3 = [0.1, -0.2, 0.3];
      const p = gatesCovarianceKm2S2(dv, GATES);
      const m = Math.hypot(...dv);
      const u = dv.map((v) => v / m);
      const along = u.reduce((acc, ui, i) => acc + ui * u.reduce((q, uj, j) => q + p[i][j] * uj, 0), 0);
      expect(along).toBeCloseTo(0.003 ** 2 + (0.02 * m) ** 2, 15);
      const trace = p[0][0] + p[1][1] + p[2][2];
      expect(trace).toBeCloseTo(0.003 ** 2 + (0.02 * m) ** 2 + 2 * (0.004 ** 2 + ((Math.PI / 180) * m) ** 2), 15);
    });

    it('should be matched by the sample covariance of drawn executed burns (20 000 draws, 5 % on σ²)', () => {
      const dv: Vec3 = [0.1, -0.2, 0.3];
      const sampler = createDispersionSampler({ burnDeltaVKmS: [dv], executionErrors: GATES });
      const rows = Array.from({ length: 20000 }, (_, i) => sampler.draw(7, i).burnDeltaVKmS[0]);
      const mean = sampleMean(rows);
      const c = sampleCovariance(rows, mean);
      const p = gatesCovarianceKm2S2(dv, GATES);
      // Relative standard error of a sample variance is sqrt(2/N) ≈ 1 %: 5 % is a 5σ limit.
      for (let i = 0; i < 3; i += 1) expect(Math.abs(c[i][i] / p[i][i] - 1)).toBeLessThan(0.05);
      for (let i = 0; i < 3; i += 1) expect(Math.abs(mean[i] - dv[i])).toBeLessThan(5 * Math.sqrt(p[i][i] / 20000));
    });
  });

  describe('when the burn is zero', () => {
    it('should be isotropic with the same trace', () => {
      const p = gatesCovarianceKm2S2([0, 0, 0], GATES);
      expect(p[0][0]).toBeCloseTo((0.003 ** 2 + 2 * 0.004 ** 2) / 3, 15);
      expect(p[0][0]).toBe(p[2][2]);
    });
  });

  describe('when an error parameter is negative', () => {
    it('should name the field', () => {
      expect(() => gatesCovarianceKm2S2([1, 0, 0], { ...GATES, fixedPointingMS: -1 })).toThrow(/^executionErrors\.fixedPointingMS:/);
    });
  });
});

describe('bPlaneEllipse', () => {
  describe('when the covariance is a 3:1 ellipse turned 30° from T toward R', () => {
    it('should recover the axes and the angle', () => {
      const a = 30;
      const b = 10;
      const t = (30 * Math.PI) / 180;
      const c = Math.cos(t);
      const s = Math.sin(t);
      const cov = [[a * a * c * c + b * b * s * s, (a * a - b * b) * c * s], [(a * a - b * b) * c * s, a * a * s * s + b * b * c * c]];
      const e = bPlaneEllipse(cov);
      expect(e.semiMajorKm).toBeCloseTo(30, 10);
      expect(e.semiMinorKm).toBeCloseTo(10, 10);
      expect(e.orientationDeg).toBeCloseTo(30, 10);
    });
  });

  describe('when the major axis lies along R', () => {
    it('should report 90°', () => {
      expect(bPlaneEllipse([[1, 0], [0, 4]]).orientationDeg).toBeCloseTo(90, 12);
    });
  });
});

describe('linearTargetCovariance', () => {
  describe('when two burns and an initial-state covariance contribute', () => {
    it('should report each contribution and their sum', () => {
      const j1 = [[1000, 0, 0], [0, 2000, 0]];
      const j2 = [[0, 0, 500], [300, 0, 0]];
      const p = gatesCovarianceKm2S2([0.01, 0, 0], GATES);
      const jx = [[1, 0, 0, 100, 0, 0], [0, 1, 0, 0, 100, 0]];
      const px = [0, 1, 2, 3, 4, 5].map((i) => [0, 1, 2, 3, 4, 5].map((j) => (i === j ? (i < 3 ? 1 : 1e-6) : 0)));
      const out = linearTargetCovariance([{ sensitivity: j1, covarianceKm2S2: p }, { sensitivity: j2, covarianceKm2S2: p }],
        { sensitivity: jx, covariance: px });
      expect(out.perBurn).toHaveLength(2);
      expect(out.perBurn[0][0][0]).toBeCloseTo(1e6 * p[0][0], 12);
      expect(out.initialState?.[0][0]).toBeCloseTo(1 + 1e4 * 1e-6, 12);
      expect(out.total[1][1]).toBeCloseTo(out.perBurn[0][1][1] + out.perBurn[1][1][1] + (out.initialState?.[1][1] ?? Number.NaN), 12);
    });
  });

  describe('when a sensitivity has the wrong shape', () => {
    it('should name the burn', () => {
      expect(() => linearTargetCovariance([
        { sensitivity: [[1, 0, 0]], covarianceKm2S2: [[1, 0, 0], [0, 1, 0], [0, 0, 1]] },
        { sensitivity: [[1, 0, 0], [0, 1, 0]], covarianceKm2S2: [[1, 0, 0], [0, 1, 0], [0, 0, 1]] },
      ])).toThrow(/^burns\[1\]\.sensitivity/);
    });
  });
});

// σ_r = 2 km per axis, σ_v = 1e-4 km/s per axis, r_x and v_z correlated with ρ = 0.5 (common-practice
// shape of an orbit-determination covariance; the numbers are invented).
const INITIAL_COVARIANCE = [0, 1, 2, 3, 4, 5].map((i) => [0, 1, 2, 3, 4, 5].map((j) => {
  if (i === j) return i < 3 ? 4 : 1e-8;
  return (i === 0 && j === 5) || (i === 5 && j === 0) ? 0.5 * 2 * 1e-4 : 0;
}));

describe('seeded sampling', () => {
  const sampler = createDispersionSampler({
    burnDeltaVKmS: [[0.004, 0.001, 0], [0, -0.002, 0.0005]],
    executionErrors: GATES,
    initialCovariance: INITIAL_COVARIANCE,
  });
  const evaluate = async (s: DrawnSample): Promise<number> => s.burnDeltaVKmS[1][2] + (s.initialStateOffset?.[0] ?? 0);

  describe('when the same range is run whole and split into uneven batches', () => {
    it('should produce bit-identical samples and results', async () => {
      const whole = await runSampleRange(sampler, evaluate, { seed: 42, firstIndex: 0, count: 25 });
      const parts = await Promise.all([[0, 7], [7, 1], [8, 17]].map(([firstIndex, count]) =>
        runSampleRange(sampler, evaluate, { seed: 42, firstIndex, count })));
      const merged = mergeSampleBatches(parts.reverse().map((b) => b.map((x) => ({ index: x.sample.index, ...x }))), { firstIndex: 0, count: 25 });
      expect(merged.map((m) => m.result)).toEqual(whole.map((w) => w.result));
      expect(merged.map((m) => m.sample)).toEqual(whole.map((w) => w.sample));
    });
  });

  describe('when the seed changes', () => {
    it('should change every sample', () => {
      const a = sampler.draw(1, 3).burnDeltaVKmS[0][0];
      const b = sampler.draw(2, 3).burnDeltaVKmS[0][0];
      expect(a).not.toBe(b);
    });
  });

  describe('when batches overlap or leave a gap', () => {
    it('should refuse to merge them', () => {
      expect(() => mergeSampleBatches([[{ index: 0 }, { index: 1 }], [{ index: 1 }]])).toThrow(/appears twice/);
      expect(() => mergeSampleBatches([[{ index: 0 }], [{ index: 2 }]], { firstIndex: 0, count: 2 })).toThrow(/missing sample index 1/);
    });
  });

  describe('when the signal fires', () => {
    it('should reject with CancelledError', async () => {
      const controller = new AbortController();
      let seen = 0;
      const run = runSampleRange(sampler, async () => { seen += 1; if (seen === 3) controller.abort(); return 0; },
        { seed: 1, firstIndex: 0, count: 100, signal: controller.signal });
      await expect(run).rejects.toMatchObject({ name: 'CancelledError' });
      expect(seen).toBe(3);
    });
  });

  describe('when the initial covariance is drawn', () => {
    it('should reproduce its variance and the r_x–v_z correlation of 0.5 in 20 000 samples', () => {
      const rows = Array.from({ length: 20000 }, (_, i) => sampler.draw(9, i).initialStateOffset ?? []);
      const c = sampleCovariance(rows);
      // 5σ limits: relative standard error of a variance sqrt(2/N) = 1 %; of a correlation (1 − ρ²)/sqrt(N) ≈ 0.005.
      expect(Math.abs(c[0][0] / 4 - 1)).toBeLessThan(0.05);
      expect(Math.abs(c[5][5] / 1e-8 - 1)).toBeLessThan(0.05);
      expect(Math.abs(c[0][5] / Math.sqrt(c[0][0] * c[5][5]) - 0.5)).toBeLessThan(0.027);
    });
  });

  describe('when the initial covariance is not positive semi-definite', () => {
    it('should name the field', () => {
      const bad = INITIAL_COVARIANCE.map((row) => [...row]);
      bad[0][5] = 1;
      bad[5][0] = 1;
      expect(() => createDispersionSampler({ burnDeltaVKmS: [[0, 0, 0]], executionErrors: null, initialCovariance: bad }))
        .toThrow(/^initialState\.covarianceKmKmS: is not positive semi-definite/);
    });
  });

  describe('when a random stream is asked for twice', () => {
    it('should repeat exactly', () => {
      const a = sampleRandom(5, 11);
      const b = sampleRandom(5, 11);
      expect([a.normal(), a.uniform(), a.normal()]).toEqual([b.normal(), b.uniform(), b.normal()]);
    });
  });
});

describe('compareEllipses', () => {
  describe('when 400 seeded sample ellipses of N = 200 are drawn from a 3:2 linear ellipse', () => {
    // The spread of the sample orientations should match the asymptotic standard error (Anderson 1963)
    // within 15 % (the standard error of a standard deviation from 400 trials is ~3.5 %).
    it('should predict the spread of the sample orientation', () => {
      const linear = bPlaneEllipse([[9, 0], [0, 4]]);
      const errors: number[] = [];
      let predicted = 0;
      for (let trial = 0; trial < 400; trial += 1) {
        const rows = Array.from({ length: 200 }, (_, i) => {
          const r = sampleRandom(1000 + trial, i);
          return [3 * r.normal(), 2 * r.normal()];
        });
        const comparison = compareEllipses(linear, bPlaneEllipse(sampleCovariance(rows)), 200);
        predicted = comparison.orientationStandardErrorDeg ?? Number.NaN;
        errors.push(comparison.orientationErrorDeg ?? Number.NaN);
      }
      const rms = Math.sqrt(errors.reduce((acc, x) => acc + x * x, 0) / errors.length);
      expect(Math.abs(rms / predicted - 1)).toBeLessThan(0.15);
    });
  });
});

describe('choleskySemidefinite', () => {
  describe('when variances in different units differ by 14 orders of magnitude', () => {
    // 3 km position σ next to 0.5 mm/s velocity σ (km²/s²), correlated: L·Lᵀ must give every entry back.
    it('should keep the small velocity block instead of taking it as zero', () => {
      const a = [
        [9, 0, 0, 1e-6, 0, 0], [0, 9, 0, 0, 0, 0], [0, 0, 9, 0, 0, 0],
        [1e-6, 0, 0, 2.5e-13, 0, 0], [0, 0, 0, 0, 2.5e-13, 0], [0, 0, 0, 0, 0, 2.5e-13],
      ];
      const l = choleskySemidefinite(a);
      const back = a.map((row, i) => row.map((_, j) => l[i].reduce((acc, v, k) => acc + v * l[j][k], 0)));
      a.forEach((row, i) => row.forEach((v, j) => {
        expect(Math.abs(back[i][j] - v)).toBeLessThanOrEqual(1e-12 * Math.sqrt(a[i][i] * a[j][j]));
      }));
    });
  });
});
