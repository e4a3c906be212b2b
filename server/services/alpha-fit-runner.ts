/**
 * The alpha fit off the web process's event loop: each fit runs in a worker thread, one at a
 * time per process (a long log takes seconds of CPU; two at once would only share the cores).
 */
import { Worker } from 'node:worker_threads';
import type { AlphaFitReport } from '../../shared/calibration';
import type { Pose } from '../../shared/motion';

export interface AlphaFitJob {
  odometry: Pose[];
  reference: Pose[];
  resamples: number;
  seed: string;
}

const ENTRY = new URL('../workers/alpha-fit.mjs', import.meta.url);

let queue: Promise<unknown> = Promise.resolve();

function runInThread(job: AlphaFitJob): Promise<AlphaFitReport> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(ENTRY, { workerData: job });
    let settled = false;
    worker.once('message', (answer: { ok: true; report: AlphaFitReport } | { ok: false; message: string }) => {
      settled = true;
      if (answer.ok) resolve(answer.report);
      else reject(new Error(`alpha fit: ${answer.message}`));
      void worker.terminate();
    });
    worker.once('error', (error) => {
      settled = true;
      reject(error);
    });
    worker.once('exit', (code) => {
      if (!settled) reject(new Error(`alpha fit: the worker stopped (exit code ${code})`));
    });
  });
}

/** Fits a1..a4 with bootstrap intervals in a worker thread, after any fit already running. */
export function runAlphaFit(job: AlphaFitJob): Promise<AlphaFitReport> {
  const result = queue.then(() => runInThread(job));
  queue = result.catch(() => undefined);
  return result;
}
