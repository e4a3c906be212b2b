/**
 * Confidence ellipses of a 2-D normal: the confidence ring.
 * @module
 */
import type { Matrix2 } from './types';
import { chiSquareQuantile } from './chi-square';
import { eigenSymmetric2 } from './eigen';

/** A centred ellipse: semi-axes in metres and the direction of the major axis in radians. */
export interface Ellipse {
  /** Major semi-axis. */
  major: number;
  /** Minor semi-axis. */
  minor: number;
  /** Direction of the major axis from +x, counter-clockwise, in (-pi/2, pi/2]. */
  angle: number;
}

/**
 * The ellipse that holds probability `p` of a 2-D normal with covariance `cov2`:
 * {x : xᵀ·cov2⁻¹·x ≤ q} with q the chi-square quantile with 2 dof, q = −2·ln(1 − p);
 * semi-axes sqrt(q·lambda_i) along the eigenvectors (R. A. Johnson & D. W. Wichern, Applied
 * Multivariate Statistical Analysis, 6th ed., 2007, ch. 4: the constant-density contours of the
 * normal and their chi-square probability content). The confidence ring is
 * p = 0.95 (the default). Negative eigenvalues from rounding count as zero.
 */
export function confidenceEllipse(cov2: Matrix2, p = 0.95): Ellipse {
  const q = chiSquareQuantile(p, 2);
  const e = eigenSymmetric2(cov2);
  return {
    major: Math.sqrt(q * Math.max(0, e.values[0])),
    minor: Math.sqrt(q * Math.max(0, e.values[1])),
    angle: e.angle,
  };
}
