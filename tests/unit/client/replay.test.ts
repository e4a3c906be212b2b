/**
 * The assessor's replay: positions, times and rings along a stored trace, the drift cloud rebuilt
 * at any position exactly as the scoring rebuilt it (checked against the scored calls of a real
 * drive), backward seeks, and the play clock.
 */
import { describe, expect, it } from 'vitest';
import type { TraceStep } from '@shared/sim';
import { callPosition, contactEpisodes } from '@/components/report/report-logic';
import { BeliefCursor, ReplayTrack, beliefFactory, play, replayPaths, seekClock, tickClock, timelinePercent, type ClockState } from '@/components/replay/replay';
import { PUBLIC_SEED, scoredDrive, type ScoredDrive as Drive } from './report-fixtures';

/** Every 5th particle, as shared/scoring samples 400 of 2,000 for the report. */
function sampleOf(x: Float64Array, y: Float64Array) {
  const every = Math.max(1, Math.floor(x.length / 400));
  const out = { x: [] as number[], y: [] as number[] };
  for (let i = 0; i < x.length; i += every) {
    out.x.push(x[i]);
    out.y.push(y[i]);
  }
  return out;
}

describe('replaying a scored drive', () => {
  let drive: Drive;
  it('drives the wash bay, re-anchoring where a marker can be read and halting elsewhere', async () => {
    drive = await scoredDrive('wash-bay-crossing', (markers) => (markers.length ? 'reanchor' : 'halt'));
    expect(drive.score.calls.length).toBe(2);
    expect(drive.trace.some((s) => s.reanchor)).toBe(true);
  });

  it('the belief at each call is exactly the one the scoring graded: centre, ring and cloud sample', () => {
    const make = beliefFactory(drive.trial, PUBLIC_SEED);
    const cursor = new BeliefCursor(drive.trace, () => make());
    for (const call of drive.score.calls) {
      const position = callPosition(drive.trace, call.time);
      const belief = cursor.seek(position);
      const snapshot = belief.snapshot();
      expect(snapshot.odometry).toEqual(call.belief.odometry);
      expect(snapshot.ring).toEqual(call.belief.ring);
      expect(sampleOf(belief.cloud.x, belief.cloud.y)).toEqual(call.cloudSample);
    }
    expect(cursor.rebuilds).toBe(0);
  });

  it('a backward seek rebuilds from the start and gives the same cloud as a fresh belief', () => {
    const make = beliefFactory(drive.trial, PUBLIC_SEED);
    const cursor = new BeliefCursor(drive.trace, () => make());
    const late = Math.floor(drive.trace.length * 0.9);
    const early = Math.floor(drive.trace.length * 0.3);
    cursor.seek(late);
    const again = cursor.seek(early);
    expect(cursor.rebuilds).toBe(1);
    expect(cursor.position).toBe(early);
    const fresh = new BeliefCursor(drive.trace, () => make()).seek(early);
    expect(Array.from(again.cloud.x)).toEqual(Array.from(fresh.cloud.x));
    expect(Array.from(again.cloud.y)).toEqual(Array.from(fresh.cloud.y));
    // Seeking forward again only steps on.
    cursor.seek(late);
    expect(cursor.rebuilds).toBe(1);
    // A rebuild spread over several calls ends at the same belief.
    const spread = new BeliefCursor(drive.trace, () => make());
    spread.seek(late);
    let calls = 0;
    while (!spread.advanceToward(early, 40)) calls += 1;
    expect(calls).toBe(Math.ceil(early / 40) - 1);
    expect(spread.rebuilds).toBe(1);
    expect(Array.from(spread.current.cloud.x)).toEqual(Array.from(fresh.cloud.x));
    // Positions outside the drive are clamped.
    expect(cursor.seek(1e9)).toBe(cursor.current);
    expect(cursor.position).toBe(drive.trace.length);
  });

  it('the track gives poses, times and the ring of the full belief at every position', () => {
    const make = beliefFactory(drive.trial, PUBLIC_SEED);
    const track = new ReplayTrack(drive.trace, drive.trial.start, make);
    expect(track.positions).toBe(drive.trace.length + 1);
    expect(track.time(0)).toBe(0);
    expect(track.odometry(0)).toEqual(drive.trial.start);
    expect(track.truth(0)).toEqual(drive.trial.start);
    expect(track.time(track.last)).toBe(drive.trace.at(-1)!.t);
    expect(track.truth(track.last)).toEqual(drive.trace.at(-1)!.truth);
    expect(track.odometry(-5)).toEqual(drive.trial.start);

    // The ring does not depend on the particles: the one-particle run matches the full belief.
    const full = new BeliefCursor(drive.trace, () => make());
    const reanchorAt = drive.trace.findIndex((s) => s.reanchor) + 1;
    for (const k of [0, 1, 50, reanchorAt - 1, reanchorAt, reanchorAt + 10, track.last]) {
      const ring = full.seek(k).snapshot().ring;
      expect(track.ring(k).major).toBe(ring.major);
      expect(track.ring(k).minor).toBe(ring.minor);
      expect(track.ring(k).angle).toBe(ring.angle);
    }
  });

  it('rebuilding a whole long drive is quick enough to seek backwards (figures printed, no limit)', async () => {
    const long = await scoredDrive('long-aisle-run', (markers) => (markers.length ? 'reanchor' : 'halt'));
    const make = beliefFactory(long.trial, PUBLIC_SEED);
    const t0 = performance.now();
    new BeliefCursor(long.trace, () => make()).seek(long.trace.length);
    const cloud = performance.now() - t0;
    new ReplayTrack(long.trace, long.trial.start, make);
    const rings = performance.now() - t0 - cloud;
    console.log(`replay: ${long.trace.length} steps; drift cloud rebuilt in ${cloud.toFixed(0)} ms, rings at every position in ${rings.toFixed(0)} ms`);
    expect(long.trace.length).toBeGreaterThan(400);
  });
});

describe('positions in a trace', () => {
  const pose = (x: number) => ({ x, y: 0, theta: 0 });
  // Four driven steps, a call at t = 0.4 answered with a re-anchor of 0 s, then two steps of the pass.
  const trace: TraceStep[] = [
    { t: 0.1, odometry: pose(0.1), truth: pose(0.1), source: 'command' },
    { t: 0.2, odometry: pose(0.2), truth: pose(0.2), source: 'command' },
    { t: 0.3, odometry: pose(0.3), truth: pose(0.3), source: 'command', contact: 'rack-1' },
    { t: 0.4, odometry: pose(0.3), truth: pose(0.3), source: 'command', contact: 'rack-1' },
    { t: 0.4, odometry: pose(0.35), truth: pose(0.3), source: 'pass', reanchor: { position: 0.02, heading: 0.01 } },
    { t: 0.5, odometry: pose(0.45), truth: pose(0.4), source: 'pass', contact: 'rack-1' },
    { t: 0.6, odometry: pose(0.55), truth: pose(0.5), source: 'pass' },
  ];

  it('a call sits where the drive time first reached it, before a re-anchor at the same time', () => {
    expect(callPosition(trace, 0.4)).toBe(4);
    expect(callPosition(trace, 0)).toBe(0);
    expect(callPosition(trace, 0.1)).toBe(1);
  });

  it('paths so far: how many points of each path belong to every position', () => {
    const paths = replayPaths(trace, pose(0));
    expect(paths.believedEnd.length).toBe(trace.length + 1);
    // Position 5 has applied the re-anchor: the believed path has its break and the new start.
    expect(paths.believed.slice(0, paths.believedEnd[5] * 2)).toEqual([0, 0, 0.1, 0, 0.2, 0, 0.3, 0, 0.3, 0, NaN, NaN, 0.35, 0]);
    expect(paths.truth.slice(0, paths.truthEnd[2] * 2)).toEqual([0, 0, 0.1, 0, 0.2, 0]);
    expect(paths.truthEnd[trace.length] * 2).toBe(paths.truth.length);
  });

  it('consecutive contact steps on one obstacle are one episode', () => {
    expect(contactEpisodes(trace).map((c) => [c.position, c.obstacleId])).toEqual([
      [3, 'rack-1'],
      [6, 'rack-1'],
    ]);
  });
});

describe('the play clock', () => {
  const period = 0.1;
  const base: ClockState = { playing: true, speed: 1, position: 10 };

  it('moves one control period of the drive per period of wall time at 1×, 4× and 16×', () => {
    expect(tickClock(base, 1000, period, 1000).position).toBeCloseTo(20, 9);
    expect(tickClock({ ...base, speed: 4 }, 1000, period, 1000).position).toBeCloseTo(50, 9);
    expect(tickClock({ ...base, speed: 16 }, 500, period, 1000).position).toBeCloseTo(90, 9);
  });

  it('does not move while paused, and stops at the end', () => {
    expect(tickClock({ ...base, playing: false }, 1000, period, 1000)).toEqual({ ...base, playing: false });
    expect(tickClock({ ...base, speed: 16 }, 10_000, period, 100)).toEqual({ playing: false, speed: 16, position: 100 });
  });

  it('play at the end starts again; a seek is clamped to the drive', () => {
    expect(play({ playing: false, speed: 4, position: 100 }, 100)).toEqual({ playing: true, speed: 4, position: 0 });
    expect(play({ playing: false, speed: 4, position: 40 }, 100).position).toBe(40);
    expect(seekClock(base, 250, 100).position).toBe(100);
    expect(seekClock(base, -3, 100).position).toBe(0);
    expect(seekClock(base, 41.6, 100).position).toBe(42);
    expect(timelinePercent(25, 100)).toBe(25);
    expect(timelinePercent(5, 0)).toBe(0);
  });
});
