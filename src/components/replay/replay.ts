/**
 * Replaying a submitted drive from its stored trace: where the believed (odometry) and the true
 * robot were after any number of steps, the 95 % confidence ring at every position, and the
 * drift cloud at the current position, rebuilt exactly as the scoring rebuilt it.
 *
 * Positions count steps applied: position 0 is the start, position k shows the drive after
 * trace[k - 1]. The belief has no clone, so the cloud moves forward step by step and a seek
 * backwards rebuilds it from the start: about 80 µs a moving step in Node here (2,000
 * particles), so a 300 s drive of 3,000 steps takes about a quarter of a second; the view
 * spreads that over frames. The ring does not depend on the particles, so a one-particle belief
 * run once gives the ring at every position for scrubbing without waiting.
 */
import type { Ellipse, Pose } from '@shared/motion';
import type { PublicTrial } from '@shared/schemas';
import { Belief, World, type TraceStep } from '@shared/sim';

/** Builds the belief the scoring builds (shared/sim Belief over the trial's floor), optionally with fewer particles. */
export function beliefFactory(trial: PublicTrial, publicSeed: string): (size?: number) => Belief {
  const world = new World(trial, trial.robot, trial.surfaces);
  const floor = (x: number, y: number) => world.driftMultiplierAt(x, y);
  return (size?: number) => new Belief(trial.start, publicSeed, trial.robot.assumedProfile.alphas, floor, size);
}

function feed(belief: Belief, step: TraceStep): void {
  if (step.reanchor) belief.reanchor(step.odometry, step.reanchor);
  else belief.advance(step.odometry);
}

/** The drive's poses, times and rings at every position (computed once). */
export class ReplayTrack {
  /** Number of positions: trace.length + 1. */
  readonly positions: number;
  private readonly rings: Float64Array;

  constructor(
    readonly trace: readonly TraceStep[],
    readonly start: Pose,
    makeBelief: (size?: number) => Belief,
  ) {
    this.positions = trace.length + 1;
    this.rings = new Float64Array(this.positions * 3);
    const light = makeBelief(1);
    this.storeRing(0, light.snapshot().ring);
    trace.forEach((step, i) => {
      feed(light, step);
      this.storeRing(i + 1, light.snapshot().ring);
    });
  }

  private storeRing(position: number, ring: Ellipse) {
    this.rings[position * 3] = ring.major;
    this.rings[position * 3 + 1] = ring.minor;
    this.rings[position * 3 + 2] = ring.angle;
  }

  get last(): number {
    return this.positions - 1;
  }

  clamp(position: number): number {
    return Math.max(0, Math.min(this.last, Math.round(position)));
  }

  /** Drive time at a position, seconds (halts and re-anchoring detours included). */
  time(position: number): number {
    const k = this.clamp(position);
    return k === 0 ? 0 : this.trace[k - 1].t;
  }

  odometry(position: number): Pose {
    const k = this.clamp(position);
    return k === 0 ? this.start : this.trace[k - 1].odometry;
  }

  /** The true pose (the trial's start pose at position 0: the drive starts where the robot is). */
  truth(position: number): Pose {
    const k = this.clamp(position);
    return k === 0 ? this.start : this.trace[k - 1].truth;
  }

  ring(position: number): Ellipse {
    const k = this.clamp(position);
    return { major: this.rings[k * 3], minor: this.rings[k * 3 + 1], angle: this.rings[k * 3 + 2] };
  }

  /** Whether the step that leads to this position was driven as a pass after a call. */
  isPass(position: number): boolean {
    const k = this.clamp(position);
    return k > 0 && this.trace[k - 1].source === 'pass';
  }
}

/** The full belief (cloud and all) at a position: forward by steps, backward by a rebuild. */
export class BeliefCursor {
  private belief: Belief;
  private at = 0;
  /** How many times the belief was rebuilt from the start (a backward seek). */
  rebuilds = 0;

  constructor(
    private readonly trace: readonly TraceStep[],
    private readonly makeBelief: () => Belief,
  ) {
    this.belief = makeBelief();
  }

  get position(): number {
    return this.at;
  }

  /** The belief after `position` steps. */
  seek(position: number): Belief {
    this.advanceToward(position, Infinity);
    return this.belief;
  }

  /**
   * Moves toward `position` by at most `maxSteps` steps (restarting from the start first if it
   * lies behind), so a long rebuild can be spread over several frames. True once there.
   */
  advanceToward(position: number, maxSteps: number): boolean {
    const target = Math.max(0, Math.min(this.trace.length, Math.round(position)));
    if (target < this.at) {
      this.belief = this.makeBelief();
      this.at = 0;
      this.rebuilds += 1;
    }
    for (let n = 0; this.at < target && n < maxSteps; n++) {
      feed(this.belief, this.trace[this.at]);
      this.at += 1;
    }
    return this.at === target;
  }

  get current(): Belief {
    return this.belief;
  }
}

// ---------------------------------------------------------------------------------------
// The play clock

export const REPLAY_SPEEDS = [1, 4, 16] as const;
export type ReplaySpeed = (typeof REPLAY_SPEEDS)[number];

export interface ClockState {
  playing: boolean;
  speed: ReplaySpeed;
  /** Fractional position; the shown position is its floor. */
  position: number;
}

/**
 * Moves the play clock on by `elapsedMs` of wall time: one control period of the drive per
 * period of wall time at 1×. Positions, not drive time, are what move, so the seconds a halt or
 * a re-anchoring adds to the drive do not make the replay wait. Stops at the last position.
 */
export function tickClock(state: ClockState, elapsedMs: number, period: number, last: number): ClockState {
  if (!state.playing || elapsedMs <= 0) return state;
  const next = state.position + (elapsedMs / 1000 / period) * state.speed;
  if (next >= last) return { ...state, position: last, playing: false };
  return { ...state, position: next };
}

/** Pressing play at the end starts again from the beginning. */
export function play(state: ClockState, last: number): ClockState {
  return { ...state, playing: true, position: state.position >= last ? 0 : state.position };
}

export function seekClock(state: ClockState, position: number, last: number): ClockState {
  return { ...state, position: Math.max(0, Math.min(last, Math.round(position))) };
}

/** Where a position sits along the timeline, 0–100 %. */
export function timelinePercent(position: number, last: number): number {
  return last <= 0 ? 0 : (100 * Math.max(0, Math.min(last, position))) / last;
}

/**
 * The believed and true paths as flat x, y arrays (the believed one broken where the belief
 * restarted), with how many points of each belong to the drive up to every position, so the
 * replay can draw the paths "so far" without slicing.
 */
export function replayPaths(trace: readonly TraceStep[], start: Pose) {
  const believed = [start.x, start.y];
  const truth = [start.x, start.y];
  const believedEnd = new Uint32Array(trace.length + 1);
  const truthEnd = new Uint32Array(trace.length + 1);
  believedEnd[0] = 1;
  truthEnd[0] = 1;
  trace.forEach((step, i) => {
    if (step.reanchor) believed.push(NaN, NaN, step.odometry.x, step.odometry.y);
    else believed.push(step.odometry.x, step.odometry.y);
    truth.push(step.truth.x, step.truth.y);
    believedEnd[i + 1] = believed.length / 2;
    truthEnd[i + 1] = truth.length / 2;
  });
  return { believed, truth, believedEnd, truthEnd };
}
