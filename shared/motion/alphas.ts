/**
 * Conversions between the two printed forms of the motion-model noise coefficients.
 *
 * The engine uses the VARIANCE form of Thrun, Burgard & Fox, Probabilistic Robotics (2005),
 * Table 5.6: var(rot1) = a1·rot1² + a2·trans². Some printings (and much robot software) give a
 * STANDARD-DEVIATION form: sd(rot1) = b1·|rot1| + b2·|trans|. The two are not exactly
 * equivalent: with a_i = b_i², the variance form omits the cross term 2·b1·b2·|rot1|·|trans|,
 * so var_varianceForm ≤ sd_stdForm² ≤ 2·var_varianceForm for the rotations (4· for the
 * translation, whose std-dev form also has (|rot1| + |rot2|)²); equality on the left when a
 * single term is non-zero, e.g. a pure translation.
 * @module
 */
import type { OdometryAlphas, VelocityAlphas } from './types';

/**
 * Converts standard-deviation-form odometry coefficients [b1..b4] to the variance form used by
 * the engine: a_i = b_i². Exact for motions in which a single term dominates each noise; see
 * the module note for the bound otherwise. Source: Thrun, Burgard & Fox (2005), Table 5.6
 * (variance form) against the standard-deviation form of other printings.
 */
export function odometryAlphasFromStdDevForm(b: OdometryAlphas): OdometryAlphas {
  return [b[0] * b[0], b[1] * b[1], b[2] * b[2], b[3] * b[3]];
}

/** Inverse of {@link odometryAlphasFromStdDevForm}: b_i = sqrt(a_i). Same source. */
export function odometryAlphasToStdDevForm(a: OdometryAlphas): OdometryAlphas {
  return [Math.sqrt(a[0]), Math.sqrt(a[1]), Math.sqrt(a[2]), Math.sqrt(a[3])];
}

/**
 * Scales odometry variance coefficients by a floor zone's drift multiplier (every variance
 * grows by the same factor, so every standard deviation by its square root).
 * Source: the variance form of Thrun, Burgard & Fox (2005), Table 5.6.
 */
export function scaleOdometryAlphas(a: OdometryAlphas, multiplier: number): OdometryAlphas {
  return [a[0] * multiplier, a[1] * multiplier, a[2] * multiplier, a[3] * multiplier];
}

/**
 * Converts standard-deviation-form velocity coefficients [b1..b6] to the variance form:
 * a_i = b_i² (Thrun, Burgard & Fox 2005, Tables 5.1 and 5.3; same caveat as the odometry form).
 */
export function velocityAlphasFromStdDevForm(b: VelocityAlphas): VelocityAlphas {
  return [b[0] * b[0], b[1] * b[1], b[2] * b[2], b[3] * b[3], b[4] * b[4], b[5] * b[5]];
}
