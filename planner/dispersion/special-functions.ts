/**
 * Special functions for dispersion statistics: erfc, the normal distribution, ln Γ and the regularised
 * incomplete gamma function (for χ² tail probabilities).
 * erfc: power series of erf with positive terms for x < 2.5 (Abramowitz & Stegun 7.1.6) and the Laplace
 * continued fraction for x ≥ 2.5 (A&S 7.1.14), both evaluated to full double precision.
 * ln Γ: Lanczos approximation, g = 7, n = 9 (coefficients as widely published, from memory).
 * P(a, x), Q(a, x): series and Legendre continued fraction (Press et al., Numerical Recipes, §6.2).
 */

const SQRT_PI = Math.sqrt(Math.PI);

/** Complementary error function erfc(x) for real x, relative accuracy ~1e-14. */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return Number.NaN;
  if (x < 0) return 2 - erfc(-x);
  if (x < 2.5) {
    // erf(x) = 2/√π · e^(−x²) · Σ (2x²)^n · x / (1·3·…·(2n+1))
    const x2 = x * x;
    let term = x;
    let sum = x;
    for (let n = 1; n < 200; n += 1) {
      term *= (2 * x2) / (2 * n + 1);
      sum += term;
      if (term < sum * 1e-17) break;
    }
    return 1 - (2 / SQRT_PI) * Math.exp(-x2) * sum;
  }
  if (x > 27) return 0;
  // erfc(x) = e^(−x²)/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + …)))) by modified Lentz.
  const tiny = 1e-300;
  let f = x;
  let c = x;
  let d = 0;
  for (let n = 1; n < 500; n += 1) {
    const a = n / 2;
    d = x + a * d;
    d = Math.abs(d) < tiny ? 1 / tiny : 1 / d;
    c = x + a / c;
    if (Math.abs(c) < tiny) c = tiny;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-x * x) / (SQRT_PI * f);
}

/** Standard normal upper tail Q(z) = P(Z > z) = erfc(z/√2)/2. */
export function normalUpperTail(z: number): number {
  return erfc(z / Math.SQRT2) / 2;
}

/** P(lo < Z < hi) for a standard normal Z, accurate in both tails. */
export function normalInterval(lo: number, hi: number): number {
  if (hi <= lo) return 0;
  if (lo >= 0) return normalUpperTail(lo) - normalUpperTail(hi);
  if (hi <= 0) return normalUpperTail(-hi) - normalUpperTail(-lo);
  return 1 - normalUpperTail(-lo) - normalUpperTail(hi);
}

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** ln Γ(a) for a > 0. */
export function lnGamma(a: number): number {
  if (a < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * a)) - lnGamma(1 - a);
  const z = a - 1;
  let x = LANCZOS[0];
  for (let i = 1; i < 9; i += 1) x += LANCZOS[i] / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(x);
}

/** Regularised upper incomplete gamma Q(a, x) = Γ(a, x)/Γ(a), a > 0, x ≥ 0. */
export function gammaQ(a: number, x: number): number {
  if (x <= 0) return 1;
  const lnPrefix = -x + a * Math.log(x) - lnGamma(a);
  if (x < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n < 10000; n += 1) {
      term *= x / (a + n);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * 1e-16) break;
    }
    return 1 - sum * Math.exp(lnPrefix);
  }
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 10000; i += 1) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(lnPrefix) * h;
}

/** Upper-tail probability of a χ² variable with `dof` degrees of freedom: P(χ² > x). */
export function chiSquareSurvival(x: number, dof: number): number {
  return gammaQ(dof / 2, x / 2);
}
