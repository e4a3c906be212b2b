/**
 * Every shipped trial driven to the end in the browser with the keyboard (a scripted operator
 * reading the console's readout): the route, the calls with a pin, the dock, the submission.
 * Slow (several minutes), so it runs only with DRIVE_ALL_TRIALS=1:
 *   DRIVE_ALL_TRIALS=1 npx vitest run --project e2e tests/e2e/console-all-trials.test.ts
 */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SCREENSHOTS, demoEmail, launch, openPage, signIn, type Browser } from './browser';
import { followRoute, readPose, startPractice } from './console-helpers';

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

interface TrialInfo {
  id: string;
  title: string;
  route: { x: number; y: number }[];
  dock: { pose: { x: number; y: number; theta: number }; positionTolerance: number };
}

describe.runIf(process.env.DRIVE_ALL_TRIALS === '1')('every shipped trial in the browser', () => {
  it('drives each trial from start to dock with the keyboard and submits it', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('operator2'));
    const list = await page.evaluate(async () => (await (await fetch('/api/trials')).json()) as { items: { id: string }[] });
    const lines: string[] = [];
    const only = process.env.TRIALS?.split(',');
    for (const { id } of list.items.filter((t) => !only || only.includes(t.id))) {
      const { trial } = await page.evaluate(async (trialId) => (await (await fetch(`/api/trials/${trialId}`)).json()) as { trial: TrialInfo }, id);
      await startPractice(page, trial.title);
      const drive = await followRoute(page, trial.route, trial.dock.pose.theta).catch(async (error: unknown) => {
        await page.screenshot({ path: join(SCREENSHOTS, `console-trial-${trial.id}-failed.png`), animations: 'disabled' });
        throw error;
      });
      const pose = await readPose(page);
      const dockText = await page.getByTestId('readout-dock').innerText();
      const time = await page.getByTestId('readout-time').innerText();
      await page.screenshot({ path: join(SCREENSHOTS, `console-trial-${trial.id}.png`), animations: 'disabled' });
      await page.getByTestId('submit-drive').click();
      await page.locator('.p-confirmdialog').getByRole('button', { name: 'Submit the drive' }).click();
      await page.getByTestId('drive-summary').waitFor();
      const miss = Math.hypot(pose.x - trial.dock.pose.x, pose.y - trial.dock.pose.y);
      lines.push(
        `${trial.id}: calls ${drive.calls.join(', ') || 'none'}, contacts ${drive.contacts}, ` +
          `${dockText.includes('In the dock') ? 'docked' : 'not docked'} (${miss.toFixed(2)} m from the dock pose by odometry, tolerance ${trial.dock.positionTolerance} m), time ${time.split(' ')[0]}`,
      );
      console.log(lines.at(-1));
      expect(await page.getByTestId('summary-calls').innerText()).toMatch(/^\d+ of /);
    }
    console.log(`Every trial driven in the browser:\n  ${lines.join('\n  ')}`);
    expect(errors).toEqual([]);
    await page.close();
  }, 1_200_000);
});
