/**
 * The drift cloud: a particle set propagated through the odometry motion model.
 * @module
 */
import type { Matrix3, OdometryAlphas, Polygon, Pose, Rng } from './types';
import { normalizeAngle } from './angle';
import { odometryDelta, odometryVariances } from './odometry-model';
import { flattenPolygon, pointInFlatPolygon } from './polygon';

const PI = Math.PI;
const TWO_PI = 2 * Math.PI;

/**
 * A set of pose particles stored as a structure of arrays (Float64Array x, y, theta), the
 * prediction step of the particle filter / Monte Carlo localisation (Thrun, Burgard & Fox,
 * Probabilistic Robotics, 2005, §4.3 and §8.3, Table 8.2 line 4) with the odometry model of
 * Table 5.6.
 *
 * {@link ParticleCloud.advance} is the hot path: the increment and its three noise standard
 * deviations are computed once per step, and each particle then costs three normal draws, one
 * cos, one sin and no allocation. Particle i receives exactly the draws that
 * sampleOdometry(particle i, ...) would take from the same rng in the order 0..n−1, so both
 * give bit-identical results.
 */
export class ParticleCloud {
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly theta: Float64Array;

  /** A cloud of `count` particles, all at `pose` (default: the origin). */
  constructor(count: number, pose: Pose = { x: 0, y: 0, theta: 0 }) {
    if (!(count >= 1) || !Number.isInteger(count)) {
      throw new RangeError('ParticleCloud: count must be a positive integer');
    }
    this.x = new Float64Array(count).fill(pose.x);
    this.y = new Float64Array(count).fill(pose.y);
    this.theta = new Float64Array(count).fill(normalizeAngle(pose.theta));
  }

  /** Number of particles. */
  get size(): number {
    return this.x.length;
  }

  /** Puts every particle at `pose` (e.g. after re-anchoring on a marker with negligible error). */
  reset(pose: Pose): void {
    this.x.fill(pose.x);
    this.y.fill(pose.y);
    this.theta.fill(normalizeAngle(pose.theta));
  }

  /**
   * Draws every particle from the normal N(mean, cov) (cov 3×3 over x, y, theta; Cholesky
   * factor, e.g. G. H. Golub & C. F. Van Loan, Matrix Computations, 4th ed., 2013, §4.2), e.g.
   * to re-anchor the cloud with the marker's own uncertainty. Three normals per particle.
   */
  resetGaussian(mean: Pose, cov: Matrix3, rng: Rng): void {
    const l = cholesky3(cov);
    for (let i = 0; i < this.x.length; i++) {
      const a = rng.normal();
      const b = rng.normal();
      const c = rng.normal();
      this.x[i] = mean.x + l[0] * a;
      this.y[i] = mean.y + l[3] * a + l[4] * b;
      this.theta[i] = normalizeAngle(mean.theta + l[6] * a + l[7] * b + l[8] * c);
    }
  }

  /** Copy of particle `i` as a Pose. */
  poseAt(i: number): Pose {
    return { x: this.x[i], y: this.y[i], theta: this.theta[i] };
  }

  /** An independent copy. */
  clone(): ParticleCloud {
    const c = new ParticleCloud(this.size);
    c.x.set(this.x);
    c.y.set(this.y);
    c.theta.set(this.theta);
    return c;
  }

  /**
   * Moves every particle by a draw from the odometry motion model for the odometry increment
   * from `prevOdom` to `odom` (Thrun, Burgard & Fox 2005, Table 5.6, variance form, with the
   * increment convention of {@link odometryDelta}).
   */
  advance(prevOdom: Pose, odom: Pose, alphas: OdometryAlphas, rng: Rng): void {
    const d = odometryDelta(prevOdom, odom);
    const v = odometryVariances(d, alphas);
    const rot1 = d.rot1;
    const trans = d.trans;
    const rot2 = d.rot2;
    const s1 = Math.sqrt(v[0]);
    const s2 = Math.sqrt(v[1]);
    const s3 = Math.sqrt(v[2]);
    const xs = this.x;
    const ys = this.y;
    const ts = this.theta;
    const n = xs.length;
    for (let i = 0; i < n; i++) {
      const r1 = rot1 - s1 * rng.normal();
      const tr = trans - s2 * rng.normal();
      const r2 = rot2 - s3 * rng.normal();
      const heading = ts[i] + r1;
      xs[i] += tr * Math.cos(heading);
      ys[i] += tr * Math.sin(heading);
      let th = heading + r2;
      if (th <= -PI || th > PI) {
        // normalizeAngle, inlined
        th -= TWO_PI * Math.floor((th + PI) / TWO_PI);
        if (th <= -PI) th += TWO_PI;
        else if (th > PI) th -= TWO_PI;
      }
      ts[i] = th === 0 ? 0 : th;
    }
  }

  /**
   * Mean pose: arithmetic mean of x and y, circular mean of theta,
   * atan2(Σ sin theta_i, Σ cos theta_i) (K. V. Mardia & P. E. Jupp, Directional Statistics,
   * 2000, ch. 2).
   */
  mean(): Pose {
    const n = this.x.length;
    let sx = 0;
    let sy = 0;
    let ss = 0;
    let sc = 0;
    for (let i = 0; i < n; i++) {
      sx += this.x[i];
      sy += this.y[i];
      ss += Math.sin(this.theta[i]);
      sc += Math.cos(this.theta[i]);
    }
    return { x: sx / n, y: sy / n, theta: normalizeAngle(Math.atan2(ss, sc)) };
  }

  /**
   * Covariance (3×3, rows x/y/theta) of the particle set around {@link ParticleCloud.mean},
   * with heading deviations taken as the wrapped difference to the circular mean; normalised by
   * n (the covariance of the particle set itself, as in Thrun, Burgard & Fox 2005, §4.3).
   */
  covariance(): number[][] {
    const m = this.mean();
    const n = this.x.length;
    let xx = 0;
    let xy = 0;
    let xt = 0;
    let yy = 0;
    let yt = 0;
    let tt = 0;
    for (let i = 0; i < n; i++) {
      const dx = this.x[i] - m.x;
      const dy = this.y[i] - m.y;
      const dt = normalizeAngle(this.theta[i] - m.theta);
      xx += dx * dx;
      xy += dx * dy;
      xt += dx * dt;
      yy += dy * dy;
      yt += dy * dt;
      tt += dt * dt;
    }
    return [
      [xx / n, xy / n, xt / n],
      [xy / n, yy / n, yt / n],
      [xt / n, yt / n, tt / n],
    ];
  }

  /**
   * Share of particles whose position lies inside `polygon` (even-odd rule, as
   * {@link pointInPolygon}), i.e. the Monte Carlo estimate of the belief's probability mass in
   * the polygon (Thrun, Burgard & Fox 2005, §4.3). A bounding-box test skips most edges.
   */
  shareInside(polygon: Polygon): number {
    if (polygon.length < 3) return 0;
    const flat = flattenPolygon(polygon);
    let minX = Infinity;
    let minY = Infinity;
    let maxX = -Infinity;
    let maxY = -Infinity;
    for (let i = 0; i < flat.length; i += 2) {
      minX = Math.min(minX, flat[i]);
      maxX = Math.max(maxX, flat[i]);
      minY = Math.min(minY, flat[i + 1]);
      maxY = Math.max(maxY, flat[i + 1]);
    }
    const n = this.x.length;
    let inside = 0;
    for (let i = 0; i < n; i++) {
      const px = this.x[i];
      const py = this.y[i];
      if (px < minX || px > maxX || py < minY || py > maxY) continue;
      if (pointInFlatPolygon(px, py, flat)) inside++;
    }
    return inside / n;
  }
}

/** Lower Cholesky factor of a symmetric positive semi-definite 3×3, flat row-major. */
function cholesky3(c: Matrix3): Float64Array {
  const l = new Float64Array(9);
  const l00 = Math.sqrt(Math.max(0, c[0][0]));
  const l10 = l00 > 0 ? c[1][0] / l00 : 0;
  const l20 = l00 > 0 ? c[2][0] / l00 : 0;
  const l11 = Math.sqrt(Math.max(0, c[1][1] - l10 * l10));
  const l21 = l11 > 0 ? (c[2][1] - l20 * l10) / l11 : 0;
  const l22 = Math.sqrt(Math.max(0, c[2][2] - l20 * l20 - l21 * l21));
  l[0] = l00;
  l[3] = l10;
  l[4] = l11;
  l[6] = l20;
  l[7] = l21;
  l[8] = l22;
  return l;
}
