/**
 * Facts of the trade the simulated drift must show. These are common practice in mobile
 * robotics (no particular source): dead-reckoning error grows with the distance driven, and
 * turning adds heading error that straight driving does not.
 *
 * The drives run on an open floor (no obstacles, zones or markers) so nothing but the drift
 * differs between seeds; the spread is measured over many secret seeds.
 */
import { describe, expect, it } from 'vitest';
import { angleDifference, type Pose } from '../../../shared/motion';
import { DriveSim, type Command } from '../../../shared/sim';
import { openFloorSetup, repeat } from './fixtures';

const SEEDS = Array.from({ length: 200 }, (_v, i) => `spread-${i}`);

/** Sample variance of values. */
function variance(values: number[]): number {
  const mean = values.reduce((s, v) => s + v, 0) / values.length;
  return values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1);
}

/** Trace of the position covariance (var x + var y) of poses. */
const positionSpread = (poses: Pose[]) => variance(poses.map((p) => p.x)) + variance(poses.map((p) => p.y));

/** Variance of the heading about the first pose's heading (angles wrapped). */
function headingSpread(poses: Pose[]): number {
  const ref = poses[0].theta;
  return variance(poses.map((p) => angleDifference(p.theta, ref)));
}

describe('drift facts (common practice)', () => {
  it('the spread of the true position grows with the distance driven', () => {
    // One drive per seed at 1 m/s; the true pose is read after 2 m and after 8 m of odometry.
    const at2: Pose[] = [];
    const at8: Pose[] = [];
    let odometry2: Pose | undefined;
    for (const seed of SEEDS) {
      const sim = new DriveSim(openFloorSetup(seed));
      // The tugger reaches 1 m/s after 1.25 s (0.625 m); 2 m after about 26 steps.
      sim.applyBatch(repeat(26, { v: 1, w: 0 }));
      odometry2 ??= sim.state().odometry;
      at2.push(sim.truePose());
      sim.applyBatch(repeat(60, { v: 1, w: 0 }));
      at8.push(sim.truePose());
    }
    expect(odometry2!.x - 100).toBeCloseTo(2.0, 1);
    const near = positionSpread(at2);
    const far = positionSpread(at8);
    expect(near).toBeGreaterThan(0);
    // Four times the distance: a variance growing linearly with distance would give 4×, and the
    // lateral part grows faster once heading error turns into lateral error (about 6× here); 3×
    // leaves room for the sampling error of 200 seeds (about 10 % on each variance).
    expect(far).toBeGreaterThan(3 * near);
  });

  it('the heading spread after a path with turns is larger than after a straight path of the same length', () => {
    // Both drives: 60 steps of 0.1 s at 0.8 m/s after the same ramp, so the same odometry length.
    const straight: Command[] = repeat(70, { v: 0.8, w: 0 });
    // An S-curve: left and right arcs at 0.6 rad/s, heading back to where it started.
    const turns: Command[] = [...repeat(10, { v: 0.8, w: 0 }), ...repeat(15, { v: 0.8, w: 0.6 }), ...repeat(30, { v: 0.8, w: -0.6 }), ...repeat(15, { v: 0.8, w: 0.6 })];
    expect(turns).toHaveLength(straight.length);
    const end = (commands: Command[]) =>
      SEEDS.slice(0, 150).map((seed) => {
        const sim = new DriveSim(openFloorSetup(seed));
        sim.applyBatch(commands);
        return { truth: sim.truePose(), odometry: sim.state().odometry, distance: sim.state().distanceSinceAnchor };
      });
    const a = end(straight);
    const b = end(turns);
    // Same odometry length within a few centimetres (turn rate ramps shorten chords slightly).
    expect(Math.abs(a[0].distance - b[0].distance)).toBeLessThan(0.05);
    const straightSpread = headingSpread(a.map((e) => e.truth));
    const turnSpread = headingSpread(b.map((e) => e.truth));
    expect(straightSpread).toBeGreaterThan(0);
    // About 37× here: the rotation noise a1·rot² only grows when the robot turns.
    expect(turnSpread).toBeGreaterThan(3 * straightSpread);
  });
});
