/**
 * Motion along a circular arc, shared by the velocity model and differential-drive odometry.
 * @module
 */
import type { Pose } from './types';
import { normalizeAngle } from './angle';

/**
 * sin(u)/u with the limit 1 at u = 0 (Taylor series for |u| < 1e-4, error below 1e-20).
 * Used to write the arc formulas in a form that stays exact as the turn rate goes to zero.
 */
export function sinc(u: number): number {
  if (Math.abs(u) < 1e-4) {
    const u2 = u * u;
    return 1 - u2 / 6 + (u2 * u2) / 120;
  }
  return Math.sin(u) / u;
}

/**
 * Moves a pose along a circular arc of (signed) length `distance` over which the heading turns
 * by `turn`, then adds `extraTurn` to the heading:
 *
 * x' = x + distance·sinc(turn/2)·cos(theta + turn/2), y' likewise with sin,
 * theta' = theta + turn + extraTurn.
 *
 * This is the exact circular-arc motion of Thrun, Burgard & Fox, Probabilistic Robotics (2005),
 * §5.3, Table 5.3 (x' = x − v/w·sin theta + v/w·sin(theta + w·dt), ...), rewritten with
 * sin(a + 2h) − sin(a) = 2·cos(a + h)·sin(h) so that it stays finite and exact for
 * straight-line motion (turn → 0), where it becomes x' = x + distance·cos(theta).
 */
export function moveOnArc(pose: Pose, distance: number, turn: number, extraTurn = 0): Pose {
  const half = 0.5 * turn;
  const chord = distance * sinc(half);
  const heading = pose.theta + half;
  return {
    x: pose.x + chord * Math.cos(heading),
    y: pose.y + chord * Math.sin(heading),
    theta: normalizeAngle(pose.theta + turn + extraTurn),
  };
}
