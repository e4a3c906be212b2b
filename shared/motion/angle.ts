/**
 * Angle arithmetic.
 * @module
 */

const PI = Math.PI;
const TWO_PI = 2 * Math.PI;

/**
 * Normalises an angle to (-pi, pi]: `pi` stays `pi`, `-pi` becomes `pi`, `-0` becomes `0`.
 * NaN and ±Infinity give NaN.
 *
 * Source: the angle-wrapping convention of Thrun, Burgard & Fox, Probabilistic Robotics
 * (2005), §5.4 (angular differences are taken modulo 2·pi), with the half-open interval chosen
 * so that every heading has exactly one representation.
 */
export function normalizeAngle(a: number): number {
  if (a > -PI && a <= PI) return a === 0 ? 0 : a;
  let r = a - TWO_PI * Math.floor((a + PI) / TWO_PI);
  if (r <= -PI) r += TWO_PI;
  else if (r > PI) r -= TWO_PI;
  return r;
}

/**
 * The signed smallest rotation from `from` to `to`, in (-pi, pi].
 * Source: as {@link normalizeAngle}.
 */
export function angleDifference(to: number, from: number): number {
  return normalizeAngle(to - from);
}
