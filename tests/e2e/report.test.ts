/**
 * The attempt report in a real browser: reached from the operator's drives, waiting politely while
 * the drive is scored, the map, calls, pins, chart, outcome and score, the print view, and the
 * employer reading a report of their organization.
 */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SCREENSHOTS, baseUrl, demoEmail, demoPassword, launch, openPage, signIn, url, type Browser } from './browser';
import { ApiSession, closeSettled, reportOf, submittedDrive } from './review-helpers';

let browser: Browser;
let attemptId: string;

beforeAll(async () => {
  browser = await launch();
  const operator = await ApiSession.signIn(baseUrl(), demoEmail('operator2'), demoPassword());
  // A practice drive needs no review: its report is final at once.
  attemptId = await submittedDrive(operator, 'long-aisle-run', 'practice', (markers) => (markers.length ? 'reanchor' : 'creep'));
  await reportOf(operator, attemptId);
});

afterAll(async () => {
  await browser?.close();
});

describe('the attempt report', () => {
  it('the operator opens it from their drives and reads every part of it', async () => {
    const { page, errors } = await openPage(browser);
    // Console errors other than answers the app expects (401 before sign-in).
    const consoleErrors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) consoleErrors.push(m.text());
    });
    await signIn(page, demoEmail('operator2'));
    await page.getByTestId('recent-drives').getByRole('link', { name: 'Report of Long aisle run' }).first().click();
    await page.waitForURL((u) => u.pathname === `/attempts/${attemptId}/report`);
    await page.locator('[data-testid="attempt-report"][data-phase="ready"]').waitFor();

    await page.getByRole('heading', { level: 1, name: 'Attempt report' }).waitFor();
    expect(await page.getByTestId('review-panel').getAttribute('data-status')).toBe('not_required');
    expect(await page.getByTestId('review-panel').innerText()).toContain('Final result');
    expect(['Passed', 'Not passed']).toContain((await page.getByTestId('result').innerText()).trim());

    // Calls: one row per call, each grade as a word (not a colour only), risks as percentages.
    const rows = page.getByTestId('calls-table').locator('tbody tr');
    expect(await rows.count()).toBeGreaterThan(0);
    const first = await rows.first().innerText();
    expect(first).toMatch(/\d+\.\d %/);
    expect(first).toMatch(/Sound|Acceptable|Over-cautious|Risky|Unsafe/);

    // Highlighting a call on the map, with the keyboard.
    const numberButton = page.getByRole('button', { name: 'Call 1: show on the map' });
    await numberButton.focus();
    await page.keyboard.press('Enter');
    expect(await numberButton.getAttribute('aria-pressed')).toBe('true');
    expect(Number(await page.getByTestId('drive-map').getAttribute('data-zoom'))).toBeGreaterThan(20);

    // The uncertainty chart is drawn by chart.js, with its figures as a table too.
    await page.getByTestId('uncertainty-chart').locator('canvas').waitFor();
    await page.getByText('The figures as a table').click();
    expect(await page.locator('details.figures tbody tr').count()).toBeGreaterThan(2);

    await page.getByTestId('outcome').waitFor();
    expect(await page.getByTestId('score-breakdown').innerText()).toContain('Pass mark');
    expect(await page.getByRole('note').filter({ hasText: 'Safety caution' }).count()).toBe(1);

    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: join(SCREENSHOTS, 'report-operator.png'), fullPage: true, animations: 'disabled' });

    // On a phone-sized window the map and the chart still fit.
    await page.setViewportSize({ width: 390, height: 844 });
    await page.waitForTimeout(300);
    const mapBox = (await page.getByTestId('drive-map').boundingBox())!;
    expect(mapBox.width).toBeLessThanOrEqual(390);
    expect(mapBox.height).toBeGreaterThan(150);
    await page.screenshot({ path: join(SCREENSHOTS, 'report-narrow.png'), fullPage: true, animations: 'disabled' });
    expect(consoleErrors).toEqual([]);
    expect(errors).toEqual([]);
    await closeSettled(page);
  });

  it('Print calls the browser’s print, and the print view drops the navigation and the buttons', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('operator2'));
    await page.goto(url(`/attempts/${attemptId}/report`));
    await page.locator('[data-testid="attempt-report"][data-phase="ready"]').waitFor();
    await page.evaluate(() => {
      (window as unknown as { printed: number }).printed = 0;
      window.print = () => {
        (window as unknown as { printed: number }).printed += 1;
      };
    });
    await page.getByRole('button', { name: 'Print' }).click();
    expect(await page.evaluate(() => (window as unknown as { printed: number }).printed)).toBe(1);

    await page.emulateMedia({ media: 'print' });
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
    expect(await page.getByText('Driftproof · attempt report · printed').isVisible()).toBe(true);
    await page.getByRole('heading', { level: 1, name: 'Attempt report' }).waitFor();
    await page.screenshot({ path: join(SCREENSHOTS, 'report-print.png'), fullPage: true, animations: 'disabled' });
    await page.emulateMedia({ media: 'screen' });
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(true);
    expect(errors).toEqual([]);
    await closeSettled(page);
  });

  it('while the drive is being scored it says so and asks again by itself', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('operator2'));
    let asked = 0;
    await page.route(`**/api/attempts/${attemptId}/report`, async (route) => {
      asked += 1;
      if (asked <= 2) {
        await route.fulfill({ status: 409, json: { error: { code: 'scoring', message: 'The drive is being scored. The report will be ready in a moment.' } } });
      } else {
        await route.continue();
      }
    });
    await page.goto(url(`/attempts/${attemptId}/report`));
    await page.getByTestId('report-scoring').waitFor();
    expect(await page.getByTestId('report-scoring').innerText()).toContain('Scoring the drive');
    await page.screenshot({ path: join(SCREENSHOTS, 'report-scoring.png'), animations: 'disabled' });
    await page.locator('[data-testid="attempt-report"][data-phase="ready"]').waitFor({ timeout: 10_000 });
    expect(asked).toBe(3);
    expect(errors).toEqual([]);
    await closeSettled(page);
  });

  it('the employer reads the report of one of their operators; another operator cannot', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('employer'));
    await page.goto(url(`/attempts/${attemptId}/report`));
    await page.locator('[data-testid="attempt-report"][data-phase="ready"]').waitFor();
    expect(await page.locator('.page-header').innerText()).toContain('Long aisle run');
    await page.getByRole('link', { name: 'Employer home' }).waitFor();

    await page.waitForLoadState('networkidle');
    await page.context().clearCookies();
    await signIn(page, demoEmail('operator1'));
    await page.goto(url(`/attempts/${attemptId}/report`));
    await page.locator('[data-testid="attempt-report"][data-phase="failed"]').waitFor();
    expect(await page.getByTestId('attempt-report').innerText()).toContain('The report could not be loaded');
    expect(errors).toEqual([]);
    await closeSettled(page);
  });
});
