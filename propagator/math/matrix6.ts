/** Small dense 6x6 matrix helpers (row-major, 36 numbers) for state transition matrices. */
import type { Matrix } from './matrix.ts';

/** The 6x6 identity as a fresh Float64Array. */
export function identity6(): Float64Array {
  const m = new Float64Array(36);
  for (let i = 0; i < 6; i++) m[7 * i] = 1;
  return m;
}

/** out = a · b for 6x6 row-major matrices; `out` may not alias `a` or `b`. */
export function multiply6(a: ArrayLike<number>, b: ArrayLike<number>, out: Float64Array): Float64Array {
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 6; j++) {
      let sum = 0;
      for (let k = 0; k < 6; k++) sum += a[6 * i + k] * b[6 * k + j];
      out[6 * i + j] = sum;
    }
  }
  return out;
}

/** Columns 3..5 of a 6x6 row-major matrix as a 6x3 row-major array (18 numbers), times `sign`. */
export function velocityColumns(m: ArrayLike<number>, sign = 1): number[] {
  const out: number[] = [];
  for (let i = 0; i < 6; i++) for (let j = 3; j < 6; j++) out.push(sign * m[6 * i + j]);
  return out;
}

/** a · b for a 6x6 row-major `a` and a 6 x `columns` row-major `b` (a 6-vector when columns = 1), as a new
 * array of 6·columns numbers. */
export function multiply6Columns(a: ArrayLike<number>, b: ArrayLike<number>, columns: number): number[] {
  const out = new Array<number>(6 * columns).fill(0);
  for (let i = 0; i < 6; i++) {
    for (let k = 0; k < 6; k++) {
      const f = a[6 * i + k];
      if (f === 0) continue;
      for (let j = 0; j < columns; j++) out[columns * i + j] += f * b[columns * k + j];
    }
  }
  return out;
}

/** A 6x6 row-major flat matrix (36 numbers) as a dense Matrix of 6 rows, for the number[][] arithmetic of
 * matrix.ts (Φ · G with `multiply`); units carried through. */
export function rowsOf6(m: ArrayLike<number>): Matrix {
  return [0, 1, 2, 3, 4, 5].map((i) => Array.from({ length: 6 }, (_, j) => m[6 * i + j]));
}
