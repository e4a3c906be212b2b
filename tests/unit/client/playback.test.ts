import { describe, expect, it } from 'vitest';
import { Belief, type BatchResult, type DriveState } from '@shared/sim';
import { DrivePlayback } from '@/drive/playback';

const alphas: [number, number, number, number] = [0.01, 3e-5, 0.0025, 1e-4];
const start = { x: 4, y: 7.6, theta: 0 };
const floor = () => 1;
const noise = (id: string | null) => (id ? { position: 0.03, heading: 0.02 } : { position: 0, heading: 0 });

const state = (seq: number): DriveState => ({
  status: 'driving',
  seq,
  time: 0,
  odometry: start,
  v: 0,
  w: 0,
  pendingCallPointId: null,
  answeredCallPoints: [],
  markersInView: [],
  docked: false,
  contacts: 0,
  blocked: false,
  distanceSinceAnchor: 0,
});

/** A few results like the server's: steps along x with a slight turn, then a call with a re-anchoring and a pass. */
function results(): BatchResult[] {
  const out: BatchResult[] = [];
  let x = start.x;
  let theta = 0;
  let seq = 0;
  for (let b = 0; b < 5; b++) {
    const odometry = [];
    for (let i = 0; i < 3; i++) {
      x += 0.1;
      theta += 0.01;
      seq += 1;
      odometry.push({ x, y: 7.6 + theta, theta });
    }
    out.push({ seq, odometry, events: [], state: state(seq) });
  }
  const anchored = { x: x + 0.05, y: 7.58, theta: 0.001 };
  const pass = [1, 2, 3, 4].map((k) => ({ x: anchored.x + 0.06 * k, y: 7.58, theta: 0.001 }));
  out.push({
    seq,
    odometry: pass,
    events: [
      { type: 'reanchored', seq, markerId: 'marker-east-1', odometry: anchored },
      { type: 'pass_done', seq, callPointId: 'gap', call: 'reanchor' },
    ],
    state: state(seq),
  });
  return out;
}

describe('DrivePlayback', () => {
  it('feeds the belief exactly as Belief.applyResult does, only spread over frames', () => {
    const reference = new Belief(start, 'seed-1', alphas, floor);
    for (const r of results()) reference.applyResult(r, noise);

    const belief = new Belief(start, 'seed-1', alphas, floor);
    const shown: number[] = [];
    const playback = new DrivePlayback(start, { belief, markerNoise: noise, period: 0.1, onShown: (r) => shown.push(r.seq) });
    for (const r of results()) playback.enqueue(r);
    let t = 0;
    for (let frame = 0; frame < 200 && !playback.idle; frame++) playback.frame((t += 16.7));

    expect(playback.idle).toBe(true);
    expect(Array.from(belief.cloud.x)).toEqual(Array.from(reference.cloud.x));
    expect(Array.from(belief.cloud.theta)).toEqual(Array.from(reference.cloud.theta));
    expect(belief.snapshot()).toEqual(reference.snapshot());
    expect(shown).toEqual([3, 6, 9, 12, 15, 15]);
  });

  it('shows one pose per control period of real time, catching up when the queue grows', () => {
    const belief = new Belief(start, 's', alphas, floor);
    const playback = new DrivePlayback(start, { belief, markerNoise: noise, period: 0.1, onShown: () => undefined, maxLag: 3 });
    const [first] = results();
    playback.enqueue(first);
    playback.frame(0);
    expect(playback.backlog).toBe(3);
    playback.frame(100);
    expect(playback.backlog).toBe(2);
    // Many poses at once: played down to the allowed lag straight away.
    for (const r of results().slice(1, 5)) playback.enqueue(r);
    playback.frame(116);
    expect(playback.backlog).toBeLessThanOrEqual(3);
  });

  it('rebuilds the same belief from the odometry trail and its restarts (resuming: AttemptView.odometryTrail and .reanchors)', () => {
    const live = new Belief(start, 'seed-2', alphas, floor);
    const trail: { x: number; y: number; theta: number }[] = [];
    const reanchors: { index: number; noise: { position: number; heading: number } }[] = [];
    const playback = new DrivePlayback(start, { belief: live, markerNoise: noise, period: 0.1, onShown: () => undefined });
    for (const r of results()) {
      playback.enqueue(r);
      // The server's trail holds the re-anchored pose as a step of its own, before the pass.
      for (const e of r.events) {
        if (e.type === 'reanchored') {
          reanchors.push({ index: trail.length, noise: noise(e.markerId) });
          trail.push(e.odometry);
        }
      }
      trail.push(...r.odometry);
    }
    playback.drain();
    expect(playback.trailIndex).toBe(trail.length);

    const resumed = new Belief(start, 'seed-2', alphas, floor);
    new DrivePlayback(start, { belief: resumed, markerNoise: noise, period: 0.1, onShown: () => undefined }).replayTrail(trail, reanchors);
    expect(Array.from(resumed.cloud.y)).toEqual(Array.from(live.cloud.y));
    expect(resumed.snapshot()).toEqual(live.snapshot());
  });
});
