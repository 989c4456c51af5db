/**
 * Probability that the B-plane point falls inside the body's impact disc.
 * Impact radius with gravitational focusing: b_impact = R·sqrt(1 + 2μ/(R·v∞²)) (energy and angular
 * momentum conservation on the approach hyperbola; e.g. Kizner 1961, common practice in B-plane analysis).
 */
import { InvalidInputError } from '../../propagator/index.ts';
import { requireCovariance, type Matrix } from '../../propagator/index.ts';
import { normalInterval } from './special-functions.ts';

/**
 * Gravity-focused impact radius in the B-plane, km.
 * @param bodyRadiusKm body radius (plus any atmosphere margin), km, > 0.
 * @param muKm3S2 body GM, km³/s², > 0. @param vInfinityKmS hyperbolic excess speed, km/s, > 0.
 */
export function impactRadiusKm(bodyRadiusKm: number, muKm3S2: number, vInfinityKmS: number): number {
  for (const [field, v] of [['bodyRadiusKm', bodyRadiusKm], ['muKm3S2', muKm3S2], ['vInfinityKmS', vInfinityKmS]] as const) {
    if (!Number.isFinite(v) || v <= 0) throw new InvalidInputError(field, `must be a finite number > 0, got ${v}`);
  }
  return bodyRadiusKm * Math.sqrt(1 + (2 * muKm3S2) / (bodyRadiusKm * vInfinityKmS * vInfinityKmS));
}

function adaptiveSimpson(f: (t: number) => number, a: number, b: number, tolerance: number): number {
  const recurse = (lo: number, hi: number, flo: number, fmid: number, fhi: number, whole: number, tol: number, depth: number): number => {
    const mid = (lo + hi) / 2;
    const lm = (lo + mid) / 2;
    const rm = (mid + hi) / 2;
    const flm = f(lm);
    const frm = f(rm);
    const left = ((mid - lo) / 6) * (flo + 4 * flm + fmid);
    const right = ((hi - mid) / 6) * (fmid + 4 * frm + fhi);
    const diff = left + right - whole;
    if (depth <= 0 || Math.abs(diff) <= 15 * tol) return left + right + diff / 15;
    return recurse(lo, mid, flo, flm, fmid, left, tol / 2, depth - 1) + recurse(mid, hi, fmid, frm, fhi, right, tol / 2, depth - 1);
  };
  // Start from 32 panels so a narrow peak cannot hide between the first nodes.
  const panels = 32;
  const h = (b - a) / panels;
  let total = 0;
  for (let i = 0; i < panels; i += 1) {
    const lo = a + i * h;
    const hi = lo + h;
    const flo = f(lo);
    const fmid = f((lo + hi) / 2);
    const fhi = f(hi);
    total += recurse(lo, hi, flo, fmid, fhi, (h / 6) * (flo + 4 * fmid + fhi), tolerance / panels, 40);
  }
  return total;
}

/**
 * P(|B| < radius) for a 2-D Gaussian B-plane point with mean (B·T, B·R) and covariance, by numerical
 * integration over the disc: rotate to the covariance's principal axes (the disc is unchanged), integrate
 * the marginal density of the wider axis times the normal interval of the narrower one across the chord,
 * with x = r·sin t to remove the chord's square-root endpoints; adaptive Simpson to 1e-12 absolute.
 * @param meanKm [B·T, B·R], km. @param covarianceKm2 2×2 km² (positive semi-definite).
 * @param radiusKm disc radius (impact radius), km, > 0.
 * @returns probability in [0, 1].
 */
export function probabilityInsideDisc(meanKm: readonly [number, number], covarianceKm2: Matrix, radiusKm: number): number {
  requireCovariance('covarianceKm2', covarianceKm2, 2);
  if (!Number.isFinite(radiusKm) || radiusKm <= 0) throw new InvalidInputError('radiusKm', `must be > 0, got ${radiusKm}`);
  if (!meanKm.every(Number.isFinite)) throw new InvalidInputError('meanKm', 'must be two finite numbers');
  const [[a, b], [, d]] = covarianceKm2;
  const theta = 0.5 * Math.atan2(2 * b, a - d);
  const c = Math.cos(theta);
  const s = Math.sin(theta);
  const half = Math.hypot((a - d) / 2, b);
  const sigma1 = Math.sqrt(Math.max(0, (a + d) / 2 + half));
  const sigma2 = Math.sqrt(Math.max(0, (a + d) / 2 - half));
  const m1 = c * meanKm[0] + s * meanKm[1];
  const m2 = -s * meanKm[0] + c * meanKm[1];
  const r = radiusKm;
  if (sigma1 === 0) return m1 * m1 + m2 * m2 < r * r ? 1 : 0;
  // Inner probability across the chord at x: P(−h < y < h), h = sqrt(r² − x²).
  const inner = (x: number, h: number): number => {
    if (sigma2 === 0) return Math.abs(m2) < h ? 1 : 0;
    return normalInterval((-h - m2) / sigma2, (h - m2) / sigma2);
  };
  const span = 12 * sigma1;
  const xLo = Math.max(-r, m1 - span);
  const xHi = Math.min(r, m1 + span);
  if (xLo >= xHi) return 0;
  const tLo = Math.asin(Math.max(-1, xLo / r));
  const tHi = Math.asin(Math.min(1, xHi / r));
  const norm = 1 / (sigma1 * Math.sqrt(2 * Math.PI));
  const integrand = (t: number): number => {
    const x = r * Math.sin(t);
    const h = r * Math.cos(t);
    const z = (x - m1) / sigma1;
    return r * Math.cos(t) * norm * Math.exp(-0.5 * z * z) * inner(x, h);
  };
  const p = adaptiveSimpson(integrand, tLo, tHi, 1e-12);
  return Math.min(1, Math.max(0, p));
}

/** Monte Carlo estimate of a probability from hits in n samples, with its binomial standard error and a
 * 95 % Wilson score interval (Wilson 1927), which stays inside [0, 1] when hits are 0 or n.
 * The bounds are (A ∓ B)/(1 + z²/n) with A = p + z²/(2n), B = z·sqrt(p(1 − p)/n + z²/(4n²)). Since
 * A² − B² = p²·(1 + z²/n), the lower bound is p²/(A + B) and, by the p ↔ 1 − p symmetry, the upper bound
 * is 1 − q²/(A' + B) with q = 1 − p, A' = q + z²/(2n): sums of positive terms, so 0 hits give exactly 0
 * and n hits exactly 1 (the difference form cancels to about 1e-19 instead). */
export function binomialEstimate(hits: number, samples: number): { probability: number; standardError: number; lower95: number; upper95: number } {
  if (!Number.isInteger(samples) || samples <= 0) throw new InvalidInputError('samples', `must be a positive integer, got ${samples}`);
  if (!Number.isInteger(hits) || hits < 0 || hits > samples) throw new InvalidInputError('hits', `must be an integer in [0, ${samples}], got ${hits}`);
  const p = hits / samples;
  const q = (samples - hits) / samples;
  const z = 1.959963984540054;
  const shift = (z * z) / (2 * samples);
  const b = z * Math.sqrt((p * q) / samples + (z * z) / (4 * samples * samples));
  return {
    probability: p, standardError: Math.sqrt((p * q) / samples),
    lower95: (p * p) / (p + shift + b), upper95: 1 - (q * q) / (q + shift + b),
  };
}
