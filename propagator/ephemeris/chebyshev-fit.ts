/**
 * Chebyshev series fitting and evaluation on [-1, 1]: the numeric core of the Chebyshev cache.
 * Fitting uses the Chebyshev–Gauss nodes, where the discrete cosine transform gives the coefficients
 * of the interpolating polynomial (Press et al., Numerical Recipes, 3rd ed., §5.8).
 */

/** The n Chebyshev–Gauss nodes x_k = cos(π (k + ½) / n), k = 0..n-1, on [-1, 1]. */
export function chebyshevNodes(n: number): Float64Array {
  const nodes = new Float64Array(n);
  for (let k = 0; k < n; k++) nodes[k] = Math.cos((Math.PI * (k + 0.5)) / n);
  return nodes;
}

/**
 * Coefficients c_0..c_{n-1} of the degree n-1 polynomial through `values` taken at chebyshevNodes(n):
 * f(x) ≈ Σ c_j T_j(x) (c_0 already halved). Writes into `out[offset..offset+n-1]`.
 */
export function chebyshevCoefficientsInto(values: ArrayLike<number>, n: number, out: Float64Array, offset: number): void {
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let k = 0; k < n; k++) sum += values[k] * Math.cos((Math.PI * j * (k + 0.5)) / n);
    out[offset + j] = ((j === 0 ? 1 : 2) / n) * sum;
  }
}

/** Clenshaw evaluation of Σ c_j T_j(x) for x in [-1, 1], coefficients at `coefs[offset..offset+n-1]`. */
export function chebyshevEvaluate(coefs: Float64Array, offset: number, n: number, x: number): number {
  const x2 = 2 * x;
  let b1 = 0;
  let b2 = 0;
  for (let j = n - 1; j >= 1; j--) {
    const b0 = coefs[offset + j] + x2 * b1 - b2;
    b2 = b1;
    b1 = b0;
  }
  return coefs[offset] + x * b1 - b2;
}

/**
 * Smallest m in [1, n] such that, in every block of n coefficients at `offsets`, dropping c_m..c_{n-1}
 * changes the series by at most `budget` anywhere on [-1, 1] (|T_j| ≤ 1, so Σ|c_j| over the dropped
 * terms bounds the change). Units are those of the coefficients.
 */
export function truncatedLength(coefs: Float64Array, offsets: ArrayLike<number>, n: number, budget: number): number {
  let m = 1;
  for (let i = 0; i < offsets.length; i++) {
    let tail = 0;
    let keep = n;
    while (keep > m && tail + Math.abs(coefs[offsets[i] + keep - 1]) <= budget) {
      tail += Math.abs(coefs[offsets[i] + keep - 1]);
      keep--;
    }
    m = keep;
  }
  return m;
}

/**
 * Coefficients of the derivative d/dx of Σ c_j T_j(x) (same plain-sum convention, c_0 not halved again),
 * times `scale` (e.g. 2/segment length for d/dt), written into `out[outOffset..outOffset+n-1]`
 * (Numerical Recipes 3rd ed. §5.9, chder, with its halved-c_0 convention converted).
 */
export function chebyshevDerivativeInto(coefs: Float64Array, offset: number, n: number, scale: number,
  out: Float64Array, outOffset: number): void {
  let next = 0; // d_{j+1}
  let current = 0; // d_j
  out[outOffset + n - 1] = 0;
  for (let j = n - 1; j >= 1; j--) {
    const previous = next + 2 * j * coefs[offset + j]; // d_{j-1} = d_{j+1} + 2 j c_j
    next = current;
    current = previous;
    out[outOffset + j - 1] = previous * scale;
  }
  out[outOffset] *= 0.5;
}
