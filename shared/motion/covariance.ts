/**
 * Linearised propagation of a pose covariance through the odometry motion model (the EKF
 * prediction step).
 * @module
 */
import type { Matrix3, OdometryAlphas, OdometryDelta, Pose } from './types';
import { odometryDelta, odometryVariances } from './odometry-model';

/** Jacobians of the odometry motion g(x, u) = x ⊕ (rot1, trans, rot2), each 3×3, rows. */
export interface OdometryJacobians {
  /** G = ∂g/∂(x, y, theta). */
  G: number[][];
  /** V = ∂g/∂(rot1, trans, rot2). */
  V: number[][];
}

/**
 * The Jacobians of x' = x + trans·cos(theta + rot1), y' = y + trans·sin(theta + rot1),
 * theta' = theta + rot1 + rot2 at `pose` (Thrun, Burgard & Fox, Probabilistic Robotics, 2005,
 * §7.4, EKF localization, prediction step; here for the odometry model of Table 5.6):
 *
 * G = [[1, 0, −t·sin φ], [0, 1, t·cos φ], [0, 0, 1]],
 * V = [[−t·sin φ, cos φ, 0], [t·cos φ, sin φ, 0], [1, 0, 1]], φ = theta + rot1, t = trans.
 */
export function odometryJacobians(pose: Pose, d: OdometryDelta): OdometryJacobians {
  const phi = pose.theta + d.rot1;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const j1 = -d.trans * s;
  const j2 = d.trans * c;
  return {
    G: [
      [1, 0, j1],
      [0, 1, j2],
      [0, 0, 1],
    ],
    V: [
      [j1, c, 0],
      [j2, s, 0],
      [1, 0, 1],
    ],
  };
}

/**
 * One EKF prediction step for the odometry model: Σ' = G·Σ·Gᵀ + V·M·Vᵀ with G and V from
 * {@link odometryJacobians} at the mean `pose` before the step and
 * M = diag(a1·rot1² + a2·trans², a3·trans² + a4·(rot1² + rot2²), a1·rot2² + a2·trans²) from
 * the measured increment (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, §7.4, the EKF
 * prediction Σ̄ = G·Σ·Gᵀ + V·M·Vᵀ, with the noise of Table 5.6). Returns a new 3×3 covariance (rows, x/y/theta); the
 * products are written out, so one step costs a few dozen flops and one small allocation.
 */
export function propagateOdometryCovariance(
  pose: Pose,
  cov: Matrix3,
  prevOdom: Pose,
  odom: Pose,
  alphas: OdometryAlphas,
): number[][] {
  const d = odometryDelta(prevOdom, odom);
  const m = odometryVariances(d, alphas);
  const phi = pose.theta + d.rot1;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const j1 = -d.trans * s;
  const j2 = d.trans * c;
  const sxx = cov[0][0];
  const sxy = cov[0][1];
  const sxt = cov[0][2];
  const syy = cov[1][1];
  const syt = cov[1][2];
  const stt = cov[2][2];
  // G Σ Gᵀ, G = I + [j1, j2, 0]ᵀ e3ᵀ
  let xx = sxx + 2 * j1 * sxt + j1 * j1 * stt;
  let xy = sxy + j1 * syt + j2 * sxt + j1 * j2 * stt;
  let xt = sxt + j1 * stt;
  let yy = syy + 2 * j2 * syt + j2 * j2 * stt;
  let yt = syt + j2 * stt;
  let tt = stt;
  // + V M Vᵀ
  xx += j1 * j1 * m[0] + c * c * m[1];
  xy += j1 * j2 * m[0] + c * s * m[1];
  xt += j1 * m[0];
  yy += j2 * j2 * m[0] + s * s * m[1];
  yt += j2 * m[0];
  tt += m[0] + m[2];
  return [
    [xx, xy, xt],
    [xy, yy, yt],
    [xt, yt, tt],
  ];
}
