/**
 * Call points and the four calls. long-aisle-run: the aisle tugger drives east down aisle 1; the
 * call point "gap-pallet-stacks" (trigger x 35.5–36.5) is within range of marker-east-1 (at x
 * 47.65, range 12.5 m). charging-bay-pass: no marker can be read at the pass.
 */
import { describe, expect, it } from 'vitest';
import type { Call } from '../../../shared/schemas';
import { DriveSim, PASS_SPEED, type BatchResult, type DriveEvent } from '../../../shared/sim';
import { driveErrorCode, driveSetup, driveToCall, repeat } from './fixtures';

const GAP = 'gap-pallet-stacks';
const PIN = { x: 36, y: 7.6, radius: 0.5 };

function atGap(seed: string) {
  const sim = new DriveSim(driveSetup('long-aisle-run', seed));
  const arrival = driveToCall(sim);
  return { sim, arrival };
}

const reanchored = (r: BatchResult) => r.events.find((e): e is Extract<DriveEvent, { type: 'reanchored' }> => e.type === 'reanchored');

describe('reaching a call point', () => {
  it('stops the drive for a call, with a call_point event, and drops the rest of the batch', () => {
    const sim = new DriveSim(driveSetup('long-aisle-run', 'cp-1'));
    const r = sim.applyBatch(repeat(600, { v: 1, w: 0 }));
    expect(r.state.status).toBe('awaiting_call');
    expect(r.state.pendingCallPointId).toBe(GAP);
    expect(r.events).toContainEqual({ type: 'call_point', seq: r.seq, callPointId: GAP, askEstimate: true });
    // Only the commands up to the trigger were applied (about 32 m at ≤ 1 m/s: ~330 of 600).
    expect(r.odometry.length).toBeLessThan(400);
    expect(r.odometry.length).toBeGreaterThan(300);
    expect(r.seq).toBe(r.odometry.length);
    expect(r.state.seq).toBe(r.seq);
    expect(sim.trace).toHaveLength(r.odometry.length);
    // The robot stopped inside the trigger area (odometry), the first pose there.
    const last = r.state.odometry;
    expect(last.x).toBeGreaterThanOrEqual(35.5);
    expect(last.x).toBeLessThan(36.5);
    expect(r.odometry[r.odometry.length - 2].x).toBeLessThan(35.5);
    expect(r.state.v).toBe(0);
    expect(r.state.markersInView).toEqual(['marker-east-1']);
  });

  it('while a call is due, batches throw awaiting_call and leave the drive unchanged', () => {
    const { sim } = atGap('cp-2');
    const before = sim.state();
    const truth = sim.truePose();
    expect(driveErrorCode(() => sim.applyBatch([{ v: 1, w: 0 }]))).toBe('awaiting_call');
    expect(sim.state()).toEqual(before);
    expect(sim.truePose()).toEqual(truth);
  });

  it('answering needs the estimate pin where askEstimate is true, and the right call point', () => {
    const { sim } = atGap('cp-3');
    const before = sim.state();
    expect(driveErrorCode(() => sim.answerCall(GAP, 'proceed', null))).toBe('estimate_required');
    expect(driveErrorCode(() => sim.answerCall('charger-pass', 'proceed', PIN))).toBe('wrong_call_point');
    expect(sim.state()).toEqual(before);
    expect(sim.calls).toEqual([]);
    const r = sim.answerCall(GAP, 'proceed', PIN);
    expect(r.state.status).toBe('driving');
    expect(r.state.answeredCallPoints).toEqual([GAP]);
    expect(sim.calls[0]).toMatchObject({ callPointId: GAP, call: 'proceed', estimate: PIN });
    // Nothing is due any more.
    expect(driveErrorCode(() => sim.answerCall(GAP, 'proceed', PIN))).toBe('not_awaiting_call');
  });

  it('no call is due at the start', () => {
    const sim = new DriveSim(driveSetup('long-aisle-run', 'cp-4'));
    expect(driveErrorCode(() => sim.answerCall(GAP, 'halt', PIN))).toBe('not_awaiting_call');
  });
});

describe('the calls', () => {
  it('proceed drives the pass path at the pass speed and resumes driving past the gap', () => {
    const { sim, arrival } = atGap('call-proceed');
    const r = sim.answerCall(GAP, 'proceed', PIN);
    const dt = sim.setup.robot.controlPeriod;
    expect(r.events.at(-1)).toEqual({ type: 'pass_done', seq: arrival.seq, callPointId: GAP, call: 'proceed' });
    // The pass follows (36.5, 7.6) → (40.5, 7.6) on the odometry.
    expect(r.state.odometry.x).toBeGreaterThan(40.5 - 0.15);
    expect(Math.abs(r.state.odometry.y - 7.6)).toBeLessThan(0.15);
    expect(r.state.time).toBeCloseTo(arrival.state.time + r.odometry.length * dt, 9);
    // No step faster than PASS_SPEED (0.6 m/s), so the pass takes at least its length over that speed
    // (the follower's arrival tolerance is 0.12 m).
    const poses = [arrival.state.odometry, ...r.odometry];
    for (let i = 1; i < poses.length; i++) {
      expect(Math.hypot(poses[i].x - poses[i - 1].x, poses[i].y - poses[i - 1].y)).toBeLessThanOrEqual(PASS_SPEED * dt + 1e-3);
    }
    expect(r.odometry.length * dt).toBeGreaterThanOrEqual((40.5 - 0.12 - arrival.state.odometry.x) / PASS_SPEED);
    expect(r.state.seq).toBe(arrival.seq); // pass steps are not operator commands
    expect(sim.trace.slice(-r.odometry.length).every((s) => s.source === 'pass')).toBe(true);
  });

  it('creep takes longer than proceed on the same trial and seed', () => {
    const time = (call: Call) => {
      const { sim } = atGap('call-creep');
      return sim.answerCall(GAP, call, PIN).state.time;
    };
    const proceed = time('proceed');
    const creep = time('creep');
    // creepSpeed 0.3 m/s against PASS_SPEED 0.6 m/s over a 4 m pass: several seconds more.
    expect(creep).toBeGreaterThan(proceed + 3);
  });

  it('reanchor with a marker in view brings the odometry to the truth within the marker noise and adds reanchorSeconds', () => {
    const seeds = Array.from({ length: 12 }, (_v, i) => `reanchor-${i}`);
    const errors: number[] = [];
    for (const seed of seeds) {
      const { sim, arrival } = atGap(seed);
      const marker = sim.world.marker('marker-east-1')!;
      const truth = sim.truePose();
      const r = sim.answerCall(GAP, 'reanchor', PIN);
      const event = reanchored(r)!;
      expect(event.markerId).toBe('marker-east-1');
      const { position, heading } = marker.noise; // 0.03 m, 0.02 rad
      // Within 4 standard deviations on each axis.
      expect(Math.abs(event.odometry.x - truth.x)).toBeLessThan(4 * position);
      expect(Math.abs(event.odometry.y - truth.y)).toBeLessThan(4 * position);
      expect(Math.abs(event.odometry.theta - truth.theta)).toBeLessThan(4 * heading);
      errors.push(event.odometry.x - truth.x, event.odometry.y - truth.y);
      const dt = sim.setup.robot.controlPeriod;
      expect(r.state.time).toBeCloseTo(arrival.state.time + sim.setup.trial.rubric.reanchorSeconds + r.odometry.length * dt, 9);
      expect(sim.calls[0].truth).toEqual(truth);
      expect(sim.trace[sim.calls[0].traceIndex]).toMatchObject({ reanchor: marker.noise, truth });
    }
    // The errors are the marker's noise, not zero: their RMS is near 0.03 m (24 draws).
    const rms = Math.sqrt(errors.reduce((s, e) => s + e * e, 0) / errors.length);
    expect(rms).toBeGreaterThan(0.5 * 0.03);
    expect(rms).toBeLessThan(1.6 * 0.03);
  });

  it('reanchor with no marker in view throws no_marker_in_view and leaves the drive unchanged', () => {
    const sim = new DriveSim(driveSetup('charging-bay-pass', 'no-marker'));
    const arrival = driveToCall(sim);
    expect(arrival.state.pendingCallPointId).toBe('charger-pass');
    expect(arrival.state.markersInView).toEqual([]);
    const before = sim.state();
    const truth = sim.truePose();
    const traceLength = sim.trace.length;
    const error = (() => {
      try {
        sim.answerCall('charger-pass', 'reanchor', { x: 2.1, y: 10, radius: 0.5 });
      } catch (e) {
        return e as Error & { code?: string };
      }
    })();
    expect(error?.code).toBe('no_marker_in_view');
    expect(error?.message).toMatch(/no anchor marker/i);
    expect(sim.state()).toEqual(before);
    expect(sim.truePose()).toEqual(truth);
    expect(sim.trace).toHaveLength(traceLength);
    expect(sim.calls).toEqual([]);
    // Another call is still possible.
    expect(sim.answerCall('charger-pass', 'halt', { x: 2.1, y: 10, radius: 0.5 }).state.status).toBe('driving');
  });

  it('halt adds haltSeconds and restarts with the odometry equal to the truth', () => {
    const { sim, arrival } = atGap('call-halt');
    const truth = sim.truePose();
    expect(arrival.state.odometry).not.toEqual(truth);
    const r = sim.answerCall(GAP, 'halt', PIN);
    const event = reanchored(r)!;
    expect(event.markerId).toBeNull();
    expect(event.odometry).toEqual(truth);
    const dt = sim.setup.robot.controlPeriod;
    expect(r.state.time).toBeCloseTo(arrival.state.time + sim.setup.trial.rubric.haltSeconds + r.odometry.length * dt, 9);
    expect(r.state.distanceSinceAnchor).toBeGreaterThan(3); // counted from the halt, over the pass
    // Walked through by a person: odometry and truth stay together over the pass.
    expect(r.state.odometry).toEqual(sim.truePose());
    expect(r.state.contacts).toBe(0);
  });
});

describe('time limit', () => {
  it('holding still until the time limit ends the drive with time_up; further batches throw time_up', () => {
    const sim = new DriveSim(driveSetup('long-aisle-run', 'time'));
    const { timeLimit } = sim.setup.trial; // 240 s
    const steps = Math.round(timeLimit / sim.setup.robot.controlPeriod);
    const r = sim.applyBatch(repeat(steps + 100, { v: 0, w: 0 }));
    expect(r.odometry).toHaveLength(steps);
    expect(r.state.status).toBe('time_up');
    expect(r.state.time).toBeCloseTo(timeLimit, 6);
    expect(r.events.filter((e) => e.type === 'time_up')).toHaveLength(1);
    expect(r.state.odometry).toEqual(sim.setup.trial.start);
    expect(driveErrorCode(() => sim.applyBatch([{ v: 0, w: 0 }]))).toBe('time_up');
    // The drive can still be submitted.
    expect(sim.finish('submitted').status).toBe('submitted');
    expect(driveErrorCode(() => sim.applyBatch([{ v: 0, w: 0 }]))).toBe('not_driving');
  });

  it('the time_up event carries the seq of the step that reached the limit, like the other events', () => {
    const sim = new DriveSim(driveSetup('long-aisle-run', 'time-3'));
    const steps = Math.round(sim.setup.trial.timeLimit / sim.setup.robot.controlPeriod);
    const r = sim.applyBatch(repeat(steps + 1, { v: 0, w: 0 }));
    expect(r.seq).toBe(steps);
    expect(r.events).toContainEqual({ type: 'time_up', seq: steps });
  });

  it('one step short of the limit the drive is still on', () => {
    const sim = new DriveSim(driveSetup('long-aisle-run', 'time-2'));
    const steps = Math.round(sim.setup.trial.timeLimit / sim.setup.robot.controlPeriod);
    const r = sim.applyBatch(repeat(steps - 1, { v: 0, w: 0 }));
    expect(r.state.status).toBe('driving');
    expect(r.events.filter((e) => e.type === 'time_up')).toEqual([]);
  });
});
