/**
 * Matrices handed to a decomposition that needs symmetry. ml-matrix's Cholesky refuses a matrix
 * that is not exactly symmetric, and a covariance that went through JSON, an inverse or a
 * product is often off by an ulp; (C + Cᵀ)/2 is the nearest symmetric matrix (in the Frobenius
 * norm; Higham, "Computing a nearest symmetric positive semidefinite matrix", 1988, from memory).
 */
import { Matrix } from 'ml-matrix';

/** The symmetric part (C + Cᵀ)/2 of a square matrix given by rows. */
export function symmetricMatrix(rows: readonly (readonly number[])[]): Matrix {
  const n = rows.length;
  const m = new Matrix(n, n);
  for (let a = 0; a < n; a++) {
    m.set(a, a, rows[a]![a]!);
    for (let b = 0; b < a; b++) {
      const v = 0.5 * (rows[a]![b]! + rows[b]![a]!);
      m.set(a, b, v);
      m.set(b, a, v);
    }
  }
  return m;
}
