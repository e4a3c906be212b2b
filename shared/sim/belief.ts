/**
 * Where the robot's own software believes it is: the drift cloud and the linearised covariance,
 * both driven by the odometry alone (never the truth), seeded with the attempt's public seed.
 * The client draws it while the operator drives; the server rebuilds the same belief from the
 * stored trace to score each call. Both must feed it the same odometry poses in the same order.
 * @module
 */
import {
  confidenceEllipse,
  createRng,
  ParticleCloud,
  propagateOdometryCovariance,
  scaleOdometryAlphas,
  type Ellipse,
  type Matrix3,
  type OdometryAlphas,
  type Pose,
  type Rng,
} from '../motion';
import type { BatchResult, TraceStep } from './types';

/** Particles in the drift cloud, on both sides. */
export const CLOUD_SIZE = 2000;

const diagonal = (position: number, heading: number): number[][] => [
  [position * position, 0, 0],
  [0, position * position, 0],
  [0, 0, heading * heading],
];

export interface BeliefSnapshot {
  /** The odometry pose: the centre of the belief. */
  odometry: Pose;
  /** Position covariance (m²) and heading variance (rad²), linearised. */
  covariance: number[][];
  /** The 95 % confidence ring of the position. */
  ring: Ellipse;
}

export class Belief {
  readonly cloud: ParticleCloud;
  private covariance: number[][];
  private odometry: Pose;
  private readonly rng: Rng;

  constructor(
    start: Pose,
    publicSeed: string,
    private readonly alphas: OdometryAlphas,
    /** Drift multiplier of the floor at a point, as the robot's map knows it (World.driftMultiplierAt). */
    private readonly floor: (x: number, y: number) => number,
    size = CLOUD_SIZE,
  ) {
    this.cloud = new ParticleCloud(size, start);
    this.covariance = diagonal(0, 0);
    this.odometry = { ...start };
    this.rng = createRng(`cloud:${publicSeed}`);
  }

  /**
   * Moves the belief with the robot's next odometry pose, with the alphas scaled for the floor
   * under the previous odometry pose (what the robot's software can know). A step without motion
   * changes nothing and draws no random numbers.
   */
  advance(odometry: Pose): void {
    const prev = this.odometry;
    if (odometry.x === prev.x && odometry.y === prev.y && odometry.theta === prev.theta) return;
    const alphas = scaleOdometryAlphas(this.alphas, this.floor(prev.x, prev.y));
    this.cloud.advance(prev, odometry, alphas, this.rng);
    this.covariance = propagateOdometryCovariance(prev, this.covariance, prev, odometry, alphas);
    this.odometry = { ...odometry };
  }

  /** Restarts the belief around a re-localised pose with the marker's noise (zero: all at the pose). */
  reanchor(odometry: Pose, noise: { position: number; heading: number }): void {
    this.odometry = { ...odometry };
    this.covariance = diagonal(noise.position, noise.heading);
    if (noise.position === 0 && noise.heading === 0) this.cloud.reset(odometry);
    else this.cloud.resetGaussian(odometry, this.covariance as Matrix3, this.rng);
  }

  /** Feeds a stored trace, re-anchoring where it says so (what the server does to score a drive). */
  followTrace(trace: readonly TraceStep[], onStep?: (index: number) => void): void {
    trace.forEach((step, index) => {
      if (step.reanchor) this.reanchor(step.odometry, step.reanchor);
      else this.advance(step.odometry);
      onStep?.(index);
    });
  }

  /**
   * Feeds what the client receives for a batch or a call: a re-anchoring first (a call's
   * re-anchor happens before its pass), then every odometry pose in order. Gives the same belief
   * as {@link followTrace} over the same steps.
   */
  applyResult(result: Pick<BatchResult, 'odometry' | 'events'>, markerNoise: (markerId: string | null) => { position: number; heading: number }): void {
    for (const event of result.events) {
      if (event.type === 'reanchored') this.reanchor(event.odometry, markerNoise(event.markerId));
    }
    for (const pose of result.odometry) this.advance(pose);
  }

  snapshot(p = 0.95): BeliefSnapshot {
    const c = this.covariance;
    return {
      odometry: { ...this.odometry },
      covariance: c.map((row) => [...row]),
      ring: confidenceEllipse(
        [
          [c[0][0], c[0][1]],
          [c[1][0], c[1][1]],
        ],
        p,
      ),
    };
  }
}
