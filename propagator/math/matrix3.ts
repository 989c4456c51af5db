/** 3-vectors and 3×3 matrices (row-major, 9 numbers): the frame rotations' arithmetic. */
import type { Vec3 } from '../types.ts';

/** A 3×3 matrix in row-major order: [m00, m01, m02, m10, m11, m12, m20, m21, m22]. */
export type Matrix3 = [number, number, number, number, number, number, number, number, number];

/** M · v. */
export function multiplyMatrixVector(m: Readonly<Matrix3>, v: ArrayLike<number>): Vec3 {
  return [
    m[0] * v[0] + m[1] * v[1] + m[2] * v[2],
    m[3] * v[0] + m[4] * v[1] + m[5] * v[2],
    m[6] * v[0] + m[7] * v[1] + m[8] * v[2],
  ];
}

/** Mᵀ · v (the inverse rotation when M is orthonormal). */
export function multiplyTransposeVector(m: Readonly<Matrix3>, v: ArrayLike<number>): Vec3 {
  return [
    m[0] * v[0] + m[3] * v[1] + m[6] * v[2],
    m[1] * v[0] + m[4] * v[1] + m[7] * v[2],
    m[2] * v[0] + m[5] * v[1] + m[8] * v[2],
  ];
}

/** Mᵀ. */
export function transpose3(m: Readonly<Matrix3>): Matrix3 {
  return [m[0], m[3], m[6], m[1], m[4], m[7], m[2], m[5], m[8]];
}

/** A · B. */
export function multiplyMatrices3(a: Readonly<Matrix3>, b: Readonly<Matrix3>): Matrix3 {
  const out = new Array<number>(9).fill(0) as Matrix3;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      out[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
    }
  }
  return out;
}

/** Determinant of M. */
export function determinant3(m: Readonly<Matrix3>): number {
  return m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
}

/** a × b (units multiply). */
export function cross3(a: ArrayLike<number>, b: ArrayLike<number>): Vec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

/** a · b (units multiply). */
export function dot3(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}
