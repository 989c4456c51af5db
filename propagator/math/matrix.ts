/**
 * Dense matrices as row-major number[][] (covariances, Jacobians, sensitivities): sizes up to a few dozen,
 * so plain loops. Part of the one numerics module (propagator/math): the 3×3 rotations are in matrix3.ts,
 * the flat 6×6 state transition matrices in matrix6.ts, the SVD and pseudo-inverse in svd.ts.
 */
import { InvalidInputError } from '../../contract/errors.ts';

export type Matrix = number[][];

/** rows × cols matrix of zeros (unitless container). */
export function zeros(rows: number, cols: number): Matrix {
  return Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
}

/** The n × n identity (unitless). */
export function identity(n: number): Matrix {
  return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (__, j) => (i === j ? 1 : 0)));
}

/** Aᵀ (m×n → n×m; an empty matrix stays empty); units carried through. */
export function transpose(a: Matrix): Matrix {
  const m = a.length;
  const n = m === 0 ? 0 : a[0].length;
  const t: Matrix = zeros(n, m);
  for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) t[j][i] = a[i][j];
  return t;
}

/** A·B (A is m×k, B is k×n); units multiply. */
export function multiply(a: Matrix, b: Matrix): Matrix {
  const k = b.length;
  const out = zeros(a.length, k === 0 ? 0 : b[0].length);
  for (let i = 0; i < a.length; i++) {
    for (let p = 0; p < k; p++) {
      const aip = a[i][p];
      if (aip === 0) continue;
      for (let j = 0; j < out[i].length; j++) out[i][j] += aip * b[p][j];
    }
  }
  return out;
}

/** A·x for a matrix and a vector of matching length. */
export function multiplyVector(a: Matrix, x: readonly number[]): number[] {
  return a.map((row) => row.reduce((s, v, j) => s + v * x[j], 0));
}

/** Euclidean norm |x|. */
export function norm2(x: readonly number[]): number {
  let s = 0;
  for (const v of x) s += v * v;
  return Math.sqrt(s);
}

/** R·C·Rᵀ: a covariance C carried through the linear map R (a rotation, a Jacobian). */
export function congruence(r: Matrix, c: readonly (readonly number[])[]): Matrix {
  return multiply(multiply(r, c as Matrix), transpose(r));
}

/** A + B, same shape and units. */
export function add(a: Matrix, b: Matrix): Matrix {
  return a.map((row, i) => row.map((v, j) => v + b[i][j]));
}

/** (A + Aᵀ)/2: removes round-off asymmetry from covariance products. */
export function symmetrise(a: Matrix): Matrix {
  return a.map((row, i) => row.map((v, j) => (v + a[j][i]) / 2));
}

/** Checks a square, finite, symmetric matrix of size n; names `field` in the error. */
export function requireCovariance(field: string, a: Matrix, n: number): void {
  if (!Array.isArray(a) || a.length !== n || a.some((row) => !Array.isArray(row) || row.length !== n)) {
    throw new InvalidInputError(field, `must be a ${n}x${n} matrix`);
  }
  for (let i = 0; i < n; i += 1) {
    for (let j = 0; j < n; j += 1) {
      if (!Number.isFinite(a[i][j])) throw new InvalidInputError(`${field}[${i}][${j}]`, `must be finite, got ${a[i][j]}`);
      const scale = Math.max(Math.abs(a[i][j]), Math.abs(a[j][i]), 1e-300);
      if (Math.abs(a[i][j] - a[j][i]) > 1e-9 * scale) {
        throw new InvalidInputError(`${field}[${i}][${j}]`, `matrix is not symmetric: ${a[i][j]} vs ${a[j][i]}`);
      }
    }
    if (a[i][i] < 0) throw new InvalidInputError(`${field}[${i}][${i}]`, `variance must be >= 0, got ${a[i][i]}`);
  }
}

/**
 * Lower-triangular L with L·Lᵀ = A for a symmetric positive semi-definite A. The factorisation runs on the
 * correlation form D⁻¹AD⁻¹ (D = sqrt(diag A)) and scales back, so variances in different units (km² next to
 * km²/s²) are all kept; pivots within 1e-12 of zero in that form are taken as zero (a degenerate direction
 * gets no spread), as is a zero variance.
 * @throws InvalidInputError naming `field` when A is not positive semi-definite.
 */
export function choleskySemidefinite(a: Matrix, field = 'covariance'): Matrix {
  const n = a.length;
  const l = zeros(n, n);
  const d = a.map((row, i) => Math.sqrt(Math.max(0, row[i])));
  const at = (i: number, j: number): number => (d[i] > 0 && d[j] > 0 ? a[i][j] / (d[i] * d[j]) : 0);
  const floor = 1e-12;
  for (let j = 0; j < n; j += 1) {
    let p = at(j, j);
    for (let k = 0; k < j; k += 1) p -= l[j][k] * l[j][k];
    if (p < -floor * 10) {
      throw new InvalidInputError(field, `is not positive semi-definite (pivot ${j} = ${p.toExponential(3)} in correlation form)`);
    }
    if (p <= floor) continue; // zero column
    const ljj = Math.sqrt(p);
    l[j][j] = ljj;
    for (let i = j + 1; i < n; i += 1) {
      let s = at(i, j);
      for (let k = 0; k < j; k += 1) s -= l[i][k] * l[j][k];
      l[i][j] = s / ljj;
    }
  }
  return l.map((row, i) => row.map((v) => v * d[i]));
}

/** Inverse of a symmetric positive definite matrix by Gauss–Jordan with partial pivoting.
 * @throws InvalidInputError naming `field` when singular. */
export function invert(a: Matrix, field = 'matrix'): Matrix {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  const scale = Math.max(...a.flat().map(Math.abs), 1e-300);
  for (let c = 0; c < n; c += 1) {
    let p = c;
    for (let r = c + 1; r < n; r += 1) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    if (Math.abs(m[p][c]) <= 1e-14 * scale) throw new InvalidInputError(field, 'matrix is singular');
    [m[c], m[p]] = [m[p], m[c]];
    const pivot = m[c][c];
    for (let j = 0; j < 2 * n; j += 1) m[c][j] /= pivot;
    for (let r = 0; r < n; r += 1) {
      if (r === c || m[r][c] === 0) continue;
      const f = m[r][c];
      for (let j = 0; j < 2 * n; j += 1) m[r][j] -= f * m[c][j];
    }
  }
  return m.map((row) => row.slice(n));
}

/** Determinant by LU with partial pivoting. */
/** det A of a square matrix (units to the power n). */
export function determinant(a: Matrix): number {
  const n = a.length;
  const m = a.map((row) => [...row]);
  let det = 1;
  for (let c = 0; c < n; c += 1) {
    let p = c;
    for (let r = c + 1; r < n; r += 1) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    if (m[p][c] === 0) return 0;
    if (p !== c) { [m[c], m[p]] = [m[p], m[c]]; det = -det; }
    det *= m[c][c];
    for (let r = c + 1; r < n; r += 1) {
      const f = m[r][c] / m[c][c];
      for (let j = c; j < n; j += 1) m[r][j] -= f * m[c][j];
    }
  }
  return det;
}

/** Sum of the diagonal of a square matrix. */
export function trace(a: Matrix): number {
  return a.reduce((s, row, i) => s + row[i], 0);
}

/** Rows `indices` and the same columns of a square matrix. */
export function subMatrix(a: Matrix, indices: readonly number[]): Matrix {
  return indices.map((i) => indices.map((j) => a[i][j]));
}

/** Eigenvalues of a symmetric matrix by cyclic Jacobi rotations (Golub & Van Loan, Matrix Computations,
 * §8.5), in diagonal order (not sorted); converges quadratically, a 6×6 needs a handful of sweeps. */
export function symmetricEigenvalues(matrix: readonly (readonly number[])[]): number[] {
  const n = matrix.length;
  const a = matrix.map((row) => [...row]);
  for (let sweep = 0; sweep < 50; sweep++) {
    let off = 0;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off += a[p][q] * a[p][q];
    if (off < 1e-30) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        if (a[p][q] === 0) continue;
        const theta = (a[q][q] - a[p][p]) / (2 * a[p][q]);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k][p];
          const akq = a[k][q];
          a[k][p] = c * akp - s * akq;
          a[k][q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p][k];
          const aqk = a[q][k];
          a[p][k] = c * apk - s * aqk;
          a[q][k] = s * apk + c * aqk;
        }
      }
    }
  }
  return a.map((row, i) => row[i]);
}
