/**
 * 6×6 position/velocity covariance as the Orbit Data Messages write it: lower triangle row by row,
 * km², km²/s, km²/s² (502.0-B 3.2.4.10). Checks symmetry-free input for positive semi-definiteness and
 * rotates between local orbital frames and inertial axes.
 */
import type { Vec3 } from '../propagator/index.ts';
import { CcsdsFormatError } from './errors.ts';

/** The 21 OPM covariance keywords in the standard's order (row-major lower triangle). */
export const COVARIANCE_KEYWORDS: readonly string[] = (() => {
  const names = ['X', 'Y', 'Z', 'X_DOT', 'Y_DOT', 'Z_DOT'];
  const out: string[] = [];
  for (let i = 0; i < 6; i++) for (let j = 0; j <= i; j++) out.push(`C${names[i]}_${names[j]}`);
  return out;
})();

/** Unit of the covariance element [i][j] (0-based): km**2, km**2/s or km**2/s**2. */
export function covarianceUnit(i: number, j: number): string {
  const velocities = (i >= 3 ? 1 : 0) + (j >= 3 ? 1 : 0);
  return ['km**2', 'km**2/s', 'km**2/s**2'][velocities];
}

/** Builds the symmetric 6×6 matrix from the 21 lower-triangle values in row order. */
export function matrixFromLowerTriangle(values: readonly number[]): number[][] {
  const m = Array.from({ length: 6 }, () => new Array<number>(6).fill(0));
  let k = 0;
  for (let i = 0; i < 6; i++) for (let j = 0; j <= i; j++) { m[i][j] = values[k]; m[j][i] = values[k]; k++; }
  return m;
}

/** The 21 lower-triangle values of a 6×6 matrix, row by row. */
export function lowerTriangle(matrix: readonly (readonly number[])[]): number[] {
  const out: number[] = [];
  for (let i = 0; i < 6; i++) for (let j = 0; j <= i; j++) out.push(matrix[i][j]);
  return out;
}

/** Smallest eigenvalue of a symmetric matrix by cyclic Jacobi rotations (Golub & Van Loan, Matrix
 * Computations, §8.5); converges quadratically, 6×6 needs a handful of sweeps. */
export function smallestEigenvalue(matrix: readonly (readonly number[])[]): number {
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
  return Math.min(...a.map((row, i) => row[i]));
}

/** Tolerance on the smallest eigenvalue of the correlation matrix: values printed to about ten
 * significant digits can push a singular (rank-deficient) covariance this far below zero. */
export const PSD_TOLERANCE = 1e-9;

/**
 * Throws CcsdsFormatError (with `line`) unless the covariance is positive semi-definite. The test is on
 * the correlation matrix D^-1/2 C D^-1/2, so the mixed units (km², km²/s²) do not skew it; a negative
 * variance or a zero variance with non-zero covariances fails directly.
 */
export function assertPositiveSemiDefinite(matrix: readonly (readonly number[])[], keyword: string, line: number): void {
  const sd = matrix.map((row, i) => row[i]);
  for (let i = 0; i < 6; i++) {
    if (!(sd[i] >= 0)) {
      throw new CcsdsFormatError(keyword, line, `covariance is not positive semi-definite: variance [${i + 1},${i + 1}] `
        + `= ${sd[i]} < 0`);
    }
  }
  const scale = sd.map((v) => (v > 0 ? 1 / Math.sqrt(v) : 0));
  const corr = matrix.map((row, i) => row.map((v, j) => v * scale[i] * scale[j]));
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 6; j++) {
      if ((sd[i] === 0 || sd[j] === 0) && matrix[i][j] !== 0) {
        throw new CcsdsFormatError(keyword, line, `covariance is not positive semi-definite: element `
          + `[${i + 1},${j + 1}] = ${matrix[i][j]} with a zero variance on its row or column`);
      }
    }
  }
  const lambda = smallestEigenvalue(corr);
  if (lambda < -PSD_TOLERANCE) {
    throw new CcsdsFormatError(keyword, line, `covariance is not positive semi-definite: its correlation `
      + `matrix has eigenvalue ${lambda.toExponential(3)} (< -${PSD_TOLERANCE})`);
  }
}

function unit(v: Vec3): Vec3 {
  const n = Math.hypot(v[0], v[1], v[2]);
  return [v[0] / n, v[1] / n, v[2] / n];
}

function cross(a: Vec3, b: Vec3): Vec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

/** Rows are the RTN axes (R = r̂, N = (r×v)^, T = N × R) in the state's inertial axes. */
export function rtnAxes(positionKm: Vec3, velocityKmS: Vec3): [Vec3, Vec3, Vec3] {
  const r = unit(positionKm);
  const n = unit(cross(positionKm, velocityKmS));
  return [r, cross(n, r), n];
}

/** Rows are the TNW axes (T = v̂, W = (r×v)^, N = W × T) in the state's inertial axes. */
export function tnwAxes(positionKm: Vec3, velocityKmS: Vec3): [Vec3, Vec3, Vec3] {
  const t = unit(velocityKmS);
  const w = unit(cross(positionKm, velocityKmS));
  return [t, cross(w, t), w];
}

/** Rotates a 6×6 covariance given in a local frame (rows of `axes` in inertial axes) to the inertial
 * axes: C_in = Bᵀ C_loc B with B = diag(A, A). The frame is taken as non-rotating at the epoch (the
 * usual reading of a local-frame covariance; the ω×r term is not applied). */
export function covarianceLocalToInertial(local: readonly (readonly number[])[], axes: [Vec3, Vec3, Vec3]): number[][] {
  return congruence(local, axes, true);
}

/** Inverse of {@link covarianceLocalToInertial}: C_loc = B C_in Bᵀ. */
export function covarianceInertialToLocal(inertial: readonly (readonly number[])[], axes: [Vec3, Vec3, Vec3]): number[][] {
  return congruence(inertial, axes, false);
}

function congruence(c: readonly (readonly number[])[], axes: [Vec3, Vec3, Vec3], transpose: boolean): number[][] {
  // b[i][j]: element of the 6×6 block-diagonal rotation (or its transpose).
  const b = (i: number, j: number): number => {
    if ((i < 3) !== (j < 3)) return 0;
    const [r, k] = transpose ? [j % 3, i % 3] : [i % 3, j % 3];
    return axes[r][k];
  };
  const out = Array.from({ length: 6 }, () => new Array<number>(6).fill(0));
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 6; j++) {
      let s = 0;
      for (let k = 0; k < 6; k++) for (let l = 0; l < 6; l++) s += b(i, k) * c[k][l] * b(j, l);
      out[i][j] = s;
    }
  }
  return out;
}
