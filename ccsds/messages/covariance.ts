/**
 * 6×6 position/velocity covariance as the Orbit Data Messages write it: lower triangle row by row,
 * km², km²/s, km²/s² (502.0-B 3.2.4.10). Checks symmetry-free input for positive semi-definiteness and
 * rotates between local orbital frames and inertial axes.
 */
import { symmetricEigenvalues } from '../../propagator/index.ts';
import { CcsdsFormatError } from '../errors.ts';

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
  const lambda = Math.min(...symmetricEigenvalues(corr));
  if (lambda < -PSD_TOLERANCE) {
    throw new CcsdsFormatError(keyword, line, `covariance is not positive semi-definite: its correlation `
      + `matrix has eigenvalue ${lambda.toExponential(3)} (< -${PSD_TOLERANCE})`);
  }
}
