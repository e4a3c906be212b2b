/**
 * The drive console in a real Chromium: an operator drives long-aisle-run with the keyboard to
 * the call point, places an estimate pin, makes a call, survives a network drop and a lost answer,
 * reloads mid-drive, docks and submits. Screenshots go to .data/screenshots/console-*.png.
 */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Request, Route } from 'playwright-core';
import { SCREENSHOTS, demoEmail, launch, openPage, signIn, type Browser } from './browser';
import { counters, driveEastAlong, fetchAttempt, readPose, until, waitForConsole } from './console-helpers';

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

const shot = (name: string) => join(SCREENSHOTS, `console-${name}.png`);

describe('the drive console', () => {
  it('an operator drives long-aisle-run with the keyboard: call with an estimate pin, network drop, reload, dock, submit', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('operator1'));

    // Home links to the trials; the trials page shows seats and trials.
    await page.getByRole('link', { name: 'Trials', exact: true }).first().click();
    await page.getByRole('heading', { level: 1, name: 'Trials' }).waitFor();
    await page.getByTestId('exam-seats').waitFor();
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: shot('trials'), fullPage: true, animations: 'disabled' });

    await page.getByRole('link', { name: 'Long aisle run', exact: true }).first().click();
    await page.getByRole('heading', { level: 1, name: 'Long aisle run' }).waitFor();
    await page.getByRole('heading', { name: 'Safety caution' }).waitFor();
    await page.screenshot({ path: shot('briefing'), fullPage: true, animations: 'disabled' });
    await page.getByRole('button', { name: 'Start practice drive' }).click();
    await page.waitForURL((u) => u.pathname.startsWith('/operator/drives/'));
    const attemptId = new URL(page.url()).pathname.split('/').pop()!;
    await waitForConsole(page);
    await page.getByText('Ready', { exact: true }).waitFor();
    await page.screenshot({ path: shot('ready'), animations: 'disabled' });

    // Record every steps request: a resend must carry exactly the same batch.
    const bodies = new Map<number, Set<string>>();
    const failed: number[] = [];
    const stepsOf = (request: Request) => (request.url().endsWith('/steps') ? (JSON.parse(request.postData() ?? '{}') as { fromSeq: number }) : null);
    page.on('request', (request) => {
      const body = stepsOf(request);
      if (!body) return;
      if (!bodies.has(body.fromSeq)) bodies.set(body.fromSeq, new Set());
      bodies.get(body.fromSeq)!.add(request.postData()!);
    });
    page.on('requestfailed', (request) => {
      const body = stepsOf(request);
      if (body) failed.push(body.fromSeq);
    });

    // Drive east. After about 8 m the network drops for 2.5 s; the banner shows, the drive pauses.
    let dropped = false;
    let lostAnswer = false;
    await driveEastAlong(page, 7.6, (pose) => pose.x >= 12, { timeout: 30_000 });
    await page.keyboard.down('ArrowUp');
    await browser.context.setOffline(true);
    const banner = page.getByTestId('connection-banner');
    await banner.waitFor({ timeout: 10_000 });
    expect(await banner.innerText()).toContain('Connection lost');
    const pausedAt = await readPose(page);
    await page.screenshot({ path: shot('connection-lost'), animations: 'disabled' });
    await page.waitForTimeout(2500);
    // Paused: while offline the robot does not move (the screen has caught up with what was acknowledged).
    const stillAt = await readPose(page);
    expect(Math.abs(stillAt.x - pausedAt.x)).toBeLessThan(0.6);
    await browser.context.setOffline(false);
    await banner.waitFor({ state: 'hidden', timeout: 15_000 });
    await page.getByTestId('connection-restored').waitFor();
    dropped = true;
    await page.keyboard.up('ArrowUp');

    // A lost answer: the server applies one batch but its answer never arrives; the resend gets the stored one.
    await page.route('**/api/attempts/*/steps', async (route: Route) => {
      if (lostAnswer) return route.continue();
      lostAnswer = true;
      await route.fetch();
      await route.abort('failed');
    });
    await driveEastAlong(page, 7.6, (pose) => pose.x >= 20, { timeout: 30_000 });
    await page.unroute('**/api/attempts/*/steps');
    expect(lostAnswer).toBe(true);

    // On to the call point near x = 35.5: the drive pauses and the call panel asks for a pin.
    await page.screenshot({ path: shot('driving'), animations: 'disabled' });
    const panel = page.getByTestId('call-panel');
    await driveEastAlong(page, 7.6, () => panel.isVisible(), { timeout: 40_000 });
    expect(dropped).toBe(true);
    expect((await readPose(page)).x).toBeGreaterThan(35.3);
    expect(await page.getByTestId('call-panel').innerText()).toContain('Gap between the pallet stacks');
    expect(await page.getByRole('button', { name: 'Make the call' }).isDisabled()).toBe(true);

    // Place the estimate pin with a click on the map (the robot is in the middle while following), then drag its ring.
    const map = page.getByTestId('site-map');
    const box = (await map.boundingBox())!;
    const zoom = Number(await map.getAttribute('data-zoom'));
    const cx = box.x + box.width / 2;
    const cy = box.y + box.height / 2;
    await page.mouse.click(cx + 0.1 * zoom, cy);
    await page.getByLabel('Ring radius').waitFor();
    expect(Number((await page.getByLabel('Ring radius').inputValue()).replace(/[^\d.]/g, ''))).toBeCloseTo(0.5, 2);
    // The handle sits on the ring, east of the pin.
    const handleX = cx + 0.1 * zoom + 0.5 * zoom;
    await page.mouse.move(handleX, cy);
    await page.mouse.down();
    await page.mouse.move(handleX + 0.2 * zoom, cy, { steps: 6 });
    await page.mouse.up();
    const radius = Number((await page.getByLabel('Ring radius').inputValue()).replace(/[^\d.]/g, ''));
    expect(radius).toBeGreaterThan(0.6);
    expect(radius).toBeLessThan(0.8);
    await page.screenshot({ path: shot('call'), animations: 'disabled' });

    // Re-anchor on the east marker when it is in view, else proceed.
    const reanchor = page.getByLabel(/^Re-anchor/);
    const call = (await reanchor.isEnabled()) ? 'Re-anchor' : 'Proceed';
    console.log(`Call made at the gap: ${call}`);
    await page.getByTestId('call-panel').getByText(call, { exact: true }).click();
    await page.getByRole('button', { name: 'Make the call' }).click();
    await page.getByTestId('call-panel').waitFor({ state: 'hidden' });
    await page.getByText('Passing the gap').waitFor();
    await page.getByText('Passing the gap').waitFor({ state: 'hidden', timeout: 20_000 });
    const afterPass = await readPose(page);
    expect(afterPass.x).toBeGreaterThan(40);
    expect(await page.getByTestId('readout-anchor').innerText()).toMatch(/^\d+\.\d m$/);

    // Every command the console took so far was applied once, in order (a batch or two may be on its
    // way, as the drive clock runs on); some batches were resent.
    const beforeReload = await counters(page);
    expect(beforeReload.startSeq).toBe(0);
    expect(beforeReload.acknowledged).toBe(beforeReload.seq);
    const onItsWay = beforeReload.queued - beforeReload.dropped - beforeReload.acknowledged;
    expect(onItsWay).toBeGreaterThanOrEqual(0);
    expect(onItsWay).toBeLessThanOrEqual(4);
    expect(beforeReload.resends).toBeGreaterThan(0);

    // Reload: the console resumes the same drive with the same belief (ring) from the server.
    const ringBefore = await page.getByTestId('readout-ring').innerText();
    const poseBefore = await readPose(page);
    await page.reload();
    await waitForConsole(page);
    expect(await page.getByTestId('readout-ring').innerText()).toBe(ringBefore);
    expect(await readPose(page)).toEqual(poseBefore);

    // Drive to the dock at x = 44 with fine control, then stop.
    await driveEastAlong(page, 7.6, (pose) => pose.x >= 43.8, { fine: true, timeout: 40_000 });
    await until(async () => (await page.getByTestId('readout-dock').innerText()).includes('In the dock'), 8000, 'the dock');
    await page.screenshot({ path: shot('docked'), animations: 'disabled' });

    // Submit (the console first sends what it still holds).
    await page.getByTestId('submit-drive').click();
    await page.locator('.p-confirmdialog').getByRole('button', { name: 'Submit the drive' }).click();
    await page.getByTestId('drive-summary').waitFor();

    // No command lost or sent twice: every command this console took was applied once, in order.
    const before = await counters(page);
    expect(before.startSeq).toBeGreaterThanOrEqual(beforeReload.seq);
    expect(before.queued - before.dropped).toBe(before.seq - before.startSeq);
    expect(before.acknowledged).toBe(before.seq - before.startSeq);
    for (const [fromSeq, set] of bodies) expect(set.size, `batch from seq ${fromSeq} was resent with other commands`).toBe(1);
    expect(failed.length).toBeGreaterThan(0);
    expect(await page.getByTestId('summary-calls').innerText()).toBe('1 of 1');
    expect(await page.getByTestId('summary-contacts').innerText()).toMatch(/^\d/);
    await page.screenshot({ path: shot('summary'), fullPage: true, animations: 'disabled' });

    // The server's log: contiguous batches, their commands add up to the final seq the console counted.
    const view = await fetchAttempt(page, attemptId);
    expect(view.state.status).toBe('submitted');
    let seq = 0;
    for (const entry of view.result!.log.filter((e) => e.kind === 'steps')) {
      expect(entry.request.fromSeq).toBe(seq);
      seq = entry.response!.seq!;
    }
    expect(seq).toBe(view.state.seq);
    expect(view.state.seq).toBe(before.seq);
    expect(errors).toEqual([]);
    await page.close();
  }, 240_000);
});
