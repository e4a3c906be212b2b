/**
 * Zero-mean normal densities, the `prob(a, b²)` of the motion models.
 * @module
 */

/**
 * Smallest variance used by the densities. A noise term whose model variance is zero (for
 * example every term when the robot stands still) would make the density a Dirac delta; with
 * this floor the densities stay finite (a very sharp peak instead).
 */
export const VARIANCE_FLOOR = 1e-12;

const LOG_TWO_PI = Math.log(2 * Math.PI);

/**
 * Density of `a` under a zero-mean normal with the given variance, `prob(a, b²)` of
 * Thrun, Burgard & Fox, Probabilistic Robotics (2005), Table 5.2. The variance is floored at
 * {@link VARIANCE_FLOOR}.
 */
export function normalDensity(a: number, variance: number): number {
  const v = variance > VARIANCE_FLOOR ? variance : VARIANCE_FLOOR;
  return Math.exp((-0.5 * a * a) / v) / Math.sqrt(2 * Math.PI * v);
}

/** Natural log of {@link normalDensity} (same source), without underflow. */
export function logNormalDensity(a: number, variance: number): number {
  const v = variance > VARIANCE_FLOOR ? variance : VARIANCE_FLOOR;
  return -0.5 * (LOG_TWO_PI + Math.log(v)) - (0.5 * a * a) / v;
}
