/**
 * Sends the operator's commands to the server in numbered batches, one request at a time, and
 * keeps the drive's seq. A batch that fails on the way (no network, a server restart) is resent
 * unchanged until the server acknowledges it, so no command is lost or applied twice: the server
 * answers a resend of a stored batch with its stored answer. No DOM, no Vue: the console wraps it.
 */
import type { BatchResult, Command } from '@shared/sim';
import { isApiError } from '@/api';

/** Most commands in one batch (the API's limit, MAX_BATCH in shared/schemas/attempts.ts). */
export const BATCH_LIMIT = 50;

export interface Batch {
  fromSeq: number;
  commands: Command[];
}

export type LinkState = 'ok' | 'retrying' | 'lost';

/** Why the batcher stopped and needs the drive reloaded from the server. */
export type ResyncReason = 'seq_conflict' | 'awaiting_call' | 'time_up' | 'not_driving';

export interface BatcherOptions {
  /** Sends one batch; rejects with an ApiError (status 0 when the server could not be reached). */
  send: (batch: Batch) => Promise<BatchResult>;
  /** Called with every acknowledged batch, in seq order, once. `dropped`: commands the server did not apply. */
  onResult: (result: BatchResult, batch: Batch, dropped: number) => void;
  /** The connection went bad or came back. */
  onLinkChange?: (state: LinkState, error?: unknown) => void;
  /** The server and the client disagree about the drive: reload it. `expectedSeq` when the server said. */
  onResync?: (reason: ResyncReason, expectedSeq: number | null) => void;
  /** A failure retrying cannot fix (e.g. the session ended). */
  onFatal?: (error: unknown) => void;
  /** Milliseconds at least between two sends (not for an emergency stop). */
  sendInterval?: number;
  /** Waits before the n-th retry (1, 2, …), ms. */
  retryDelay?: (attempt: number) => number;
  /** Failed sends before the link counts as lost rather than retrying. */
  lostAfter?: number;
  now?: () => number;
  setTimer?: (fn: () => void, ms: number) => unknown;
  clearTimer?: (handle: unknown) => void;
}

const DEFAULT_RETRY = (n: number) => Math.min(4000, 250 * 2 ** Math.min(n - 1, 4));

/** Errors a resend of the same batch can get past. */
export function isTransient(error: unknown): boolean {
  if (!isApiError(error)) return true;
  return error.status === 0 || error.status === 408 || error.status === 429 || error.status >= 500;
}

export class CommandBatcher {
  /** The seq the next new batch starts at: every command before it is acknowledged. */
  private ackedSeq: number;
  private readonly queue: Command[] = [];
  private inFlight: Batch | null = null;
  private failures = 0;
  private lastSend = -Infinity;
  private timer: unknown = null;
  private stopped = false;
  private sending = false;
  private held = false;
  private linkState: LinkState = 'ok';
  /** Counters for the console's own check that nothing was lost or sent twice. */
  readonly stats = { queued: 0, acknowledged: 0, dropped: 0, sends: 0, resends: 0 };

  private readonly o: Required<Omit<BatcherOptions, 'onLinkChange' | 'onResync' | 'onFatal'>> &
    Pick<BatcherOptions, 'onLinkChange' | 'onResync' | 'onFatal'>;

  constructor(seq: number, options: BatcherOptions) {
    this.ackedSeq = seq;
    this.o = {
      sendInterval: 0,
      retryDelay: DEFAULT_RETRY,
      lostAfter: 1,
      now: () => performance.now(),
      setTimer: (fn, ms) => setTimeout(fn, ms),
      clearTimer: (handle) => clearTimeout(handle as ReturnType<typeof setTimeout>),
      ...options,
    };
  }

  get seq(): number {
    return this.ackedSeq;
  }

  get link(): LinkState {
    return this.linkState;
  }

  /** Commands waiting to go out, the batch on its way included. */
  get pending(): number {
    return this.queue.length + (this.inFlight?.commands.length ?? 0);
  }

  get busy(): boolean {
    return this.inFlight !== null;
  }

  /** Adds one command (one control period) and sends when it is time. */
  push(command: Command): void {
    if (this.stopped) return;
    this.queue.push({ v: command.v, w: command.w });
    this.stats.queued += 1;
    this.pump();
  }

  /**
   * Emergency stop: every command not yet sent becomes a stop, a stop is added, and it goes out
   * at once (right after the batch already on its way, which cannot be called back).
   */
  emergencyStop(): void {
    if (this.stopped) return;
    for (const command of this.queue) {
      command.v = 0;
      command.w = 0;
    }
    this.queue.push({ v: 0, w: 0 });
    this.stats.queued += 1;
    this.pump(true);
  }

  /** Keeps new batches from going out (e.g. while a call is due); the batch on its way still completes. */
  hold(held: boolean): void {
    this.held = held;
    if (!held) this.pump();
  }

  /**
   * Forgets the queued commands (the server will not take them, e.g. after a call point stopped
   * the robot) and starts again at `seq`. Only when no batch is on its way.
   */
  reset(seq: number): number {
    const dropped = this.queue.length;
    this.queue.length = 0;
    this.stats.dropped += dropped;
    this.ackedSeq = seq;
    return dropped;
  }

  /** Retry now (e.g. the browser says it is back online). */
  retryNow(): void {
    if (!this.inFlight || this.stopped || this.sending) return;
    this.cancelTimer();
    void this.transmit();
  }

  /** Stops for good: nothing more is sent, timers are cleared. */
  stop(): void {
    this.stopped = true;
    this.cancelTimer();
  }

  /** Sends the next batch when the link is free and it is time. */
  private pump(urgent = false): void {
    if (this.stopped || this.inFlight || this.queue.length === 0) return;
    if (this.held && !urgent) return;
    const wait = this.lastSend + this.o.sendInterval - this.o.now();
    if (!urgent && wait > 0) {
      if (this.timer === null) {
        this.timer = this.o.setTimer(() => {
          this.timer = null;
          this.pump();
        }, wait);
      }
      return;
    }
    this.cancelTimer();
    this.inFlight = { fromSeq: this.ackedSeq, commands: this.queue.splice(0, BATCH_LIMIT) };
    this.stats.sends += 1;
    void this.transmit();
  }

  private cancelTimer(): void {
    if (this.timer !== null) this.o.clearTimer(this.timer);
    this.timer = null;
  }

  private setLink(state: LinkState, error?: unknown): void {
    if (state === this.linkState) return;
    this.linkState = state;
    this.o.onLinkChange?.(state, error);
  }

  private async transmit(): Promise<void> {
    const batch = this.inFlight;
    if (!batch) return;
    this.lastSend = this.o.now();
    this.sending = true;
    let result: BatchResult;
    try {
      result = await this.o.send(batch);
    } catch (error) {
      this.sending = false;
      if (this.stopped || this.inFlight !== batch) return;
      this.failed(batch, error);
      return;
    }
    this.sending = false;
    if (this.stopped || this.inFlight !== batch) return;
    this.failures = 0;
    this.setLink('ok');
    this.inFlight = null;
    const applied = result.seq - batch.fromSeq;
    let dropped = Math.max(0, batch.commands.length - Math.max(0, applied));
    if (dropped > 0 || result.state.status !== 'driving') {
      // A call point or the time limit stopped the robot: the rest of the batch, and everything
      // queued after it, will never be applied.
      dropped += this.queue.length;
      this.queue.length = 0;
      this.stats.dropped += dropped;
    }
    this.stats.acknowledged += Math.max(0, applied);
    this.ackedSeq = result.seq;
    this.o.onResult(result, batch, dropped);
    if (result.state.status !== 'driving') this.held = true;
    this.pump();
  }

  private failed(batch: Batch, error: unknown): void {
    if (isTransient(error)) {
      this.failures += 1;
      this.setLink(this.failures >= this.o.lostAfter ? 'lost' : 'retrying', error);
      this.stats.resends += 1;
      this.timer = this.o.setTimer(() => {
        this.timer = null;
        if (this.inFlight === batch) void this.transmit();
      }, this.o.retryDelay(this.failures));
      return;
    }
    this.inFlight = null;
    this.failures = 0;
    this.setLink('ok');
    if (isApiError(error) && error.status === 409) {
      const code = error.code as ResyncReason | string;
      if (code === 'seq_conflict' || code === 'awaiting_call' || code === 'time_up' || code === 'not_driving') {
        // The server's drive is not where this console thinks it is: stop and let the console reload it.
        this.held = true;
        const expected = typeof error.body?.expectedSeq === 'number' ? error.body.expectedSeq : null;
        this.stats.dropped += batch.commands.length + this.queue.length;
        this.queue.length = 0;
        this.o.onResync?.(code, expected);
        return;
      }
    }
    this.stop();
    this.o.onFatal?.(error);
  }
}
