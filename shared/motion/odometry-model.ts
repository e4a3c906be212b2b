/**
 * The odometry motion model (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, §5.4,
 * Tables 5.5 and 5.6), variance form.
 * @module
 */
import type { OdometryAlphas, OdometryDelta, Pose, Rng } from './types';
import { normalizeAngle } from './angle';
import { normalDensity } from './gaussian';

const PI = Math.PI;
const HALF_PI = 0.5 * Math.PI;

/**
 * Translations shorter than this (metres) count as none: the increment is then a pure
 * rotation (rot1 = 0, trans = 0, rot2 = dtheta) instead of the book's atan2(0, 0) − theta.
 */
export const TRANS_EPSILON = 1e-9;

/**
 * Splits the odometry increment from `prevOdom` to `odom` into rot1, trans, rot2 as in
 * Thrun, Burgard & Fox (2005), Table 5.6, lines 2–4:
 * rot1 = atan2(y' − y, x' − x) − theta, trans = |(x' − x, y' − y)|, rot2 = theta' − theta − rot1
 * (all angles normalised to (-pi, pi]).
 *
 * Two departures from the printed algorithm, both needed for robots that reverse or turn on
 * the spot (and both leave the end pose unchanged):
 * - Reverse moves: when |rot1| > pi/2 the move is read as a reverse move, rot1 ∓ pi with a
 *   NEGATIVE trans; otherwise a 5 cm reverse step would count as a half turn and the rotation
 *   noise a1·rot1² would explode.
 * - No translation (below {@link TRANS_EPSILON}): rot1 = 0, trans = 0, rot2 = dtheta.
 */
export function odometryDelta(prevOdom: Pose, odom: Pose): OdometryDelta {
  const dx = odom.x - prevOdom.x;
  const dy = odom.y - prevOdom.y;
  const dist = Math.sqrt(dx * dx + dy * dy);
  const dTheta = normalizeAngle(odom.theta - prevOdom.theta);
  if (dist < TRANS_EPSILON) return { rot1: 0, trans: 0, rot2: dTheta };
  let rot1 = normalizeAngle(Math.atan2(dy, dx) - prevOdom.theta);
  let trans = dist;
  if (rot1 > HALF_PI) {
    rot1 -= PI;
    trans = -dist;
  } else if (rot1 < -HALF_PI) {
    rot1 += PI;
    trans = -dist;
  }
  return { rot1, trans, rot2: normalizeAngle(dTheta - rot1) };
}

/**
 * Applies an increment to a pose: x' = x + trans·cos(theta + rot1),
 * y' = y + trans·sin(theta + rot1), theta' = theta + rot1 + rot2
 * (Thrun, Burgard & Fox 2005, Table 5.6, lines 8–10).
 */
export function applyOdometryDelta(pose: Pose, d: OdometryDelta): Pose {
  const heading = pose.theta + d.rot1;
  return {
    x: pose.x + d.trans * Math.cos(heading),
    y: pose.y + d.trans * Math.sin(heading),
    theta: normalizeAngle(heading + d.rot2),
  };
}

/**
 * Variances of the three noise terms for an increment, variance form of
 * Thrun, Burgard & Fox (2005), Table 5.6: [a1·rot1² + a2·trans²,
 * a3·trans² + a4·(rot1² + rot2²), a1·rot2² + a2·trans²].
 */
export function odometryVariances(d: OdometryDelta, a: OdometryAlphas): [number, number, number] {
  const r1 = d.rot1 * d.rot1;
  const t = d.trans * d.trans;
  const r2 = d.rot2 * d.rot2;
  return [a[0] * r1 + a[1] * t, a[2] * t + a[3] * (r1 + r2), a[0] * r2 + a[1] * t];
}

/**
 * Draws a pose from p(x_t | u_t, x_{t-1}) with u_t = (prevOdom, odom):
 * `sample_motion_model_odometry` of Thrun, Burgard & Fox (2005), Table 5.6, variance form
 * (rot1^ = rot1 − sample(a1·rot1² + a2·trans²), and so on). Draws exactly three normals from
 * `rng`, in the order rot1, trans, rot2.
 */
export function sampleOdometry(
  prevPose: Pose,
  prevOdom: Pose,
  odom: Pose,
  alphas: OdometryAlphas,
  rng: Rng,
): Pose {
  const d = odometryDelta(prevOdom, odom);
  const v = odometryVariances(d, alphas);
  const rot1 = d.rot1 - Math.sqrt(v[0]) * rng.normal();
  const trans = d.trans - Math.sqrt(v[1]) * rng.normal();
  const rot2 = d.rot2 - Math.sqrt(v[2]) * rng.normal();
  return applyOdometryDelta(prevPose, { rot1, trans, rot2 });
}

/**
 * The density p(x_t | u_t, x_{t-1}) over poses (per m² per rad) of exactly what
 * {@link sampleOdometry} draws. Follows `motion_model_odometry` of Thrun, Burgard & Fox (2005),
 * Table 5.5 — recover the hypothesised increment (rot1^, trans^, rot2^) from prevPose to pose
 * and multiply prob(rot1 − rot1^, ·)·prob(trans − trans^, ·)·prob(rot2 − rot2^, ·) — with two
 * corrections so that the result is a probability density over poses that integrates to one:
 * - it divides by |trans^|, the Jacobian |det ∂(x, y, theta)/∂(rot1, trans, rot2)| of the change
 *   of variables (the printed product is a density over (rot1, trans, rot2));
 * - the variances come from the measured increment, as in the sampler (Table 5.6), instead of
 *   from the hypothesis; and both readings of the hypothesis (forward, and reverse with
 *   rot1 ± pi) are summed, as both lead to the same pose.
 * Angular residuals are normalised to (-pi, pi] (wrap-around beyond one turn is neglected, which
 * is exact to many digits while the rotation noise is well below pi). For a hypothesis at the
 * start position itself the Jacobian is singular; |trans^| is then floored at
 * {@link TRANS_EPSILON} so the value stays finite.
 */
export function odometryDensity(
  pose: Pose,
  prevPose: Pose,
  prevOdom: Pose,
  odom: Pose,
  alphas: OdometryAlphas,
): number {
  const d = odometryDelta(prevOdom, odom);
  const v = odometryVariances(d, alphas);
  const h = odometryDelta(prevPose, pose);
  const forward =
    normalDensity(normalizeAngle(d.rot1 - h.rot1), v[0]) *
    normalDensity(d.trans - h.trans, v[1]) *
    normalDensity(normalizeAngle(d.rot2 - h.rot2), v[2]);
  const reverse =
    normalDensity(normalizeAngle(d.rot1 - h.rot1 - PI), v[0]) *
    normalDensity(d.trans + h.trans, v[1]) *
    normalDensity(normalizeAngle(d.rot2 - h.rot2 + PI), v[2]);
  const jacobian = Math.max(Math.abs(h.trans), TRANS_EPSILON);
  return (forward + reverse) / jacobian;
}
