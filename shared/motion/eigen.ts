/**
 * Closed-form eigen-decomposition of a symmetric 2×2 matrix.
 * @module
 */
import type { Matrix2 } from './types';

/** Eigenvalues (descending) and unit eigenvectors of a symmetric 2×2 matrix. */
export interface Eigen2 {
  /** [largest, smallest]. */
  values: [number, number];
  /** Unit eigenvectors matching `values`, each [x, y]. */
  vectors: [[number, number], [number, number]];
  /** Direction of the first eigenvector, radians in (-pi/2, pi/2]. */
  angle: number;
}

/**
 * Eigen-decomposition of the symmetric matrix [[a, b], [b, c]] in closed form:
 * lambda = (a + c)/2 ± sqrt(((a − c)/2)² + b²), principal direction phi = atan2(2b, a − c)/2
 * (the 2-by-2 symmetric Schur decomposition of Jacobi's method: C. G. J. Jacobi 1846; G. H. Golub
 * & C. F. Van Loan, Matrix Computations, 4th ed., 2013, ch. 8). The off-diagonal is taken as the
 * mean of m[0][1] and m[1][0].
 */
export function eigenSymmetric2(m: Matrix2): Eigen2 {
  const a = m[0][0];
  const b = 0.5 * (m[0][1] + m[1][0]);
  const c = m[1][1];
  const mean = 0.5 * (a + c);
  const r = Math.hypot(0.5 * (a - c), b);
  let angle = 0.5 * Math.atan2(2 * b, a - c);
  if (angle <= -0.5 * Math.PI) angle += Math.PI;
  const cs = Math.cos(angle);
  const sn = Math.sin(angle);
  return {
    values: [mean + r, mean - r],
    vectors: [
      [cs, sn],
      [-sn, cs],
    ],
    angle,
  };
}
