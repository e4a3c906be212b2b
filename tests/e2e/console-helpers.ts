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

const angleDiff = (a: number, b: number) => Math.atan2(Math.sin(a - b), Math.cos(a - b));

interface Point {
  x: number;
  y: number;
}

/** The keys held now, pressed and released by difference. */
export function keySet(page: Page) {
  const held = new Set<string>();
  return {
    async set(wanted: string[]) {
      for (const key of [...held]) {
        if (!wanted.includes(key)) {
          await page.keyboard.up(key);
          held.delete(key);
        }
      }
      for (const key of wanted) {
        if (!held.has(key)) {
          await page.keyboard.down(key);
          held.add(key);
        }
      }
    },
    release() {
      return this.set([]);
    },
  };
}

/** Nearest point on the polyline at or after segment `from`: its segment and the distance along the route to the end. */
function progressOn(route: readonly Point[], p: Point, from: number) {
  let best = { segment: from, t: 0, d: Infinity };
  for (let s = from; s < route.length - 1; s++) {
    const a = route[s];
    const b = route[s + 1];
    const dx = b.x - a.x;
    const dy = b.y - a.y;
    const l2 = dx * dx + dy * dy;
    const t = l2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / l2));
    const d = Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy));
    if (d < best.d - 1e-9) best = { segment: s, t, d };
  }
  return best;
}

function pointAhead(route: readonly Point[], segment: number, t: number, distance: number): Point {
  let s = segment;
  let a = route[s];
  let b = route[s + 1];
  let x = a.x + t * (b.x - a.x);
  let y = a.y + t * (b.y - a.y);
  let left = distance;
  while (s < route.length - 1) {
    const rest = Math.hypot(b.x - x, b.y - y);
    if (rest >= left) return { x: x + ((b.x - x) / rest) * left, y: y + ((b.y - y) / rest) * left };
    left -= rest;
    s += 1;
    if (s >= route.length - 1) break;
    a = route[s];
    b = route[s + 1];
    x = a.x;
    y = a.y;
  }
  return route[route.length - 1];
}

export interface RouteDrive {
  calls: string[];
  contacts: number;
}

/**
 * Drives a trial's route with the keyboard as a careful operator would: steer at a point a metre
 * ahead on the route, turn on the spot for sharp corners, fine control near the end; at a call
 * point place the pin at the believed position and proceed (re-anchor when a marker is in view);
 * after a contact acknowledge it and back off. Stops on the dock and turns to its heading.
 */
export async function followRoute(page: Page, route: readonly Point[], dockTheta: number, timeout = 240_000): Promise<RouteDrive> {
  const keys = keySet(page);
  const end = Date.now() + timeout;
  const out: RouteDrive = { calls: [], contacts: 0 };
  const goal = route[route.length - 1];
  let segment = 0;
  try {
    for (;;) {
      if (Date.now() > end) throw new Error(`Route not finished in ${timeout} ms at ${JSON.stringify(await readPose(page))}`);
      if (await page.getByTestId('contact-notice').isVisible()) {
        await keys.release();
        out.contacts += 1;
        await page.getByRole('button', { name: 'I understand' }).click();
        await keys.set(['ArrowDown']);
        await page.waitForTimeout(700);
        await keys.release();
        continue;
      }
      const panel = page.getByTestId('call-panel');
      if (await panel.isVisible()) {
        await keys.release();
        if (await panel.getByRole('button', { name: /the believed position/ }).isVisible()) {
          await panel.getByRole('button', { name: /the believed position/ }).click();
        }
        const reanchor = page.getByLabel(/^Re-anchor/);
        const call = (await reanchor.isEnabled()) ? 'Re-anchor' : 'Proceed';
        out.calls.push(call);
        await panel.getByText(call, { exact: true }).click();
        await page.getByRole('button', { name: 'Make the call' }).click();
        await panel.waitFor({ state: 'hidden', timeout: 15_000 });
        await page.getByText('Passing the gap').waitFor({ state: 'hidden', timeout: 60_000 });
        continue;
      }
      const pose = await readPose(page);
      const near = progressOn(route, pose, segment);
      segment = near.segment;
      const toGoal = Math.hypot(goal.x - pose.x, goal.y - pose.y);
      const onLast = segment === route.length - 2;
      const last = route[route.length - 2];
      const along = (goal.x - last.x) * (pose.x - goal.x) + (goal.y - last.y) * (pose.y - goal.y);
      if (onLast && (toGoal < 0.06 || along > 0)) break;
      const fine = toGoal < 2.5;
      const target = pointAhead(route, segment, near.t, fine ? Math.max(0.3, Math.min(1, toGoal)) : 0.8);
      const error = angleDiff(Math.atan2(target.y - pose.y, target.x - pose.x), pose.theta);
      const turn = error > 0.04 ? 'ArrowLeft' : error < -0.04 ? 'ArrowRight' : null;
      const wanted: string[] = [];
      if (fine || Math.abs(error) > 0.25) wanted.push('Shift');
      if (Math.abs(error) < 0.5) wanted.push('ArrowUp');
      if (turn) wanted.push(turn);
      await keys.set(wanted);
      await page.waitForTimeout(50);
    }
    // On the dock: stop, then turn on the spot to the dock's heading.
    await keys.release();
    await page.waitForTimeout(800);
    for (let i = 0; i < 200; i++) {
      const pose = await readPose(page);
      const error = angleDiff(dockTheta, pose.theta);
      if (Math.abs(error) < 0.05) break;
      await keys.set(['Shift', error > 0 ? 'ArrowLeft' : 'ArrowRight']);
      await page.waitForTimeout(50);
      await keys.release();
      await page.waitForTimeout(150);
    }
  } finally {
    await keys.release();
  }
  return out;
}
