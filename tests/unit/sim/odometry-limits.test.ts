/**
 * What the robot's software sees: odometry integrated from quantised encoder ticks with the
 * NOMINAL geometry; and the commands clamped to the robot's limits.
 */
import { describe, expect, it } from 'vitest';
import type { Robot } from '../../../shared/schemas';
import { DriveSim } from '../../../shared/sim';
import { driveSetup, openFloorSetup, repeat, tickLength } from './fixtures';

/** The aisle tugger with an acceleration limit high enough to reach 1 m/s in one 0.1 s step. */
const quick = (r: Robot): Robot => ({ ...r, limits: { ...r.limits, maxAcceleration: 10 } });

describe('odometry from encoder ticks', () => {
  it('straight at 1 m/s for 5 s: odometry x advances 5 m within half an encoder tick, y and heading unchanged', () => {
    const setup = openFloorSetup('odo-1', 'aisle-tugger', quick);
    const sim = new DriveSim(setup);
    const tick = tickLength(setup.robot); // 2·pi·0.1/1024 ≈ 0.61 mm
    const r = sim.applyBatch(repeat(50, { v: 1, w: 0 }));
    expect(r.state.v).toBe(1);
    // Both wheels get the same ticks: the nominal odometry drives exactly straight.
    expect(Math.abs(r.state.odometry.x - 100 - 5)).toBeLessThanOrEqual(0.5 * tick);
    expect(r.state.odometry.y).toBeCloseTo(100, 12);
    expect(r.state.odometry.theta).toBeCloseTo(0, 12);
    // Each step is within half a tick of the commanded 0.1 m too (the remainder is carried).
    r.odometry.forEach((p, k) => expect(Math.abs(p.x - 100 - 0.1 * (k + 1))).toBeLessThanOrEqual(0.5 * tick + 1e-12));
    // The truth differs (noise and the hidden Ed, Eb).
    const truth = sim.truePose();
    expect(Math.hypot(truth.x - r.state.odometry.x, truth.y - r.state.odometry.y)).toBeGreaterThan(10 * tick);
  });

  it('with zero noise the truth differs by the hidden Ed alone: the arc computed by hand', () => {
    // Alphas zero: the truth is the wheels' motion with the hidden errors, no noise.
    const setup = openFloorSetup('odo-2', 'aisle-tugger', (r) => ({ ...quick(r), assumedProfile: { ...r.assumedProfile, alphas: [0, 0, 0, 0] } }));
    const { ed, eb } = setup.robot.hiddenErrors; // 1.0003, 1.008
    const sim = new DriveSim(setup);
    const odometry = sim.applyBatch(repeat(50, { v: 1, w: 0 })).state.odometry;
    // By hand: nominal travel D per wheel (D = odometry distance); the real wheels travel
    // D·2/(Ed+1) (left) and D·2·Ed/(Ed+1) (right) (Borenstein & Feng 1996), so the robot turns
    // by (dR − dL)/(b·Eb) = 2·D·(Ed − 1)/((Ed + 1)·b·Eb) ≈ 2.976e-3 rad for D = 5 m.
    const d = odometry.x - 100;
    const turn = (2 * d * (ed - 1)) / ((ed + 1) * setup.robot.wheelbase * eb);
    expect(turn).toBeCloseTo(2.976e-3, 5);
    const truth = sim.truePose();
    expect(truth.theta).toBeCloseTo(turn, 9);
    // On a constant-curvature arc the lateral offset is about D·turn/2 (to the left, Ed > 1).
    expect(truth.y - 100).toBeCloseTo((d * turn) / 2, 6);
    expect(truth.x - 100).toBeCloseTo(d, 4);
  });

  it('a turn on the spot moves the wheels in opposite directions: heading changes, position does not', () => {
    const setup = openFloorSetup('odo-3');
    const sim = new DriveSim(setup);
    const s = sim.applyBatch(repeat(30, { v: 0, w: 0.5 })).state;
    expect(s.odometry.x).toBeCloseTo(100, 9);
    expect(s.odometry.y).toBeCloseTo(100, 9);
    // w ramps 0.2, 0.4, then 0.5 rad/s: 0.02 + 0.04 + 28·0.05 = 1.46 rad (hand sum), within a
    // tick on each wheel (2·tick/b rad).
    expect(Math.abs(s.odometry.theta - 1.46)).toBeLessThanOrEqual((2 * tickLength(setup.robot)) / setup.robot.wheelbase);
  });
});

describe('commands are clamped to the robot limits', () => {
  const setup = () => driveSetup('long-aisle-run', 'clamp');

  it('v = 100: speed rises by maxAcceleration·dt per step and stops at maxSpeed', () => {
    const s = setup();
    const { maxAcceleration, maxSpeed } = s.robot.limits; // 0.8 m/s², 1.2 m/s
    const dt = s.robot.controlPeriod;
    const sim = new DriveSim(s);
    const speeds: number[] = [];
    for (let k = 1; k <= 20; k++) speeds.push(sim.applyBatch([{ v: 100, w: 0 }]).state.v);
    speeds.forEach((v, i) => expect(v).toBeCloseTo(Math.min(maxSpeed, (i + 1) * maxAcceleration * dt), 9));
    expect(speeds[14]).toBe(maxSpeed);
    expect(Math.max(...speeds)).toBe(maxSpeed);
    // Slowing down is limited the same way.
    expect(sim.applyBatch([{ v: 0, w: 0 }]).state.v).toBeCloseTo(maxSpeed - maxAcceleration * dt, 9);
  });

  it('v = −100: reverse speed is capped at maxReverseSpeed', () => {
    const s = setup();
    const { maxAcceleration, maxReverseSpeed } = s.robot.limits; // 0.8 m/s², 0.3 m/s
    const dt = s.robot.controlPeriod;
    const sim = new DriveSim(s);
    const speeds = Array.from({ length: 6 }, () => sim.applyBatch([{ v: -100, w: 0 }]).state.v);
    speeds.forEach((v, i) => expect(v).toBeCloseTo(-Math.min(maxReverseSpeed, (i + 1) * maxAcceleration * dt), 9));
    expect(sim.state().odometry.x).toBeLessThan(4);
  });

  it('w = ±100: turn rate rises by maxTurnAcceleration·dt per step and stops at maxTurnRate', () => {
    const s = setup();
    const { maxTurnAcceleration, maxTurnRate } = s.robot.limits; // 2 rad/s², 1 rad/s
    const dt = s.robot.controlPeriod;
    const sim = new DriveSim(s);
    const rates = Array.from({ length: 8 }, () => sim.applyBatch([{ v: 0, w: 100 }]).state.w);
    rates.forEach((w, i) => expect(w).toBeCloseTo(Math.min(maxTurnRate, (i + 1) * maxTurnAcceleration * dt), 9));
    // From +1 to −100: down by maxTurnAcceleration·dt per step, to −maxTurnRate.
    const back = Array.from({ length: 12 }, () => sim.applyBatch([{ v: 0, w: -100 }]).state.w);
    back.forEach((w, i) => expect(w).toBeCloseTo(Math.max(-maxTurnRate, maxTurnRate - (i + 1) * maxTurnAcceleration * dt), 9));
  });

  it('the odometry moves by the clamped speed, not the commanded one', () => {
    const s = setup();
    const sim = new DriveSim(s);
    sim.applyBatch(repeat(20, { v: 100, w: 0 }));
    // Hand sum of the ramp: 0.08·(1 + … + 14)·0.1 + 6·1.2·0.1 = 0.84 + 0.72 = 1.56 m.
    expect(Math.abs(sim.state().odometry.x - 4 - 1.56)).toBeLessThanOrEqual(0.5 * tickLength(s.robot) + 1e-9);
  });
});
