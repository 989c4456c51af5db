/**
 * Bracketing root finder: Brent's method (Brent 1973, "Algorithms for Minimization without Derivatives",
 * ch. 4, procedure zero): inverse quadratic interpolation and secant steps, falling back to bisection,
 * so the bracket always shrinks and the root is found to the requested tolerance.
 */
import { InvalidInputError } from '../../contract/errors.ts';

/** A root found by brentRoot and the iterations it took. */
export interface RootResult {
  /** The root, in the units of the argument (seconds for events). */
  x: number;
  /** g(x). */
  value: number;
  iterations: number;
}

/**
 * Finds x in [a, b] with g(x) = 0 given g(a), g(b) of opposite signs (or one of them zero).
 * @param toleranceX absolute tolerance on x (> 0; events use 1e-7 s)
 * @throws InvalidInputError when g(a) and g(b) do not bracket a root
 */
export function brentRoot(g: (x: number) => number, a: number, b: number, ga: number, gb: number,
  toleranceX: number, maxIterations = 200): RootResult {
  if (ga === 0) return { x: a, value: 0, iterations: 0 };
  if (gb === 0) return { x: b, value: 0, iterations: 0 };
  if (Math.sign(ga) === Math.sign(gb) || !Number.isFinite(ga) || !Number.isFinite(gb)) {
    throw new InvalidInputError('bracket', `g(${a}) = ${ga} and g(${b}) = ${gb} do not bracket a root`);
  }
  let fa = ga;
  let fb = gb;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let it = 1; it <= maxIterations; it++) {
    if (Math.sign(fb) === Math.sign(fc)) {
      c = a; fc = fa; d = b - a; e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b; b = c; c = a;
      fa = fb; fb = fc; fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * toleranceX;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return { x: b, value: fb, iterations: it };
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      let p: number;
      let q: number;
      const s = fb / fa;
      if (a === c) {
        p = 2 * m * s; // secant
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1)); // inverse quadratic interpolation
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q; else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d; d = p / q;
      } else {
        d = m; e = m;
      }
    } else {
      d = m; e = m;
    }
    a = b; fa = fb;
    b += Math.abs(d) > tol ? d : (m > 0 ? tol : -tol);
    fb = g(b);
  }
  return { x: b, value: fb, iterations: maxIterations };
}
