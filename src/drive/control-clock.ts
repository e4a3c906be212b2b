/**
 * Takes one command per control period in real time, whatever the timer's jitter: it counts the
 * periods elapsed since it started and samples the ones that are due. After a long stall (a busy
 * or hidden tab) it samples at most `maxCatchUp` at once and lets the rest go, so the robot never
 * gets a burst of stale commands.
 */
export interface ControlClockOptions {
  /** Seconds between two commands (the robot's control period). */
  period: number;
  /** Called once per due control period. */
  sample: () => void;
  maxCatchUp?: number;
  now?: () => number;
  setInterval?: (fn: () => void, ms: number) => unknown;
  clearInterval?: (handle: unknown) => void;
}

export class ControlClock {
  private started = 0;
  private taken = 0;
  private handle: unknown = null;
  private readonly periodMs: number;
  private readonly o: Required<ControlClockOptions>;

  constructor(options: ControlClockOptions) {
    this.o = {
      sample: options.sample,
      period: options.period,
      maxCatchUp: options.maxCatchUp ?? 3,
      now: options.now ?? (() => performance.now()),
      setInterval: options.setInterval ?? ((fn, ms) => setInterval(fn, ms)),
      clearInterval: options.clearInterval ?? ((h) => clearInterval(h as ReturnType<typeof setInterval>)),
    };
    this.periodMs = options.period * 1000;
  }

  get running(): boolean {
    return this.handle !== null;
  }

  /** Starts ticking; the first command is taken at once. */
  start(): void {
    if (this.handle !== null) return;
    this.started = this.o.now();
    this.taken = 0;
    this.handle = this.o.setInterval(() => this.tick(), Math.max(5, this.periodMs / 4));
    this.tick();
  }

  stop(): void {
    if (this.handle === null) return;
    this.o.clearInterval(this.handle);
    this.handle = null;
  }

  /** Samples what is due now. Public so tests can drive it with their own clock. */
  tick(): void {
    if (this.handle === null) return;
    const due = Math.floor((this.o.now() - this.started) / this.periodMs) + 1;
    let n = 0;
    while (this.taken < due && n < this.o.maxCatchUp) {
      this.taken += 1;
      n += 1;
      this.o.sample();
      if (this.handle === null) return;
    }
    if (this.taken < due) {
      // Fell too far behind: skip the missed periods instead of replaying them.
      this.started += (due - this.taken) * this.periodMs;
    }
  }
}
