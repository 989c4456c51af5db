/**
 * Stumpff functions c_k(ψ) for the universal-variable formulation of two-body motion, evaluated without
 * cancellation near ψ = 0 (parabolic) and valid for elliptic (ψ > 0) and hyperbolic (ψ < 0) arguments.
 *
 * c_k(ψ) = Σ_{j≥0} (−ψ)^j / (2j + k)!   (Battin 1999, §4.5; Vallado 2013, §2.2 uses c2, c3).
 * Recurrence c_k = 1/k! − ψ c_{k+2} links them; the closed forms of c2 and c3 use half-angle
 * identities so that 1 − cos x and cosh x − 1 never subtract nearly equal numbers.
 */

/** Below this |ψ| the power series is used (17 terms reach 1e-17 relative at |ψ| = 1). */
const SERIES_LIMIT = 1;
const SERIES_TERMS = 18;

/** c_k(ψ) by its power series; accurate for |ψ| ≤ 1. */
function stumpffSeries(k: number, psi: number): number {
  let factorial = 1;
  for (let i = 2; i <= k; i++) factorial *= i;
  let term = 1 / factorial;
  let sum = term;
  for (let j = 1; j < SERIES_TERMS; j++) {
    term *= -psi / ((2 * j + k - 1) * (2 * j + k));
    sum += term;
  }
  return sum;
}

/** Stumpff functions c2..c5 at one argument (dimensionless). */
export interface StumpffValues {
  c2: number;
  c3: number;
  c4: number;
  c5: number;
}

/**
 * Evaluates c2, c3, c4, c5 at ψ = αχ² (dimensionless, any finite real; for ψ < −5e5 cosh overflows and
 * the values are ±Infinity, which callers treat as "beyond any physical time").
 * c4, c5 are needed only for derivatives (dc2/dψ = c4 − c3/2, dc3/dψ = (3c5 − c4)/2).
 */
export function stumpff(psi: number): StumpffValues {
  if (Math.abs(psi) <= SERIES_LIMIT) {
    return {
      c2: stumpffSeries(2, psi), c3: stumpffSeries(3, psi),
      c4: stumpffSeries(4, psi), c5: stumpffSeries(5, psi),
    };
  }
  let c2: number;
  let c3: number;
  if (psi > 0) {
    const x = Math.sqrt(psi);
    const s = Math.sin(x / 2);
    c2 = (2 * s * s) / psi; // (1 − cos x)/ψ
    c3 = (x - Math.sin(x)) / (psi * x); // |ψ| > 1 so x − sin x keeps its digits
  } else {
    const x = Math.sqrt(-psi);
    const s = Math.sinh(x / 2);
    c2 = (-2 * s * s) / psi; // (cosh x − 1)/(−ψ)
    c3 = (Math.sinh(x) - x) / (-psi * x);
  }
  // |ψ| > 1: the recurrence c_{k+2} = (1/k! − c_k)/ψ loses at most one digit.
  const c4 = (0.5 - c2) / psi;
  const c5 = (1 / 6 - c3) / psi;
  return { c2, c3, c4, c5 };
}

/** c2 and c3 only (the Kepler iteration needs no more), same method and range as {@link stumpff}. */
export function stumpff23(psi: number): { c2: number; c3: number } {
  if (Math.abs(psi) <= SERIES_LIMIT) return { c2: stumpffSeries(2, psi), c3: stumpffSeries(3, psi) };
  if (psi > 0) {
    const x = Math.sqrt(psi);
    const s = Math.sin(x / 2);
    return { c2: (2 * s * s) / psi, c3: (x - Math.sin(x)) / (psi * x) };
  }
  const x = Math.sqrt(-psi);
  const s = Math.sinh(x / 2);
  return { c2: (-2 * s * s) / psi, c3: (Math.sinh(x) - x) / (-psi * x) };
}
