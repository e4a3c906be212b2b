/**
 * A pure-pursuit path follower (R. C. Coulter, "Implementation of the Pure Pursuit Path Tracking
 * Algorithm", CMU-RI-TR-92-01, 1992): steer towards the point one lookahead distance further
 * along the path, w = 2·v·sin(alpha)/L. Turns on the spot when the target is behind the robot.
 * Drives the robot through a gap after a call, and the scripted operator of the tests.
 * @module
 */
import { angleDifference, type Point2, type Pose } from '../motion';

export interface FollowCommand {
  v: number;
  w: number;
  /** True once the end of the path is within the arrival tolerance. */
  arrived: boolean;
}

export interface FollowOptions {
  speed: number;
  maxTurnRate: number;
  lookahead?: number;
  arrival?: number;
}

export class PathFollower {
  private progress = 0; // index of the segment the robot was last nearest to
  private started = false;
  readonly lookahead: number;
  readonly arrival: number;

  constructor(
    readonly path: readonly Point2[],
    readonly options: FollowOptions,
  ) {
    this.lookahead = options.lookahead ?? 0.8;
    this.arrival = options.arrival ?? 0.12;
  }

  /** Nearest point on the path at or after the current progress, and the segment it lies on. */
  private nearest(pose: Pose): { segment: number; point: Point2 } {
    let best = { segment: this.progress, point: this.path[this.progress], d: Infinity };
    // Looks a few segments ahead only, so a path that doubles back is followed in order; the first
    // time it looks at the whole path, so a robot can join it part way along.
    const last = this.started ? Math.min(this.path.length - 1, this.progress + 3) : this.path.length - 1;
    this.started = true;
    for (let i = this.progress; i < last; i++) {
      const a = this.path[i];
      const b = this.path[i + 1];
      const abx = b.x - a.x;
      const aby = b.y - a.y;
      const len2 = abx * abx + aby * aby || 1e-12;
      const t = Math.max(0, Math.min(1, ((pose.x - a.x) * abx + (pose.y - a.y) * aby) / len2));
      const p = { x: a.x + t * abx, y: a.y + t * aby };
      const d = Math.hypot(pose.x - p.x, pose.y - p.y);
      if (d < best.d - 1e-9) best = { segment: i, point: p, d };
    }
    return best;
  }

  /** The point `distance` further along the path from `from` on `segment`. */
  private ahead(segment: number, from: Point2, distance: number): Point2 {
    let left = distance;
    let start = from;
    for (let i = segment; i < this.path.length - 1; i++) {
      const end = this.path[i + 1];
      const len = Math.hypot(end.x - start.x, end.y - start.y);
      if (len >= left) return { x: start.x + ((end.x - start.x) * left) / len, y: start.y + ((end.y - start.y) * left) / len };
      left -= len;
      start = end;
    }
    return this.path[this.path.length - 1];
  }

  /** The command for the robot at `pose`. */
  command(pose: Pose): FollowCommand {
    const end = this.path[this.path.length - 1];
    const toEnd = Math.hypot(end.x - pose.x, end.y - pose.y);
    const near = this.nearest(pose);
    this.progress = near.segment;
    if (toEnd <= this.arrival && this.progress >= this.path.length - 2) return { v: 0, w: 0, arrived: true };
    const target = this.ahead(near.segment, near.point, this.lookahead);
    const distance = Math.max(Math.hypot(target.x - pose.x, target.y - pose.y), 1e-6);
    const alpha = angleDifference(Math.atan2(target.y - pose.y, target.x - pose.x), pose.theta);
    const { maxTurnRate } = this.options;
    if (Math.abs(alpha) > Math.PI / 2) return { v: 0, w: Math.sign(alpha) * maxTurnRate, arrived: false };
    // Slows down near the end of the path and when the turn needed is sharper than the robot can make.
    const speed = Math.min(this.options.speed, Math.max(0.1, toEnd));
    let v = speed;
    let w = (2 * v * Math.sin(alpha)) / distance;
    if (Math.abs(w) > maxTurnRate) {
      v *= maxTurnRate / Math.abs(w);
      w = Math.sign(w) * maxTurnRate;
    }
    return { v, w, arrived: false };
  }
}
