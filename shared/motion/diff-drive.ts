/**
 * Differential-drive kinematics: encoder ticks from commands, and odometry from ticks, with
 * the systematic errors Ed and Eb of the UMBmark method.
 * @module
 */
import type { Pose } from './types';
import { moveOnArc } from './arc';

/** Nominal geometry of a differential-drive robot. */
export interface DiffDriveRobot {
  /** Nominal wheel radius, metres. */
  wheelRadius: number;
  /** Nominal wheelbase (distance between the wheel contact points), metres. */
  wheelbase: number;
  /** Encoder ticks per wheel revolution. */
  ticksPerRevolution: number;
}

/**
 * Systematic odometry errors as defined for UMBmark (J. Borenstein & L. Feng, "Measurement and
 * correction of systematic odometry errors in mobile robots", IEEE Trans. Robotics and
 * Automation 12(6), 1996):
 * - `ed` = D_R / D_L, the ratio of the actual right and left wheel diameters (their mean is
 *   the nominal diameter);
 * - `eb` = b_actual / b_nominal, the ratio of the actual and nominal wheelbase.
 */
export interface SystematicErrors {
  ed: number;
  eb: number;
}

/** No systematic error: Ed = Eb = 1. */
export const NO_SYSTEMATIC_ERRORS: SystematicErrors = Object.freeze({ ed: 1, eb: 1 });

/** Encoder counts of the left and right wheel (a tick count, or an unrounded remainder). */
export interface WheelTicks {
  left: number;
  right: number;
}

/** Ticks for one control period and the sub-tick remainder to carry into the next. */
export interface TickStep {
  ticks: WheelTicks;
  remainder: WheelTicks;
}

/**
 * Actual wheel diameters as multiples of the nominal one for a given Ed, keeping their mean
 * nominal: left = 2/(Ed + 1), right = 2/(1/Ed + 1) (the correction factors c_L, c_R of
 * Borenstein & Feng 1996).
 */
export function wheelDiameterFactors(ed: number): WheelTicks {
  return { left: 2 / (ed + 1), right: 2 / (1 / ed + 1) };
}

/**
 * Encoder ticks produced when the wheel controller executes the command (v, w) for dt seconds
 * with the robot's NOMINAL geometry: each wheel turns by (v ∓ w·b/2)·dt / r radians
 * (differential-drive inverse kinematics, e.g. R. Siegwart, I. R. Nourbakhsh & D. Scaramuzza,
 * Introduction to Autonomous Mobile Robots, 2nd ed., 2011, ch. 3), quantised to whole ticks.
 * The unrounded part is returned as `remainder` and added on the next call, so quantisation
 * never accumulates beyond half a tick.
 */
export function wheelTicksFromCommand(
  v: number,
  w: number,
  dt: number,
  robot: DiffDriveRobot,
  remainder: WheelTicks = { left: 0, right: 0 },
): TickStep {
  const perMetre = robot.ticksPerRevolution / (2 * Math.PI * robot.wheelRadius);
  const halfB = 0.5 * robot.wheelbase * w;
  const left = (v - halfB) * dt * perMetre + remainder.left;
  const right = (v + halfB) * dt * perMetre + remainder.right;
  const l = Math.round(left);
  const r = Math.round(right);
  return { ticks: { left: l, right: r }, remainder: { left: left - l, right: right - r } };
}

/**
 * Integrates one pair of tick counts into a pose. Wheel travel d = 2·pi·r·ticks/N with
 * r scaled by {@link wheelDiameterFactors}(Ed), wheelbase b·Eb; then ds = (d_R + d_L)/2,
 * dtheta = (d_R − d_L)/b, and the exact arc of {@link moveOnArc} (the midpoint formula of
 * J. Borenstein, H. R. Everett & L. Feng, "Where am I?" Sensors and methods for mobile robot
 * positioning, Univ. of Michigan, 1996, taken to its exact constant-curvature form).
 *
 * With the default `errors` (Ed = Eb = 1) this is the robot's odometry; with the hidden
 * systematic errors it is the motion the wheels really produced.
 */
export function integrateWheelTicks(
  pose: Pose,
  ticks: WheelTicks,
  robot: DiffDriveRobot,
  errors: SystematicErrors = NO_SYSTEMATIC_ERRORS,
): Pose {
  const f = errors.ed === 1 ? { left: 1, right: 1 } : wheelDiameterFactors(errors.ed);
  const perTick = (2 * Math.PI * robot.wheelRadius) / robot.ticksPerRevolution;
  const dl = ticks.left * perTick * f.left;
  const dr = ticks.right * perTick * f.right;
  return moveOnArc(pose, 0.5 * (dr + dl), (dr - dl) / (robot.wheelbase * errors.eb));
}
