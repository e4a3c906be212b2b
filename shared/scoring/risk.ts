/**
 * The risk of a pass: the share of the drift cloud whose footprint, carried along the pass with
 * the pass's own added noise, touches an obstacle. Each particle is a hypothesis of where the
 * robot truly is; it moves with the nominal pass's odometry increments through the odometry
 * motion model (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, Table 5.6), the same model
 * that spread the cloud.
 * @module
 */
import { sampleOdometry, scaleOdometryAlphas, type OdometryAlphas, type ParticleCloud, type Pose, type Rng } from '../motion';
import type { World } from '../sim';

export interface PassRiskInput {
  cloud: ParticleCloud;
  /** The odometry poses of the nominal pass; the first is the odometry at the call. */
  pass: readonly Pose[];
  alphas: OdometryAlphas;
  /** Extra factor on the alphas for the pass (less for a creep). */
  slip: number;
  world: World;
  rng: Rng;
}

export function passRisk({ cloud, pass, alphas, slip, world, rng }: PassRiskInput): number {
  const n = cloud.size;
  let touching = 0;
  const scaled = pass.map((pose) => scaleOdometryAlphas(alphas, world.driftMultiplierAt(pose.x, pose.y) * slip));
  for (let i = 0; i < n; i++) {
    let pose = cloud.poseAt(i);
    let hit = world.contactAt(pose) !== null;
    for (let k = 1; k < pass.length && !hit; k++) {
      pose = sampleOdometry(pose, pass[k - 1], pass[k], scaled[k - 1], rng);
      hit = world.contactAt(pose) !== null;
    }
    if (hit) touching += 1;
  }
  return touching / n;
}
