/**
 * Plays the server's answers out on screen at the robot's own pace: every odometry pose moves
 * the drawn robot and the drift cloud one control period, so the robot glides instead of jumping
 * a batch at a time, and the pass through a gap after a call is seen rather than teleported.
 * The belief is fed exactly as {@link Belief.applyResult} would feed it (a re-anchoring first,
 * then every pose in order); only the moment of each step is spread out.
 */
import type { Pose } from '@shared/motion';
import type { BatchResult, Belief } from '@shared/sim';

type Noise = { position: number; heading: number };
export type MarkerNoise = (markerId: string | null) => Noise;

type Item =
  | { kind: 'advance'; pose: Pose; pass: boolean }
  | { kind: 'reanchor'; pose: Pose; noise: Noise }
  | { kind: 'end'; result: BatchResult };

export interface PlaybackOptions {
  belief: Belief;
  markerNoise: MarkerNoise;
  /** Seconds per control period. */
  period: number;
  /** Called when the last pose of a result is shown: its events and state take effect then. */
  onShown: (result: BatchResult) => void;
  /** Live poses allowed to wait before playback catches up. */
  maxLag?: number;
  /** How much faster than real time a pass plays. */
  passSpeedUp?: number;
}

export class DrivePlayback {
  private readonly queue: Item[] = [];
  private credit = 0;
  private lastFrame: number | null = null;
  private liveWaiting = 0;
  /** Flat x, y of the odometry trail shown so far; a NaN pair marks a break (re-anchoring). */
  readonly trail: number[] = [];
  /** Poses fed to the belief so far, re-anchorings included (the index into the server's odometry trail). */
  trailIndex = 0;
  pose: Pose;
  private readonly o: Required<PlaybackOptions>;

  constructor(start: Pose, options: PlaybackOptions) {
    this.o = { ...options, maxLag: options.maxLag ?? 3, passSpeedUp: options.passSpeedUp ?? 2 };
    this.pose = { ...start };
    this.trail.push(start.x, start.y);
  }

  /** Poses still to be shown. */
  get backlog(): number {
    return this.queue.filter((i) => i.kind !== 'end').length;
  }

  get idle(): boolean {
    return this.queue.length === 0;
  }

  enqueue(result: BatchResult): void {
    const pass = result.events.some((e) => e.type === 'pass_done');
    for (const event of result.events) {
      if (event.type === 'reanchored') this.queue.push({ kind: 'reanchor', pose: event.odometry, noise: this.o.markerNoise(event.markerId) });
    }
    for (const pose of result.odometry) {
      this.queue.push({ kind: 'advance', pose, pass });
      if (!pass) this.liveWaiting += 1;
    }
    this.queue.push({ kind: 'end', result });
  }

  /** Shows what is due at `now` (ms). Returns whether anything changed. */
  frame(now: number): boolean {
    const elapsed = this.lastFrame === null ? 0 : now - this.lastFrame;
    this.lastFrame = now;
    if (this.queue.length === 0) {
      this.credit = 0;
      return false;
    }
    const periods = elapsed / (this.o.period * 1000);
    const head = this.queue.find((i) => i.kind !== 'end');
    this.credit += head && head.kind === 'advance' && head.pass ? periods * this.o.passSpeedUp : periods;
    let changed = false;
    while (this.queue.length > 0) {
      const item = this.queue[0];
      if (item.kind === 'end') {
        this.queue.shift();
        this.o.onShown(item.result);
        changed = true;
        continue;
      }
      const catchUp = item.kind === 'advance' && !item.pass && this.liveWaiting > this.o.maxLag;
      if (item.kind === 'advance' && this.credit < 1 && !catchUp) break;
      this.queue.shift();
      this.apply(item);
      if (item.kind === 'advance') {
        if (this.credit >= 1) this.credit -= 1;
        if (!item.pass) this.liveWaiting -= 1;
      }
      changed = true;
    }
    if (this.queue.length === 0) this.credit = 0;
    return changed;
  }

  /** Shows everything at once (resuming a drive, or leaving the page). */
  drain(): void {
    while (this.queue.length > 0) {
      const item = this.queue.shift()!;
      if (item.kind === 'end') this.o.onShown(item.result);
      else {
        this.apply(item);
        if (item.kind === 'advance' && !item.pass) this.liveWaiting -= 1;
      }
    }
    this.credit = 0;
  }

  /**
   * Feeds a stored odometry trail (resuming a drive): the belief restarts at the given trail
   * indices with the given noise (AttemptView.reanchors), as Belief.followTrace does.
   */
  replayTrail(trail: readonly Pose[], reanchors: readonly { index: number; noise: Noise }[]): void {
    const at = new Map(reanchors.map((r) => [r.index, r.noise]));
    for (let i = 0; i < trail.length; i++) {
      const noise = at.get(i);
      if (noise) this.apply({ kind: 'reanchor', pose: trail[i], noise });
      else this.apply({ kind: 'advance', pose: trail[i], pass: false });
    }
  }

  private apply(item: Exclude<Item, { kind: 'end' }>): void {
    if (item.kind === 'reanchor') {
      this.o.belief.reanchor(item.pose, item.noise);
      this.trail.push(NaN, NaN, item.pose.x, item.pose.y);
    } else {
      this.o.belief.advance(item.pose);
      const n = this.trail.length;
      if (this.trail[n - 2] !== item.pose.x || this.trail[n - 1] !== item.pose.y) this.trail.push(item.pose.x, item.pose.y);
    }
    this.pose = { ...item.pose };
    this.trailIndex += 1;
  }
}
