/**
 * The one numerics toolkit of the project: dense matrices (number[][]), the SVD and pseudo-inverse, 3×3
 * rotations and 3-vectors, flat 6×6 state transition matrices. Every room takes its matrix arithmetic from
 * here (through propagator/index.ts).
 */
export {
  zeros, identity, transpose, multiply, multiplyVector, norm2, congruence, add, symmetrise, requireCovariance,
  choleskySemidefinite, invert, determinant, trace, subMatrix, symmetricEigenvalues, type Matrix,
} from './matrix.ts';
export { svd, conditionNumber, pseudoSolve, type Svd } from './svd.ts';
export {
  multiplyMatrixVector, multiplyTransposeVector, transpose3, multiplyMatrices3, determinant3, cross3, dot3,
  type Matrix3,
} from './matrix3.ts';
export { identity6, multiply6, velocityColumns, multiply6Columns, rowsOf6 } from './matrix6.ts';
