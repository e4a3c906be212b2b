/**
 * Runs in a worker thread: the maximum-likelihood fit of a1..a4 with its bootstrap (hundreds of
 * refits; seconds for a long log), so that the web process keeps answering other requests.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { fitDriftAlphas } from '../../shared/calibration';
import type { AlphaFitJob } from '../services/alpha-fit-runner';

const job = workerData as AlphaFitJob;
try {
  parentPort!.postMessage({ ok: true, report: fitDriftAlphas(job.odometry, job.reference, { resamples: job.resamples, seed: job.seed }) });
} catch (error) {
  parentPort!.postMessage({ ok: false, message: (error as Error).message });
}
