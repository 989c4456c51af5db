/**
 * The singular value decomposition by one-sided Jacobi
 * rotations (Hestenes 1958; see Golub & Van Loan, Matrix Computations, 4th ed., §8.6.3) and the
 * pseudo-inverse solve it gives — minimum-norm when there are more unknowns than equations, least squares
 * when there are more equations. Sizes here are a few dozen at most, so clarity beats speed.
 */
import { transpose, type Matrix } from './matrix.ts';

export interface Svd {
  /** m x k left singular vectors (k = min(m, n)), columns. */
  u: Matrix;
  /** k singular values, descending, >= 0. */
  s: number[];
  /** n x k right singular vectors, columns. */
  v: Matrix;
}

/** SVD of an m x n matrix (any shape) by one-sided Jacobi: A = U diag(s) Vᵀ. */
export function svd(a: Matrix): Svd {
  const m = a.length;
  const n = m === 0 ? 0 : a[0].length;
  if (m < n) {
    const t = svd(transpose(a));
    return { u: t.v, s: t.s, v: t.u };
  }
  const w = a.map((row) => row.slice()); // columns get orthogonalised in place
  const v: Matrix = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (__, j) => (i === j ? 1 : 0)));
  for (let sweep = 0; sweep < 60; sweep++) {
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        let alpha = 0;
        let beta = 0;
        let gamma = 0;
        for (let i = 0; i < m; i++) {
          alpha += w[i][p] * w[i][p];
          beta += w[i][q] * w[i][q];
          gamma += w[i][p] * w[i][q];
        }
        if (gamma === 0 || Math.abs(gamma) <= 1e-15 * Math.sqrt(alpha * beta)) continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = c * t;
        for (let i = 0; i < m; i++) {
          const wp = w[i][p];
          const wq = w[i][q];
          w[i][p] = c * wp - s * wq;
          w[i][q] = s * wp + c * wq;
        }
        for (let i = 0; i < n; i++) {
          const vp = v[i][p];
          const vq = v[i][q];
          v[i][p] = c * vp - s * vq;
          v[i][q] = s * vp + c * vq;
        }
      }
    }
    if (!rotated) break;
  }
  const sigma = Array.from({ length: n }, (_, j) => Math.sqrt(w.reduce((acc, row) => acc + row[j] * row[j], 0)));
  const order = sigma.map((s, j) => ({ s, j })).sort((x, y) => y.s - x.s).map((o) => o.j);
  const u: Matrix = Array.from({ length: m }, () => new Array<number>(n).fill(0));
  const vs: Matrix = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  order.forEach((j, k) => {
    const sj = sigma[j];
    for (let i = 0; i < m; i++) u[i][k] = sj > 0 ? w[i][j] / sj : 0;
    for (let i = 0; i < n; i++) vs[i][k] = v[i][j];
  });
  return { u, s: order.map((j) => sigma[j]), v: vs };
}

/** 2-norm condition number σmax/σmin (Infinity when rank-deficient, 1 for an empty matrix). */
export function conditionNumber(s: readonly number[]): number {
  if (s.length === 0) return 1;
  const max = s[0];
  const min = s[s.length - 1];
  return min > 0 ? max / min : Infinity;
}

/**
 * x = A⁺ b from an SVD: singular values below `relativeCutoff` × σmax are treated as zero. For
 * under-determined systems this is the minimum-norm solution; for over-determined ones the least-squares
 * solution (of minimum norm if rank-deficient).
 */
export function pseudoSolve(d: Svd, b: readonly number[], relativeCutoff = 1e-12): { x: number[]; rank: number } {
  const n = d.v.length;
  const x = new Array<number>(n).fill(0);
  const smax = d.s[0] ?? 0;
  let rank = 0;
  d.s.forEach((s, k) => {
    if (s <= relativeCutoff * smax || s === 0) return;
    rank += 1;
    let ub = 0;
    for (let i = 0; i < b.length; i++) ub += d.u[i][k] * b[i];
    const f = ub / s;
    for (let i = 0; i < n; i++) x[i] += d.v[i][k] * f;
  });
  return { x, rank };
}
