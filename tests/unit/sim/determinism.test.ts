/**
 * A drive is a pure function of (setup, secret seed, commands, calls): the server rebuilds a drive
 * by replaying its log, so the same inputs must give the same trace, bit for bit.
 */
import { describe, expect, it } from 'vitest';
import type { Command } from '../../../shared/sim';
import { DriveSim } from '../../../shared/sim';
import { driveSetup, repeat } from './fixtures';

/** Straight, then a left arc, then a right arc, on long-aisle-run (stays in the west cross aisle). */
function commands(): Command[] {
  return [...repeat(20, { v: 0.8, w: 0 }), ...repeat(15, { v: 0.5, w: 0.3 }), ...repeat(15, { v: 0.5, w: -0.3 }), ...repeat(10, { v: 0, w: 0 })];
}

function run(seed: string, batchSize: number) {
  const sim = new DriveSim(driveSetup('long-aisle-run', seed));
  const all = commands();
  const odometry = [];
  for (let i = 0; i < all.length; i += batchSize) odometry.push(...sim.applyBatch(all.slice(i, i + batchSize)).odometry);
  return { sim, odometry, trace: sim.trace, state: sim.state() };
}

describe('determinism', () => {
  it('the same setup, seed and commands give the identical trace (odometry and truth) twice', () => {
    const a = run('seed-one', 10);
    const b = run('seed-one', 10);
    expect(a.trace.length).toBe(60);
    expect(b.trace).toEqual(a.trace);
    expect(b.odometry).toEqual(a.odometry);
    expect(b.state).toEqual(a.state);
    expect(b.sim.truePose()).toEqual(a.sim.truePose());
    // The drive moved and the truth left the odometry (otherwise equality would prove nothing).
    expect(a.state.odometry.x - 4).toBeGreaterThan(1);
    expect(a.trace.some((s) => s.truth.x !== s.odometry.x)).toBe(true);
  });

  it('how the commands are cut into batches does not change the drive', () => {
    const a = run('seed-one', 10);
    const b = run('seed-one', 7);
    const c = run('seed-one', 60);
    expect(b.trace).toEqual(a.trace);
    expect(c.trace).toEqual(a.trace);
  });

  it('a different secret seed gives a different truth but the same odometry', () => {
    const a = run('seed-one', 10);
    const b = run('seed-two', 10);
    expect(b.odometry).toEqual(a.odometry);
    expect(b.trace.map((s) => s.odometry)).toEqual(a.trace.map((s) => s.odometry));
    expect(b.state).toEqual(a.state);
    const endA = a.sim.truePose();
    const endB = b.sim.truePose();
    expect(Math.hypot(endA.x - endB.x, endA.y - endB.y)).toBeGreaterThan(1e-4);
    // Differs all along, not just at the end.
    const moving = a.trace.filter((_s, i) => i > 0);
    expect(moving.every((s, i) => s.truth.x !== b.trace[i + 1].truth.x)).toBe(true);
  });
});
