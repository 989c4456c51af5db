/**
 * Statistics of budget samples (either path). Samples are sorted by index first and every sum runs in
 * index order, so any batching of the samples gives bit-identical results.
 * Percentiles: linear interpolation between order statistics (Hyndman & Fan 1996, definition 7, the
 * default of R and NumPy). The 95 % interval of a percentile: order statistics at ranks
 * N·p ∓ 1.96·sqrt(N·p·(1 − p)) (normal approximation to the binomial count below the percentile,
 * distribution-free; e.g. Conover, Practical Nonparametric Statistics, 3rd ed., §3.2 — from memory),
 * widened outward to whole ranks. Limit-crossing probabilities carry Wilson 95 % intervals.
 */
import { bPlaneEllipse } from '../dispersion/ellipse.ts';
import { binomialEstimate } from '../dispersion/impact-probability.ts';
import { mergeSampleBatches, sampleCovariance, sampleMean } from '../dispersion/sample-statistics.ts';
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import type {
  BudgetNominal, BudgetPath, BudgetSample, BudgetSummary, Distribution, LimitCrossing,
} from '../../contract/budget-types.ts';

const Z95 = 1.959963984540054;
const HISTOGRAM_BINS = 30;
const LISTED = 100;

/** Percentile p in [0, 1] of ascending `sorted` (definition 7). */
export function percentile(sorted: readonly number[], p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** Distribution-free 95 % interval of percentile p from ascending `sorted`, or null when N is too small. */
export function percentileInterval(sorted: readonly number[], p: number): { lower: number; upper: number } | null {
  const n = sorted.length;
  const half = Z95 * Math.sqrt(n * p * (1 - p));
  const lowerRank = Math.floor(n * p - half);
  const upperRank = Math.ceil(n * p + half) + 1;
  if (lowerRank < 1 || upperRank > n) return null;
  return { lower: sorted[lowerRank - 1], upper: sorted[upperRank - 1] };
}

/** Mean, σ (N − 1), 95th and 99th percentiles of values (in index order). */
export function distribution(values: readonly number[]): Distribution {
  const n = values.length;
  if (n === 0) return { count: 0, mean: 0, sigma: 0, p95: 0, p99: 0, p99Interval: null, max: 0 };
  const mean = values.reduce((s, v) => s + v, 0) / n;
  const sigma = n > 1 ? Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1)) : 0;
  const sorted = values.slice().sort((a, b) => a - b);
  return {
    count: n, mean, sigma, p95: percentile(sorted, 0.95), p99: percentile(sorted, 0.99),
    p99Interval: percentileInterval(sorted, 0.99), max: sorted[n - 1],
  };
}

function histogram(values: readonly number[]): { binWidthMS: number; counts: number[] } {
  const max = values.reduce((m, v) => Math.max(m, v), 0);
  const width = max > 0 ? max / HISTOGRAM_BINS : 1;
  const counts = new Array<number>(HISTOGRAM_BINS).fill(0);
  for (const v of values) counts[Math.min(HISTOGRAM_BINS - 1, Math.floor(v / width))] += 1;
  return { binWidthMS: width, counts };
}

function crossing(count: number, evaluated: number): LimitCrossing {
  if (evaluated === 0) return { count, evaluated, probability: 0, lower95: 0, upper95: 1 };
  const e = binomialEstimate(count, evaluated);
  return { count, evaluated, probability: e.probability, lower95: e.lower95, upper95: e.upper95 };
}

function std(values: readonly number[]): number | null {
  if (values.length < 2) return null;
  const m = values.reduce((s, v) => s + v, 0) / values.length;
  return Math.sqrt(values.reduce((s, v) => s + (v - m) ** 2, 0) / (values.length - 1));
}

function delivery(nominal: BudgetNominal, reached: BudgetSample[]): BudgetSummary['delivery'] {
  const components = nominal.components.map((c, i) => {
    const vals = reached.map((s) => s.delivered[i] as number);
    return { name: c.name, unit: c.unit, mean: vals.length ? vals.reduce((a, v) => a + v, 0) / vals.length : null, sigma: std(vals) };
  });
  const bp = nominal.bPlane;
  if (!bp) return { components, bPlane: null, meanBDotTKm: null, meanBDotRKm: null, closestApproachSigmaS: null, points: [] };
  const rows = reached.map((s) => [s.delivered[bp.bDotT] as number, s.delivered[bp.bDotR] as number]);
  const mean = rows.length >= 3 ? sampleMean(rows) : null;
  return {
    components, bPlane: mean ? bPlaneEllipse(sampleCovariance(rows, mean)) : null,
    meanBDotTKm: mean ? mean[0] : null, meanBDotRKm: mean ? mean[1] : null,
    closestApproachSigmaS: components[bp.closestApproach]?.sigma ?? null,
    points: rows.slice(0, 500).map(([t, r]) => ({ bDotTKm: t, bDotRKm: r })),
  };
}

/** Summary of one path's samples (any order, any batching); see the file comment. */
export function summariseBudgetSamples(request: BudgetRequest, nominal: BudgetNominal, path: BudgetPath, samples: readonly BudgetSample[]): BudgetSummary {
  const merged = mergeSampleBatches([samples]);
  const n = nominal.burns.length;
  const complete = merged.filter((s) => s.burns.length === n);
  const notConverged = merged.filter((s) => s.notConvergedAt !== null);
  const stopped = merged.filter((s) => s.notConvergedAt === null && s.stopReason !== null);
  const burns = nominal.burns.map((b, k) => {
    const dv = complete.map((s) => s.burns[k].magnitudeMS);
    return {
      label: b.label, epochTdbS: b.epochTdbS, nominalMagnitudeMS: Math.hypot(...b.deltaVInertialKmS) * 1000,
      deltaVMS: distribution(dv), propellantKg: distribution(complete.map((s) => s.burns[k].propellantKg)), histogram: histogram(dv),
    };
  });
  const reached = merged.filter((s) => s.delivered.every((v) => v !== null));
  const evaluated = merged.filter((s) => s.notConvergedAt === null && (s.stopReason === null || s.impact));
  const withAltitude = evaluated.filter((s) => s.closestApproachAltitudeKm !== null || s.impact);
  const safe = request.problem.limits.safeAltitudeKm;
  return {
    path, samples: merged.length, seed: request.seed, used: complete.length,
    notConverged: { count: notConverged.length, indices: notConverged.slice(0, LISTED).map((s) => s.index) },
    stopped: { count: stopped.length, indices: stopped.slice(0, LISTED).map((s) => s.index) },
    burns,
    total: {
      deltaVMS: distribution(complete.map((s) => s.burns.reduce((acc, b) => acc + b.magnitudeMS, 0))),
      propellantKg: distribution(complete.map((s) => s.burns.reduce((acc, b) => acc + b.propellantKg, 0))),
    },
    delivery: delivery(nominal, reached),
    limits: {
      impact: crossing(evaluated.filter((s) => s.impact).length, evaluated.length),
      belowSafeAltitude: withAltitude.length === 0 ? null
        : crossing(withAltitude.filter((s) => s.impact || (s.closestApproachAltitudeKm as number) < safe).length, withAltitude.length),
      safeAltitudeKm: safe,
    },
  };
}
