/**
 * The assessor's review in a real browser: two exam drives of the wash bay (a trial whose exam
 * drives always go to an assessor) driven by the scripted operator over HTTP; the queue with its
 * filters, a claim, the replay (play, pause, scrub, jump to a call) and a confirm; then an amend of
 * a call's grade with a reason, seen in the report, the audit log and by the operator.
 */
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AttemptReport } from '../../shared/schemas';
import { SCREENSHOTS, baseUrl, demoEmail, demoPassword, launch, navLinks, openPage, signIn, url, type Browser } from './browser';
import { ApiSession, closeSettled, reportOf, submittedDrive } from './review-helpers';

let browser: Browser;
let operator: ApiSession;
let confirmId: string;
let amendId: string;
let amendReport: AttemptReport;

beforeAll(async () => {
  browser = await launch();
  operator = await ApiSession.signIn(baseUrl(), demoEmail('operator1'), demoPassword());
  confirmId = await submittedDrive(operator, 'wash-bay-crossing', 'exam', () => 'proceed');
  amendId = await submittedDrive(operator, 'wash-bay-crossing', 'exam', (markers) => (markers.length ? 'reanchor' : 'creep'));
  await reportOf(operator, confirmId);
  amendReport = await reportOf(operator, amendId);
});

afterAll(async () => {
  await browser?.close();
});

const position = async (page: Page) => Number(await page.getByTestId('replay-timeline').getAttribute('data-position'));

async function until(check: () => Promise<boolean>, what: string, timeout = 10_000) {
  const end = Date.now() + timeout;
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`Timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

/** Picks an option of a PrimeVue Select found by its label. */
async function choose(page: Page, label: string, option: string) {
  await page.getByRole('combobox', { name: label }).click();
  await page.getByRole('option', { name: option, exact: true }).click();
}

async function signVerdict(page: Page) {
  await page.getByTestId('sign-verdict').click();
  const dialog = page.getByRole('alertdialog', { name: 'Sign this verdict?' });
  await dialog.waitFor();
  await dialog.getByRole('button', { name: 'Sign', exact: true }).click();
}

describe("the assessor's review", () => {
  it('the operator sees a provisional report while the exam drive waits for an assessor', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('operator1'));
    await page.goto(url(`/attempts/${confirmId}/report`));
    await page.locator('[data-testid="attempt-report"][data-phase="ready"]').waitFor();
    expect(await page.getByTestId('review-panel').getAttribute('data-status')).toBe('awaiting');
    expect(await page.getByTestId('review-panel').innerText()).toContain('Provisional result');
    expect(await page.getByTestId('result').innerText()).toContain('Provisional');
    expect(await page.getByTestId('calls-table').innerText()).toContain('Unsafe');
    expect(errors).toEqual([]);
    await closeSettled(page);
  });

  it('finds the attempts in the queue, filters it, claims one, replays it and confirms the score', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('assessor'));
    expect(await navLinks(page)).toEqual(['Home', 'Review queue', 'Credentials']);
    expect(await page.getByTestId('open-reviews').innerText()).toMatch(/^\d+ exam attempts? open for review/);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review queue' }).click();
    await page.getByRole('heading', { level: 1, name: 'Review queue' }).waitFor();

    const queue = page.getByTestId('review-queue');
    const row = (id: string) => queue.locator('tbody tr', { has: page.locator(`a[href="/assessor/reviews/${id}"]`) });
    await row(confirmId).waitFor();
    await row(amendId).waitFor();

    // Filters: by trial (kept in the address), then by age: nothing is five hours old yet.
    await choose(page, 'Trial', 'Wash bay crossing');
    await until(async () => new URL(page.url()).searchParams.get('trial') === 'wash-bay-crossing', `the trial in the address (${page.url()})`);
    await row(confirmId).waitFor();
    const age = page.getByLabel('Waiting at least');
    await age.click();
    await age.pressSequentially('5');
    await age.press('Tab');
    await page.getByText('No attempts match these filters.').waitFor();
    await until(async () => new URL(page.url()).searchParams.get('minAge') === '5', 'the age in the address');
    await page.getByRole('button', { name: 'Clear filters' }).click();
    await row(confirmId).waitFor();
    expect(await age.inputValue()).toBe('');

    // A filtered queue opened from a link shows those filters; the navigation link shows them all again.
    await page.goto(url('/assessor/reviews?minAge=5&trial=wash-bay-crossing'));
    await page.getByText('No attempts match these filters.').waitFor();
    expect(await age.inputValue()).toBe('5 h');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review queue' }).click();
    await row(confirmId).waitFor();
    expect(await age.inputValue()).toBe('');
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: join(SCREENSHOTS, 'review-queue.png'), fullPage: true, animations: 'disabled' });

    // Claim → the workspace.
    await row(confirmId).getByRole('button', { name: /^Claim/ }).click();
    await page.waitForURL((u) => u.pathname === `/assessor/reviews/${confirmId}`);
    await page.locator('[data-testid="review-workspace"][data-status="in_review"]').waitFor();
    expect(await page.getByTestId('review-status').innerText()).toContain('In review');

    // Replay: play at 16×, pause, scrub back and forth, jump to a call.
    await page.getByRole('button', { name: 'Speed 16 times' }).click();
    await page.getByTestId('replay-play').click();
    await until(async () => (await position(page)) > 40, 'the replay to move on');
    await page.getByTestId('replay-play').click();
    const paused = await position(page);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(await position(page)).toBe(paused);
    expect(await page.getByTestId('replay-timeline').getAttribute('data-playing')).toBe('false');

    const scrub = page.getByTestId('replay-scrub');
    await scrub.fill('120');
    expect(await position(page)).toBe(120);
    await scrub.fill('15');
    expect(await position(page)).toBe(15);
    expect(Number(await page.getByTestId('replay-readout').getAttribute('data-time'))).toBeGreaterThan(0);
    // The keyboard moves the slider one step at a time.
    await scrub.focus();
    await page.keyboard.press('ArrowRight');
    expect(await position(page)).toBe(16);

    await page.getByRole('button', { name: 'Call 2: South door of the wash bay: go there' }).click();
    const atCall = await position(page);
    expect(atCall).toBeGreaterThan(16);
    await until(async () => !(await page.getByText('rebuilding the drift cloud').isVisible()), 'the drift cloud');
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: join(SCREENSHOTS, 'review-replay.png'), fullPage: true, animations: 'disabled' });

    // Confirm with a reason.
    await page.getByRole('radio', { name: /^Confirm/ }).check();
    await page.getByLabel('Reason (optional)').fill('Replay matches the scored calls; the door call was unsafe.');
    await signVerdict(page);
    await page.locator('[data-testid="review-workspace"][data-status="confirmed"]').waitFor();
    await page.getByTestId('audit-log').getByText('Signed: confirmed').waitFor();
    expect(await page.getByTestId('review-panel').innerText()).toContain('Final result, confirmed');
    expect(await page.getByTestId('review-reason').innerText()).toBe('Replay matches the scored calls; the door call was unsafe.');
    const audit = await page.getByTestId('audit-log').innerText();
    expect(audit).toContain('Claimed for review');
    expect(audit).toContain('Signed: confirmed');
    expect(await page.getByTestId('verdict-panel').count()).toBe(0);
    await page.screenshot({ path: join(SCREENSHOTS, 'review-confirmed.png'), fullPage: true, animations: 'disabled' });
    expect(errors).toEqual([]);
    await closeSettled(page);
  });

  it('amends a call’s grade with a reason; the report and the audit log show it', async () => {
    const south = amendReport.score.calls.find((c) => c.callPointId === 'wash-bay-south-door')!;
    const newGrade = south.grade === 'acceptable' ? 'Risky' : 'Acceptable';
    const reason = 'Marker glare made the wash bay marker unreadable at the door.';

    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('assessor'));
    await page.goto(url(`/assessor/reviews/${amendId}`));
    await page.locator('[data-testid="review-workspace"][data-status="awaiting"]').waitFor();
    await page.getByTestId('claim').click();
    await page.locator('[data-testid="review-workspace"][data-status="in_review"]').waitFor();

    // A void needs its reason; nothing is sent without it.
    await page.getByRole('radio', { name: /^Void/ }).check();
    await page.getByTestId('sign-verdict').click();
    await page.getByText('Write the reason in at least 10 characters.').waitFor();
    expect(await page.getByLabel('Reason for voiding (required)').getAttribute('aria-invalid')).toBe('true');

    await page.getByRole('radio', { name: /^Amend/ }).check();
    // Nothing ticked yet: the form says what is missing, before anything is sent.
    await page.getByTestId('sign-verdict').click();
    await page.getByText('Amend at least one thing.').waitFor();

    const callRow = page.getByTestId('amend-call-wash-bay-south-door');
    await callRow.getByRole('checkbox').check();
    await choose(page, 'New grade', newGrade);
    await page.getByTestId('sign-verdict').click();
    await callRow.getByText('Write the reason in at least 10 characters.').waitFor();
    await callRow.getByLabel('Reason for this change').fill(reason);
    expect(await page.getByTestId('amend-preview').innerText()).toContain('With these changes');
    await page.screenshot({ path: join(SCREENSHOTS, 'review-amend-form.png'), fullPage: true, animations: 'disabled' });
    await signVerdict(page);

    await page.locator('[data-testid="review-workspace"][data-status="amended"]').waitFor();
    await page.getByTestId('audit-log').getByText('Signed: amended').waitFor();
    expect(await page.getByTestId('amendments').innerText()).toContain(reason);
    const audit = await page.getByTestId('audit-log').innerText();
    expect(audit).toContain('Changed a call’s grade');
    expect(audit).toContain('at South door of the wash bay');
    expect(audit).toContain(reason);
    expect(audit).toContain('Signed: amended');
    const southRow = page.getByTestId('calls-table').locator('tbody tr', { hasText: 'South door of the wash bay' });
    expect(await southRow.locator('[data-grade]').first().innerText()).toContain(newGrade);
    await southRow.getByTestId('engine-grade').waitFor();
    await page.screenshot({ path: join(SCREENSHOTS, 'review-amended.png'), fullPage: true, animations: 'disabled' });

    // Signed reviews are listed under "Signed".
    await page.goto(url('/assessor/reviews?status=signed'));
    await page.getByTestId('review-queue').locator(`a[href="/assessor/reviews/${amendId}"]`).waitFor();
    expect(errors).toEqual([]);
    await closeSettled(page);
  });

  it('the operator sees the final, amended report with the assessor’s reason', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('operator1'));
    await page.goto(url(`/attempts/${amendId}/report`));
    await page.locator('[data-testid="attempt-report"][data-phase="ready"]').waitFor();
    expect(await page.getByTestId('review-panel').getAttribute('data-status')).toBe('amended');
    const panel = await page.getByTestId('review-panel').innerText();
    expect(panel).toContain('Final result, amended');
    expect(panel).toContain('Priya Castellane');
    expect(panel).toContain('Marker glare made the wash bay marker unreadable at the door.');
    const southRow = page.getByTestId('calls-table').locator('tbody tr', { hasText: 'South door of the wash bay' });
    await southRow.getByTestId('engine-grade').waitFor();
    expect(['Passed', 'Not passed']).toContain((await page.getByTestId('result').innerText()).trim());
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: join(SCREENSHOTS, 'report-amended.png'), fullPage: true, animations: 'disabled' });

    // The confirmed one is final too.
    await page.goto(url(`/attempts/${confirmId}/report`));
    await page.locator('[data-testid="attempt-report"][data-phase="ready"]').waitFor();
    expect(await page.getByTestId('review-panel').getAttribute('data-status')).toBe('confirmed');
    expect(await page.getByTestId('result').innerText()).toContain('Not passed');
    expect(errors).toEqual([]);
    await closeSettled(page);
  });
});
