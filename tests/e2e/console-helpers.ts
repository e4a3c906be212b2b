/**
 * Helpers for the drive console's browser tests: start a drive from a briefing, read the
 * readout, hold keys until a condition holds, and steer a straight line to a target.
 */
import type { Page } from 'playwright-core';
import { url } from './browser';

export interface ShownPose {
  x: number;
  y: number;
  theta: number;
}

export interface ConsoleCounters {
  seq: number;
  /** The seq when the console loaded the drive: its counters count from there. */
  startSeq: number;
  queued: number;
  acknowledged: number;
  dropped: number;
  sends: number;
  resends: number;
  status: string;
}

export async function readPose(page: Page): Promise<ShownPose> {
  const el = page.getByTestId('readout-position');
  const [x, y, theta] = await Promise.all(['data-x', 'data-y', 'data-theta'].map((a) => el.getAttribute(a)));
  return { x: Number(x), y: Number(y), theta: Number(theta) };
}

export async function counters(page: Page): Promise<ConsoleCounters> {
  return page.getByTestId('drive-console').evaluate((el) => {
    const d = (el as HTMLElement).dataset;
    return {
      seq: Number(d.seq),
      startSeq: Number(d.startSeq),
      queued: Number(d.queued),
      acknowledged: Number(d.acknowledged),
      dropped: Number(d.dropped),
      sends: Number(d.sends),
      resends: Number(d.resends),
      status: d.status ?? '',
    };
  });
}

/** Opens a trial's briefing from the trials page and starts a practice drive; resolves on the console. */
export async function startPractice(page: Page, trialTitle: string): Promise<string> {
  await page.goto(url('/operator/trials'));
  await page.getByRole('heading', { level: 1, name: 'Trials' }).waitFor();
  await page.getByRole('link', { name: trialTitle, exact: true }).first().click();
  await page.getByRole('heading', { level: 1, name: trialTitle }).waitFor();
  await page.getByRole('button', { name: 'Start practice drive' }).click();
  await page.waitForURL((u) => u.pathname.startsWith('/operator/drives/'));
  await waitForConsole(page);
  return new URL(page.url()).pathname.split('/').pop()!;
}

export async function waitForConsole(page: Page): Promise<void> {
  await page.locator('[data-testid="drive-console"][data-phase="ready"]').waitFor();
  await page.getByTestId('readout-position').waitFor();
}

/** Polls `check` every `every` ms until it returns true, or fails after `timeout` ms. */
export async function until(check: () => Promise<boolean>, timeout: number, what: string, every = 100): Promise<void> {
  const end = Date.now() + timeout;
  while (Date.now() < end) {
    if (await check()) return;
    await new Promise((resolve) => setTimeout(resolve, every));
  }
  throw new Error(`Timed out after ${timeout} ms waiting for ${what}`);
}

/**
 * Holds ↑ (with Shift for fine control if asked) and steers with ← / → to keep the odometry on
 * the line y = lineY heading east, until `stop(pose)` is true. Releases every key before returning.
 */
export async function driveEastAlong(
  page: Page,
  lineY: number,
  stop: (pose: ShownPose) => boolean | Promise<boolean>,
  options: { fine?: boolean; timeout?: number } = {},
): Promise<ShownPose> {
  const end = Date.now() + (options.timeout ?? 60_000);
  if (options.fine) await page.keyboard.down('Shift');
  await page.keyboard.down('ArrowUp');
  let turning: 'ArrowLeft' | 'ArrowRight' | null = null;
  let pose = await readPose(page);
  try {
    while (!(await stop(pose))) {
      if (Date.now() > end) throw new Error(`Drove for too long; last pose ${JSON.stringify(pose)}`);
      // Aim back at the line: a heading proportional to the cross-track error, kept small.
      const target = Math.max(-0.12, Math.min(0.12, -0.6 * (pose.y - lineY)));
      const want = pose.theta > target + 0.015 ? 'ArrowRight' : pose.theta < target - 0.015 ? 'ArrowLeft' : null;
      if (want !== turning) {
        if (turning) await page.keyboard.up(turning);
        if (want) await page.keyboard.down(want);
        turning = want;
      }
      await page.waitForTimeout(60);
      pose = await readPose(page);
    }
  } finally {
    if (turning) await page.keyboard.up(turning);
    await page.keyboard.up('ArrowUp');
    if (options.fine) await page.keyboard.up('Shift');
  }
  return pose;
}

/** The attempt as the API returns it to the signed-in operator (same session as the page). */
export async function fetchAttempt(page: Page, attemptId: string): Promise<AttemptViewLike> {
  return page.evaluate(async (id) => {
    const response = await fetch(`/api/attempts/${id}`, { credentials: 'same-origin' });
    return response.json();
  }, attemptId);
}

export interface AttemptViewLike {
  state: { seq: number; status: string; contacts: number; docked: boolean; answeredCallPoints: string[] };
  result?: {
    log: { entryNo: number; kind: string; request: { fromSeq?: number; commands?: { v: number; w: number }[] }; response: { seq?: number } | null }[];
  };
}
