/**
 * Shared value types of the motion engine.
 *
 * Units everywhere: metres, radians, seconds. Headings are measured counter-clockwise from
 * the +x axis of the site map and normalised to (-pi, pi] (see {@link normalizeAngle}).
 *
 * @module
 */

/**
 * A planar robot pose (x, y in metres, theta in radians, normalised to (-pi, pi]).
 * Source: the pose convention of Thrun, Burgard & Fox, Probabilistic Robotics (2005), §5.2.
 */
export interface Pose {
  x: number;
  y: number;
  theta: number;
}

/** A point of the site map in metres. */
export interface Point2 {
  x: number;
  y: number;
}

/**
 * A simple polygon given by its vertices (closed implicitly; either winding). Points on the
 * inside are decided by the even-odd rule (see {@link pointInPolygon}).
 */
export type Polygon = readonly Point2[];

/**
 * A symmetric 2×2 matrix as rows, e.g. the position block of a pose covariance
 * `[[sxx, sxy], [sxy, syy]]` in m².
 */
export type Matrix2 = readonly (readonly number[])[];

/**
 * A 3×3 matrix as rows, e.g. a pose covariance over (x, y, theta) in m², m·rad and rad².
 */
export type Matrix3 = readonly (readonly number[])[];

/**
 * Noise coefficients a1..a4 of the odometry motion model in VARIANCE form
 * (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, Table 5.6):
 *
 * - var(rot1)  = a1·rot1² + a2·trans²
 * - var(trans) = a3·trans² + a4·(rot1² + rot2²)
 * - var(rot2)  = a1·rot2² + a2·trans²
 *
 * Units: a1 [rad²/rad²], a2 [rad²/m²], a3 [m²/m²], a4 [m²/rad²].
 * Some printings give a standard-deviation form (a1·|rot1| + a2·|trans|); convert with
 * {@link odometryAlphasFromStdDevForm}.
 */
export type OdometryAlphas = readonly [number, number, number, number];

/**
 * Noise coefficients a1..a6 of the velocity motion model in VARIANCE form
 * (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, Tables 5.1 and 5.3):
 *
 * - var(v)     = a1·v² + a2·w²
 * - var(w)     = a3·v² + a4·w²
 * - var(gamma) = a5·v² + a6·w²   (gamma: the extra final rotation rate)
 */
export type VelocityAlphas = readonly [number, number, number, number, number, number];

/**
 * The odometry increment between two odometry poses as an initial rotation, a translation and
 * a final rotation (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, §5.4, Fig. 5.7).
 * `trans` is negative for a reverse move (see {@link odometryDelta}).
 */
export interface OdometryDelta {
  rot1: number;
  trans: number;
  rot2: number;
}

/** Source of randomness used by the samplers (see {@link createRng}). */
export interface Rng {
  /** Uniform draw in [0, 1). */
  uniform(): number;
  /** Standard normal draw (mean 0, variance 1). */
  normal(): number;
}
