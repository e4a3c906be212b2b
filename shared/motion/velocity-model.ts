/**
 * The velocity motion model (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, §5.3,
 * Tables 5.1 and 5.3), variance form.
 * @module
 */
import type { Pose, Rng, VelocityAlphas } from './types';
import { normalizeAngle } from './angle';
import { moveOnArc, sinc } from './arc';
import { normalDensity } from './gaussian';

/**
 * Variances of the three noise terms for the command (v, w), variance form of
 * Thrun, Burgard & Fox (2005), Table 5.3: [a1·v² + a2·w², a3·v² + a4·w², a5·v² + a6·w²]
 * for v, w and the final rotation rate gamma.
 */
export function velocityVariances(v: number, w: number, a: VelocityAlphas): [number, number, number] {
  const v2 = v * v;
  const w2 = w * w;
  return [a[0] * v2 + a[1] * w2, a[2] * v2 + a[3] * w2, a[4] * v2 + a[5] * w2];
}

/**
 * Draws a pose after applying the command (v, w) for dt seconds:
 * `sample_motion_model_velocity` of Thrun, Burgard & Fox (2005), Table 5.3:
 * v^ = v + sample(a1·v² + a2·w²), w^ = w + sample(a3·v² + a4·w²),
 * gamma^ = sample(a5·v² + a6·w²), then the circular arc of radius v^/w^ followed by the extra
 * rotation gamma^·dt. The arc is evaluated in the sinc form of {@link moveOnArc}, so w → 0
 * gives the straight line and standing still (v = w = 0) returns the same pose. Draws exactly
 * three normals, in the order v, w, gamma. `dt` must be positive.
 */
export function sampleVelocity(
  prevPose: Pose,
  v: number,
  w: number,
  dt: number,
  alphas: VelocityAlphas,
  rng: Rng,
): Pose {
  const s = velocityVariances(v, w, alphas);
  const vHat = v + Math.sqrt(s[0]) * rng.normal();
  const wHat = w + Math.sqrt(s[1]) * rng.normal();
  const gHat = Math.sqrt(s[2]) * rng.normal();
  return moveOnArc(prevPose, vHat * dt, wHat * dt, gHat * dt);
}

/** The controls (v^, w^, gamma^) that carry `prevPose` to `pose` in `dt` (see velocityDensity). */
export interface VelocityControls {
  v: number;
  w: number;
  gamma: number;
}

/**
 * Recovers the controls that explain the move from `prevPose` to `pose` in `dt`: the circular
 * arc tangent to the start heading through the end position, then the extra rotation.
 * Same geometry as `motion_model_velocity` of Thrun, Burgard & Fox (2005), Table 5.1, lines
 * 2–7 (centre of the circle, radius, swept angle), written in the robot frame instead: with
 * (a, b) the end position in the start frame, the half swept angle is h = atan(b / a), the
 * signed chord s = a·cos h + b·sin h, and w^ = 2h/dt, v^ = s / (dt·sinc(h)),
 * gamma^ = (theta' − theta)/dt − w^. This keeps the printed result for forward arcs with a
 * swept angle below pi, and is also finite and correct for straight lines (b → 0, where the
 * printed mu = ... / 0 breaks down), for reverse moves (v^ < 0) and for standing still.
 */
export function velocityControls(pose: Pose, prevPose: Pose, dt: number): VelocityControls {
  const dx = pose.x - prevPose.x;
  const dy = pose.y - prevPose.y;
  const c = Math.cos(prevPose.theta);
  const s = Math.sin(prevPose.theta);
  const a = dx * c + dy * s;
  const b = dy * c - dx * s;
  let half = 0;
  if (a !== 0) half = Math.atan(b / a);
  else if (b !== 0) half = b > 0 ? 0.5 * Math.PI : -0.5 * Math.PI;
  const chord = a * Math.cos(half) + b * Math.sin(half);
  const w = (2 * half) / dt;
  const v = chord / (dt * sinc(half));
  const gamma = normalizeAngle(pose.theta - prevPose.theta - 2 * half) / dt;
  return { v, w, gamma };
}

/**
 * p(x_t | u_t, x_{t-1}) of the velocity model: `motion_model_velocity` of Thrun, Burgard &
 * Fox (2005), Table 5.1: prob(v − v^, a1·v² + a2·w²)·prob(w − w^, a3·v² + a4·w²)·
 * prob(gamma^, a5·v² + a6·w²), with (v^, w^, gamma^) from {@link velocityControls}.
 * As printed, this is the density of the control noise that explains the move (the
 * change-of-variables Jacobian to pose coordinates is not applied); use it as a likelihood
 * weight. Variances are floored (see VARIANCE_FLOOR), so the value is finite for standing still.
 */
export function velocityDensity(
  pose: Pose,
  prevPose: Pose,
  v: number,
  w: number,
  dt: number,
  alphas: VelocityAlphas,
): number {
  const u = velocityControls(pose, prevPose, dt);
  const s = velocityVariances(v, w, alphas);
  return normalDensity(v - u.v, s[0]) * normalDensity(w - u.w, s[1]) * normalDensity(u.gamma, s[2]);
}
