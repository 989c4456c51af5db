/**
 * Izzo's non-dimensional time of flight T(x; λ, M) and its first three derivatives.
 * Source: D. Izzo (2015), "Revisiting Lambert's problem", Celestial Mechanics and Dynamical Astronomy
 * 121:1–15, eqs. (18)–(22) and the Battin hypergeometric series near the parabola (from memory).
 * T = sqrt(2μ/s³)·Δt; x in (−1, ∞): x < 1 ellipse, x = 1 parabola, x > 1 hyperbola.
 */

const BATTIN_BAND = 0.01;
const LAGRANGE_BAND = 0.2;

/** Gauss hypergeometric 2F1(3, 1; 5/2; z) by its series, |z| < 1 (used near the parabola only). */
function hypergeometric3_1_52(z: number, tolerance = 1e-15): number {
  let sum = 1;
  let term = 1;
  for (let j = 0; j < 1000; j += 1) {
    term = term * ((3 + j) * (1 + j)) / (2.5 + j) * z / (j + 1);
    sum += term;
    if (Math.abs(term) < tolerance) break;
  }
  return sum;
}

/** Lagrange's form of the time of flight, used at moderate distance from the parabola. */
function lagrangeTime(x: number, lambda: number, revolutions: number): number {
  const a = 1 / (1 - x * x);
  if (a > 0) {
    const alpha = 2 * Math.acos(x);
    let beta = 2 * Math.asin(Math.sqrt(lambda * lambda / a));
    if (lambda < 0) beta = -beta;
    return (a * Math.sqrt(a) * ((alpha - Math.sin(alpha)) - (beta - Math.sin(beta)) + 2 * Math.PI * revolutions)) / 2;
  }
  const alpha = 2 * Math.acosh(x);
  let beta = 2 * Math.asinh(Math.sqrt(-lambda * lambda / a));
  if (lambda < 0) beta = -beta;
  return (-a * Math.sqrt(-a) * ((beta - Math.sinh(beta)) - (alpha - Math.sinh(alpha)))) / 2;
}

/**
 * Non-dimensional time of flight for Izzo's variable x and geometry parameter λ in [−1, 1], with
 * `revolutions` complete revolutions (≥ 0; for revolutions > 0 only elliptic x in (−1, 1) is meaningful).
 * Blends three forms for accuracy: Battin's series within 0.01 of x = 1, Lagrange's form within 0.2,
 * Lancaster's elsewhere.
 */
export function izzoTimeOfFlight(x: number, lambda: number, revolutions = 0): number {
  const distance = Math.abs(x - 1);
  if (distance >= BATTIN_BAND && distance < LAGRANGE_BAND) return lagrangeTime(x, lambda, revolutions);
  const k = lambda * lambda;
  const e = x * x - 1;
  const rho = Math.abs(e);
  const z = Math.sqrt(1 + k * e);
  if (distance < BATTIN_BAND) {
    const eta = z - lambda * x;
    const s1 = 0.5 * (1 - lambda - x * eta);
    const q = (4 / 3) * hypergeometric3_1_52(s1);
    return (eta * eta * eta * q + 4 * lambda * eta) / 2 + (revolutions * Math.PI) / Math.pow(rho, 1.5);
  }
  const y = Math.sqrt(rho);
  const g = x * z - lambda * e;
  let d: number;
  if (e < 0) {
    d = revolutions * Math.PI + Math.acos(Math.max(-1, Math.min(1, g)));
  } else {
    const f = y * (z - lambda * x);
    d = Math.log(f + g);
  }
  return (x - lambda * z - d / y) / e;
}

/** dT/dx, d²T/dx², d³T/dx³ at (x, T(x)) — Izzo (2015) eq. (22); singular at x = ±1 (callers avoid
 * exactly 1 by the Householder update's nature; the series branch keeps T itself accurate there). */
export function izzoTimeDerivatives(x: number, t: number, lambda: number): [number, number, number] {
  const l2 = lambda * lambda;
  const l3 = l2 * lambda;
  const umx2 = 1 - x * x;
  const y = Math.sqrt(1 - l2 * umx2);
  const y2 = y * y;
  const y3 = y2 * y;
  const dt = (3 * t * x - 2 + 2 * l3 * x / y) / umx2;
  const ddt = (3 * t + 5 * x * dt + 2 * (1 - l2) * l3 / y3) / umx2;
  const dddt = (7 * x * ddt + 8 * dt - 6 * (1 - l2) * l2 * l3 * x / (y3 * y2)) / umx2;
  return [dt, ddt, dddt];
}
