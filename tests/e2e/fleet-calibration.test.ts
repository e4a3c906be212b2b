/**
 * Fleet calibration in a real browser: the demo employer uploads a runs file with bad rows and
 * sees each row's message, then the sample runs and poses files (plots drawn, figures shown),
 * saves the profile, assigns a practice trial; an operator of the same organization sees the
 * trial under "Practice on your fleet's drift" and starts a drive on it, which the briefing and
 * the console label with the fleet profile. Screenshots at desktop and phone widths.
 */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { SCREENSHOTS, demoEmail, launch, openPage, signIn, url, type Browser } from './browser';
import { waitForConsole } from './console-helpers';

const stamp = Date.now().toString(36);
const profileName = `Tuggers, cold store ${stamp}`;
const ROBOT = 'Aisle tugger (demo)';
const TRIAL = 'Long aisle run';
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1280, height: 860 };

/** Invented measurements with three kinds of mistake: an unknown direction, a decimal comma, a missing number. */
const BAD_RUNS = [
  'direction,x_error,y_error',
  'cw,0.052,-0.031',
  'north,0.061,-0.027',
  'cw,"0,048",-0.036',
  'ccw,-0.012,',
  'ccw,-0.018,0.039',
].join('\n');

let browser: Browser;
let profilePath = '';

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

async function shot(page: Page, name: string, fullPage = true) {
  await page.evaluate(() => document.fonts.ready);
  await page.screenshot({ path: join(SCREENSHOTS, `${name}.png`), fullPage, animations: 'disabled' });
}

async function sample(kind: 'umbmark' | 'poses'): Promise<Buffer> {
  const res = await fetch(url(`/api/fleet-calibration/samples/${kind}`));
  expect(res.status).toBe(200);
  expect(res.headers.get('content-type')).toMatch(/text\/csv/);
  return Buffer.from(await res.arrayBuffer());
}

/** How many pixels of a canvas are drawn (not fully transparent): a drawn chart has thousands. */
async function drawnPixels(canvas: Locator): Promise<number> {
  await canvas.waitFor();
  return canvas.evaluate((el) => {
    const c = el as HTMLCanvasElement;
    const ctx = c.getContext('2d');
    if (!ctx || c.width === 0 || c.height === 0) return 0;
    const { data } = ctx.getImageData(0, 0, c.width, c.height);
    let n = 0;
    for (let i = 3; i < data.length; i += 4) if (data[i] > 0) n++;
    return n;
  });
}

async function expectDrawn(page: Page, testId: string) {
  const canvas = page.getByTestId(testId).locator('canvas');
  await expect.poll(() => drawnPixels(canvas), { timeout: 10_000 }).toBeGreaterThan(1000);
}

/** No element of the page sticks out sideways (the page itself never scrolls horizontally). */
async function expectNoSidewaysScroll(page: Page) {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow).toBeLessThanOrEqual(0);
}

describe('fleet calibration', () => {
  it('the employer previews the runs and poses, sees bad rows, saves a profile and assigns a practice trial', async () => {
    const { page, errors } = await openPage(browser);
    await page.setViewportSize(DESKTOP);
    await signIn(page, demoEmail('employer'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Fleet calibration' }).click();
    await page.getByRole('heading', { level: 1, name: 'Fleet calibration' }).waitFor();
    await page.getByRole('link', { name: 'New fleet profile' }).click();
    await page.getByRole('heading', { level: 1, name: 'New fleet profile' }).waitFor();

    // Both sample links point at the public samples.
    expect(await page.getByTestId('sample-umbmark').getAttribute('href')).toBe('/api/fleet-calibration/samples/umbmark');
    expect(await page.getByTestId('sample-poses').getAttribute('href')).toBe('/api/fleet-calibration/samples/poses');

    // Saving with nothing uploaded is not possible.
    await expect.poll(() => page.getByTestId('save-hint').innerText()).toMatch(/at least one/);

    await page.getByRole('combobox', { name: 'Robot', exact: true }).click();
    await page.getByRole('option', { name: ROBOT, exact: true }).click();
    await expect.poll(() => page.getByTestId('robot-nominal').innerText()).toMatch(/wheel radius .* mm/);

    // A runs file with bad rows: each row and its column are named.
    await page.getByLabel('Runs file (CSV)').setInputFiles({ name: 'runs-bad.csv', mimeType: 'text/csv', buffer: Buffer.from(BAD_RUNS) });
    const problems = page.getByTestId('runs-problems');
    await problems.waitFor();
    const text = await problems.innerText();
    expect(text).toContain('runs-bad.csv');
    expect(text).toMatch(/\n3\s+direction\s+The direction "north"/);
    expect(text).toMatch(/\n4\s+x_error\s+.*decimal comma/);
    expect(text).toMatch(/\n5\s+y_error\s+.*empty/);
    await shot(page, 'fleet-new-problems');

    // The sample runs: the plot is drawn and the figures are shown.
    await page.getByLabel('Runs file (CSV)').setInputFiles({ name: 'sample-runs.csv', mimeType: 'text/csv', buffer: await sample('umbmark') });
    await page.getByTestId('umbmark-panel').waitFor();
    expect(await page.getByTestId('runs-problems').count()).toBe(0);
    await expectDrawn(page, 'umbmark-plot');
    expect(await page.getByTestId('umbmark-ed').innerText()).toMatch(/^\d\.\d{5} \([+−]?\d+\.\d{2} %\)$/);
    expect(await page.getByTestId('umbmark-eb').innerText()).toMatch(/^\d\.\d{5}/);
    expect(await page.getByTestId('umbmark-emax').innerText()).toMatch(/^\d+\.\d mm$/);
    expect(await page.getByTestId('corrected-left').innerText()).toMatch(/^\d+\.\d{2} mm$/);
    expect(await page.getByTestId('corrected-wheelbase').innerText()).toMatch(/^\d+\.\d mm$/);

    // Our own wheelbase: the runs are read again with it, and the corrected wheelbase follows (Eb × 520 mm).
    const ebText = await page.getByTestId('umbmark-eb').innerText();
    await page.getByLabel("Our robots' geometry differs from the nominal values").check();
    await page.getByLabel('Wheelbase (mm)').fill('520');
    await page.getByLabel('Wheelbase (mm)').blur();
    await expect.poll(() => page.getByTestId('umbmark-panel').innerText(), { timeout: 10_000 }).toContain('wheelbase 520 mm');
    const eb = Number((await page.getByTestId('umbmark-eb').innerText()).split(' ')[0]);
    expect(eb).toBeCloseTo(Number(ebText.split(' ')[0]), 5);
    expect(await page.getByTestId('corrected-wheelbase').innerText()).toBe(`${(eb * 520).toFixed(1)} mm`);

    // The sample poses: a1..a4 with intervals, and three residual plots.
    await page.getByLabel('Poses file (CSV)').setInputFiles({ name: 'sample-poses.csv', mimeType: 'text/csv', buffer: await sample('poses') });
    await page.getByTestId('alpha-panel').waitFor({ timeout: 60_000 });
    for (const a of ['a1', 'a2', 'a3', 'a4']) expect(await page.getByTestId(`alpha-${a}`).innerText()).toMatch(/\d/);
    expect(await page.getByTestId('alpha-table').innerText()).toMatch(/95 % interval/);
    // Every noise term keeps residuals to plot (the server thins them for the page, term by term).
    expect.soft(await page.getByText('No residuals of this term to plot.').count(), 'a noise term lost all its residuals').toBe(0);
    for (const c of ['rot1', 'trans', 'rot2']) {
      if (await page.getByTestId(`residual-plot-${c}`).count()) await expectDrawn(page, `residual-plot-${c}`);
    }
    await shot(page, 'fleet-new-results');
    await page.getByTestId('umbmark-panel').screenshot({ path: join(SCREENSHOTS, 'fleet-umbmark-panel.png') });
    await page.getByTestId('alpha-panel').screenshot({ path: join(SCREENSHOTS, 'fleet-alpha-panel.png') });

    await page.setViewportSize(PHONE);
    await expectDrawn(page, 'umbmark-plot');
    await expectNoSidewaysScroll(page);
    await shot(page, 'fleet-new-results-phone');
    await page.getByTestId('umbmark-panel').screenshot({ path: join(SCREENSHOTS, 'fleet-umbmark-panel-phone.png') });
    await page.getByTestId('alpha-panel').screenshot({ path: join(SCREENSHOTS, 'fleet-alpha-panel-phone.png') });
    await page.setViewportSize(DESKTOP);

    // Name and save → the profile page.
    await page.getByRole('button', { name: 'Save fleet profile' }).click();
    await page.getByText('Name the profile.').waitFor();
    await page.getByLabel('Profile name').fill(profileName);
    await page.getByRole('button', { name: 'Save fleet profile' }).click();
    await page.waitForURL((u) => /^\/employer\/fleet\/[0-9a-f-]{36}$/.test(u.pathname));
    profilePath = new URL(page.url()).pathname;
    await page.getByRole('heading', { level: 1, name: profileName }).waitFor();
    await expectDrawn(page, 'umbmark-plot');
    await expectDrawn(page, 'residual-plot-trans');
    const files = await page.getByTestId('fleet-files').innerText();
    expect(files).toContain('sample-runs.csv');
    expect(files).toContain('sample-poses.csv');

    // A source file downloads as it was uploaded.
    const runsLink = page.getByTestId('fleet-files').getByRole('link', { name: /sample-runs\.csv/ });
    const [download] = await Promise.all([page.waitForEvent('download'), runsLink.click()]);
    expect(download.suggestedFilename()).toBe('sample-runs.csv');

    // Assign a practice trial; only the tugger's trials are offered.
    await expect.poll(() => page.getByRole('checkbox').count()).toBeGreaterThan(0);
    expect(await page.getByLabel('Charging bay pass').count()).toBe(0);
    await page.getByLabel(TRIAL).check();
    await page.getByTestId('save-practice-trials').click();
    await page.getByRole('status').filter({ hasText: 'Saved' }).waitFor();
    await shot(page, 'fleet-profile');

    await page.setViewportSize(PHONE);
    await expectNoSidewaysScroll(page);
    await shot(page, 'fleet-profile-phone');
    await shot(page, 'fleet-profile-phone-top', false);
    await page.setViewportSize(DESKTOP);

    // The list shows it with its trial.
    await page.getByRole('link', { name: 'Fleet calibration' }).first().click();
    const row = page.locator(`tr[data-profile="${profileName}"]`);
    await row.waitFor();
    expect(await row.innerText()).toContain(TRIAL);
    expect(await row.innerText()).toContain('Active');
    await shot(page, 'fleet-list');
    await page.setViewportSize(PHONE);
    await expectNoSidewaysScroll(page);
    await shot(page, 'fleet-list-phone');

    expect(errors).toEqual([]);
    await page.close();
  });

  it("an operator of the organization practises on the fleet's drift; exams keep the standard profile", async () => {
    expect(profilePath).not.toBe('');
    const { page, errors } = await openPage(browser);
    await page.setViewportSize(DESKTOP);
    await signIn(page, demoEmail('operator1'));
    await page.goto(url('/operator/trials'));
    const section = page.getByTestId('fleet-practice');
    await section.waitFor();
    expect(await section.innerText()).toContain(profileName);
    await shot(page, 'fleet-operator-trials', false);

    await section.getByRole('link', { name: `Practise on ${profileName}: ${TRIAL}` }).click();
    await page.getByRole('heading', { level: 1, name: TRIAL }).waitFor();
    expect(await page.getByTestId('drift-profile-label').innerText()).toBe(`Fleet profile: ${profileName}`);
    expect(await page.getByTestId('briefing-fleet').innerText()).toContain('exam drive always uses the standard');
    await page.getByRole('button', { name: 'Start practice drive' }).click();
    await page.waitForURL((u) => u.pathname.startsWith('/operator/drives/'));
    await waitForConsole(page);
    expect(await page.getByTestId('drift-profile-label').innerText()).toBe(`Fleet profile: ${profileName}`);
    await shot(page, 'fleet-console', false);

    // Submitted, the drive's report names the fleet profile too.
    const attemptId = new URL(page.url()).pathname.split('/').pop()!;
    await page.getByRole('button', { name: 'Submit the drive' }).click();
    await page.getByRole('alertdialog').getByRole('button', { name: 'Submit the drive' }).click();
    await page.goto(url(`/attempts/${attemptId}/report`));
    await page.locator('[data-testid="attempt-report"][data-phase="ready"]').waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('drift-profile-label').innerText()).toBe(`Fleet profile: ${profileName}`);
    await shot(page, 'fleet-report', false);

    // An ordinary practice drive says it runs on the standard profile.
    await page.goto(url('/operator/trials'));
    await page.getByRole('link', { name: `Practice: ${TRIAL}` }).click();
    await page.getByRole('button', { name: 'Start practice drive' }).click();
    await page.waitForURL((u) => u.pathname.startsWith('/operator/drives/'));
    await waitForConsole(page);
    expect(await page.getByTestId('drift-profile-label').innerText()).toBe('Standard drift profile');

    expect(errors).toEqual([]);
    await page.close();
  });

  it('the employer archives the profile after a confirmation; its trial leaves the operator list', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('employer'));
    await page.goto(url(profilePath));
    await page.getByRole('heading', { level: 1, name: profileName }).waitFor();
    await page.getByRole('button', { name: 'Archive' }).click();
    const dialog = page.getByRole('alertdialog');
    await dialog.waitFor();
    await dialog.getByRole('button', { name: 'Archive' }).click();
    await expect.poll(() => page.getByTestId('fleet-profile-status').innerText()).toBe('Archived');
    // The dialog closes and the page offers no second archive.
    await expect.poll(() => page.getByRole('button', { name: 'Archive' }).count()).toBe(0);

    expect(errors).toEqual([]);
    await page.close();

    const operator = await openPage(browser);
    await signIn(operator.page, demoEmail('operator1'));
    const answer = operator.page.waitForResponse((r) => new URL(r.url()).pathname === '/api/fleet-practice');
    await operator.page.goto(url('/operator/trials'));
    const { items } = (await (await answer).json()) as { items: { fleetProfileName: string }[] };
    expect(items.map((i) => i.fleetProfileName)).not.toContain(profileName);
    await operator.page.getByRole('heading', { level: 2, name: 'All trials' }).waitFor();
    expect(await operator.page.getByTestId('fleet-practice').getByText(profileName).count()).toBe(0);
    // The drive already made on it keeps its profile's name in the recent drives.
    expect(await operator.page.getByText(`on ${profileName}`).count()).toBeGreaterThan(0);
    expect(operator.errors).toEqual([]);
    await operator.page.close();
  });
});
