/**
 * The alpha fit off the web process's event loop: each fit runs in a fresh worker thread, one at a
 * time per process (a long log takes seconds of CPU; two at once would only share the cores).
 *
 * Bounded: a fit that runs past its time limit is stopped (the worker is terminated) and answers
 * 503 `calibration_busy`; at most `maxWaiting` fits wait behind the running one, and a fit beyond
 * that answers 503 `calibration_busy` at once with `details.retryAfterSeconds` (as `calibration_rows`
 * carries `details.problems`; the error handler sets no Retry-After header); the worker's heap is
 * limited. A worker that crashes or exits fails only the fit it was running.
 */
import { Worker, type ResourceLimits } from 'node:worker_threads';
import type { AlphaFitReport } from '../../shared/calibration';
import type { Pose } from '../../shared/motion';
import { HttpError } from '../http/errors';

export interface AlphaFitJob {
  odometry: Pose[];
  reference: Pose[];
  resamples: number;
  seed: string;
}

export interface AlphaFitRunnerOptions {
  /** Longest a fit may run (from the start of its worker) before the worker is terminated; default 60 s. */
  timeLimitMs?: number;
  /** Most fits that may wait behind the running one; default 3. */
  maxWaiting?: number;
  /** Limits of each worker; default a 512 MB old generation. */
  resourceLimits?: ResourceLimits;
}

export interface AlphaFitRunner {
  /**
   * Fits a1..a4 with bootstrap intervals in a worker thread, after the fits already queued. When
   * `signal` aborts, a waiting fit leaves the queue and a running one's worker is terminated; the
   * call rejects with `signal.reason`.
   */
  run(job: AlphaFitJob, signal?: AbortSignal): Promise<AlphaFitReport>;
}

const ENTRY = new URL('../workers/alpha-fit.mjs', import.meta.url);
/** A 20,000-row fit stays far below this (measured: the whole process peaks under 200 MB resident). */
const DEFAULT_RESOURCE_LIMITS: ResourceLimits = { maxOldGenerationSizeMb: 512 };
/** How long a terminated worker may take to exit before the next fit starts anyway. */
const TERMINATE_GRACE_MS = 5_000;

type WorkerAnswer = { ok: true; report: AlphaFitReport } | { ok: false; message: string };

interface Pending {
  job: AlphaFitJob;
  signal?: AbortSignal;
  resolve(report: AlphaFitReport): void;
  reject(reason: unknown): void;
  onAbort?: () => void;
}

const tookTooLong = () =>
  new HttpError(503, 'calibration_busy', 'The fit took too long and was stopped. Try a smaller file, or try again later.');

export function createAlphaFitRunner(options: AlphaFitRunnerOptions = {}): AlphaFitRunner {
  const timeLimitMs = options.timeLimitMs ?? 60_000;
  const maxWaiting = options.maxWaiting ?? 3;
  const resourceLimits = options.resourceLimits ?? DEFAULT_RESOURCE_LIMITS;
  const waiting: Pending[] = [];
  /** The running fit's deadline (epoch ms), or null when no worker is running. */
  let runningUntil: number | null = null;

  /** A waiting place frees when the running fit ends, at the latest at its deadline. */
  const retryAfterSeconds = () => Math.max(1, Math.ceil(((runningUntil ?? Date.now()) - Date.now()) / 1000));

  function startNext(): void {
    if (runningUntil !== null) return;
    const next = waiting.shift();
    if (!next) return;
    if (next.onAbort) next.signal!.removeEventListener('abort', next.onAbort);
    runningUntil = Date.now() + timeLimitMs;
    let worker: Worker | undefined;
    let done = false;
    const finish = (outcome: { report: AlphaFitReport } | { error: unknown }) => {
      if (done) return;
      done = true;
      clearTimeout(timer);
      next.signal?.removeEventListener('abort', onAbort);
      if ('report' in outcome) next.resolve(outcome.report);
      else next.reject(outcome.error);
      // The next fit starts once this worker is gone, so that two fits never share the cores.
      let grace: NodeJS.Timeout | undefined;
      const gone = worker ? Promise.race([worker.terminate(), new Promise((r) => (grace = setTimeout(r, TERMINATE_GRACE_MS).unref()))]) : Promise.resolve();
      void gone
        .catch(() => undefined)
        .then(() => {
          clearTimeout(grace);
          runningUntil = null;
          startNext();
        });
    };
    const onAbort = () => finish({ error: next.signal!.reason });
    const timer = setTimeout(() => finish({ error: tookTooLong() }), timeLimitMs);
    next.signal?.addEventListener('abort', onAbort, { once: true });
    try {
      worker = new Worker(ENTRY, { workerData: next.job, resourceLimits });
    } catch (error) {
      finish({ error });
      return;
    }
    worker.once('message', (answer: WorkerAnswer) =>
      finish(answer.ok ? { report: answer.report } : { error: new Error(`alpha fit: ${answer.message}`) }),
    );
    worker.once('error', (error) => finish({ error }));
    worker.once('exit', (code) => finish({ error: new Error(`alpha fit: the worker stopped (exit code ${code})`) }));
  }

  return {
    run(job, signal) {
      if (signal?.aborted) return Promise.reject(signal.reason);
      if (runningUntil !== null && waiting.length >= maxWaiting) {
        const seconds = retryAfterSeconds();
        return Promise.reject(
          new HttpError(503, 'calibration_busy', `Other calibration fits are running. Try again in ${seconds} seconds.`, undefined, {
            details: { retryAfterSeconds: seconds },
          }),
        );
      }
      return new Promise<AlphaFitReport>((resolve, reject) => {
        const pending: Pending = { job, signal, resolve, reject };
        if (signal) {
          pending.onAbort = () => {
            const at = waiting.indexOf(pending);
            if (at >= 0) waiting.splice(at, 1);
            reject(signal.reason);
          };
          signal.addEventListener('abort', pending.onAbort, { once: true });
        }
        waiting.push(pending);
        startNext();
      });
    },
  };
}

const runner = createAlphaFitRunner();

/** Fits a1..a4 with bootstrap intervals in a worker thread of this process's runner (60 s limit, 3 waiting). */
export function runAlphaFit(job: AlphaFitJob, signal?: AbortSignal): Promise<AlphaFitReport> {
  return runner.run(job, signal);
}
