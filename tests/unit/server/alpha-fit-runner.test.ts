import type { Request, Response } from 'express';
import { describe, expect, it } from 'vitest';
import { createRng, type OdometryAlphas } from '../../../shared/motion/index';
import { fitDriftAlphas } from '../../../shared/calibration/index';
import { createAlphaFitRunner, type AlphaFitJob } from '../../../server/services/alpha-fit-runner';
import { errorHandler } from '../../../server/http/errors';
import { pairedDrive } from '../calibration/simulate';

// Invented alphas of a plausible robot (the data are simulated; only the runner is under test).
const truth: OdometryAlphas = [0.05, 0.01, 0.02, 0.03];
const drive = pairedDrive(truth, createRng('alpha-fit-runner'), 200);
const small: AlphaFitJob = { ...drive, resamples: 20, seed: 'runner' };
/** The same steps with a bootstrap of a million resamples: minutes of CPU, far past any limit here. */
const slow: AlphaFitJob = { ...small, resamples: 1_000_000 };
const busy = { status: 503, code: 'calibration_busy' };

describe('the alpha-fit runner', () => {
  it('answers in a worker thread what fitDriftAlphas answers in this thread', async () => {
    const runner = createAlphaFitRunner();
    const report = await runner.run(small);
    const direct = fitDriftAlphas(small.odometry, small.reference, { resamples: small.resamples, seed: small.seed });
    expect(report.alphas).toEqual(direct.alphas);
    expect(report).toEqual(direct);
  });

  it('stops a fit past its time limit with 503 calibration_busy, and the next fit runs in a fresh worker', async () => {
    const runner = createAlphaFitRunner({ timeLimitMs: 1_500 });
    const started = Date.now();
    await expect(runner.run(slow)).rejects.toMatchObject({ ...busy, message: expect.stringMatching(/took too long/) });
    expect(Date.now() - started).toBeLessThan(10_000);
    const report = await runner.run(small);
    expect(report.alphas).toEqual(fitDriftAlphas(small.odometry, small.reference, { resamples: 20, seed: 'runner' }).alphas);
  }, 20_000);

  it('refuses at once the fit beyond the running one and maxWaiting waiting ones, and runs the others', async () => {
    const runner = createAlphaFitRunner({ maxWaiting: 1 });
    const settled: string[] = [];
    const first = runner.run(small).finally(() => settled.push('first'));
    const second = runner.run(small).finally(() => settled.push('second'));
    const third = runner.run(small);
    const error = await third.catch((e: unknown) => e);
    expect(settled).toEqual([]);
    expect(error).toMatchObject(busy);
    // What the client reads: {error: {code, message, details: {retryAfterSeconds}}}, as calibration_rows carries details.problems.
    const answer = { status: 0, body: undefined as unknown };
    const res = { headersSent: false, status: (s: number) => ((answer.status = s), res), json: (b: unknown) => (answer.body = b) };
    errorHandler(error, {} as Request, res as unknown as Response, () => undefined);
    expect(answer).toMatchObject({ status: 503, body: { error: { code: 'calibration_busy', details: { retryAfterSeconds: expect.any(Number) } } } });
    const { retryAfterSeconds } = (answer.body as { error: { details: { retryAfterSeconds: number } } }).error.details;
    expect(retryAfterSeconds).toBeGreaterThanOrEqual(1);
    expect(retryAfterSeconds).toBeLessThanOrEqual(60);
    const [a, b] = await Promise.all([first, second]);
    expect(a.alphas).toEqual(b.alphas);
    expect(settled).toEqual(['first', 'second']);
    // The queue has room again.
    await expect(runner.run(small)).resolves.toMatchObject({ alphas: a.alphas });
  });

  it('drops a waiting fit whose signal aborts, without disturbing the running one', async () => {
    const runner = createAlphaFitRunner({ maxWaiting: 1 });
    const first = runner.run(small);
    const leaving = new AbortController();
    const second = runner.run(small, leaving.signal);
    leaving.abort(new Error('the client left'));
    await expect(second).rejects.toThrow('the client left');
    // The place the dropped fit held is free again: a fit behind the running one is accepted.
    const third = runner.run(small);
    await expect(first).resolves.toMatchObject({ alphas: expect.any(Array) });
    await expect(third).resolves.toMatchObject({ alphas: expect.any(Array) });
  });
});
