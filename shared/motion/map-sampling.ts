/**
 * Map-aware sampling of the odometry motion model.
 * @module
 */
import type { OdometryAlphas, Pose, Rng } from './types';
import { sampleOdometry } from './odometry-model';

/** What {@link sampleWithMap} needs from a map: p(x | m) at a position. */
export interface MapLikelihood {
  probability(x: number, y: number): number;
}

/** A sampled pose with its importance weight p(x | m). */
export interface WeightedPose {
  pose: Pose;
  weight: number;
}

/**
 * `sample_motion_model_with_map` of Thrun, Burgard & Fox, Probabilistic Robotics (2005), §5.5,
 * Table 5.7: draw from the odometry motion model (Table 5.6) until p(x | m) > 0 and return the
 * pose with weight p(x | m). The printed loop has no bound; here at most `maxTries` draws are
 * made, and if none is consistent with the map the last draw is returned with weight 0 (each
 * try draws three normals, so the rng stream stays deterministic).
 */
export function sampleWithMap(
  prevPose: Pose,
  prevOdom: Pose,
  odom: Pose,
  alphas: OdometryAlphas,
  grid: MapLikelihood,
  rng: Rng,
  maxTries = 100,
): WeightedPose {
  let pose = prevPose;
  for (let i = 0; i < maxTries; i++) {
    pose = sampleOdometry(prevPose, prevOdom, odom, alphas, rng);
    const weight = grid.probability(pose.x, pose.y);
    if (weight > 0) return { pose, weight };
  }
  return { pose, weight: 0 };
}
