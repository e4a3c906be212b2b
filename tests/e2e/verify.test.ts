/**
 * The public verification page in Chromium, signed out: a credential opened from its QR link,
 * the same credential once revoked, an unknown number, a mistyped one, a forged QR link and the
 * rate limit; then HR's bulk check of a small CSV file with the results downloaded as CSV.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { Credential } from '../../server/db/models';
import { createTestApp, resetRateLimits, signedInAgent, type TestApp } from '../support/api';
import { credentialHolder } from '../support/credentials';
import { SCREENSHOTS, demoEmail, launch, openPage, signIn, url, type Browser } from './browser';

let browser: Browser;
let t: TestApp;
let active: Credential;
let revoked: Credential;

// The browser runs with locale en-GB in UTC (tests/e2e/browser.ts): dates read like "1 Dec 2026".
const shortDate = (d: Date | string) => new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeZone: 'UTC' }).format(new Date(d));

beforeAll(async () => {
  t = createTestApp();
  await resetRateLimits(t.ctx);
  active = (await credentialHolder(t.ctx, 'Ilse Brønnum-Ødegård')).credential;
  revoked = (await credentialHolder(t.ctx, 'Tomasz Wójcik')).credential;
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
  await t?.close();
});

async function shot(page: Page, name: string) {
  await page.evaluate(() => document.fonts.ready);
  await page.screenshot({ path: join(SCREENSHOTS, `${name}.png`), fullPage: true, animations: 'disabled' });
}

/** The text of one line of the result ("Holder", "Status", …). */
const fact = async (page: Page, name: string) => (await page.getByTestId(`fact-${name}`).innerText()).trim();

describe('public verification page (signed out)', () => {
  it('shows an active credential opened from its QR link: holder as printed, level, dates, status and signatures', async () => {
    const { page, errors } = await openPage(browser);
    await page.goto(url(`/verify/${active.number}?s=${active.signature}`));

    await page.getByRole('heading', { level: 2, name: 'Active and genuine' }).waitFor();
    expect(await fact(page, 'number')).toBe(active.number);
    expect(await fact(page, 'holder')).toContain('Ilse Brønnum-Ødegård');
    expect(await fact(page, 'level')).toBe('Aisle operator');
    expect(await fact(page, 'organization')).toContain('Quillmoor');
    expect(await fact(page, 'issued')).toBe(shortDate(active.issuedAt));
    expect(await fact(page, 'expires')).toContain(shortDate(active.expiresAt));
    expect(await fact(page, 'status')).toBe('Active');
    expect(await fact(page, 'signature')).toMatch(/^Signature valid/);
    expect(await fact(page, 'qr')).toMatch(/^Matches/);
    // Nobody is signed in, and the safety caution is there.
    expect(await page.getByRole('button', { name: 'Sign out' }).count()).toBe(0);
    await page.getByRole('link', { name: 'Sign in' }).waitFor();
    await page.getByRole('note').filter({ hasText: 'Safety caution' }).waitFor();
    await shot(page, 'verify-active');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('shows the credential as revoked, with its date, once an assessor revokes it', async () => {
    const assessor = await signedInAgent(t.app, 'assessor');
    const answer = await assessor.post(`/api/credentials/${revoked.id}/revoke`).send({ reason: 'Exam conditions were not met on re-inspection.' }).expect(200);
    const revokedOn = shortDate(answer.body.credential.revokedAt);

    const { page, errors } = await openPage(browser);
    await page.goto(url(`/verify/${revoked.number}?s=${revoked.signature}`));
    await page.getByRole('heading', { level: 2, name: `Revoked on ${revokedOn}` }).waitFor();
    expect(await fact(page, 'status')).toBe(`Revoked on ${revokedOn}`);
    expect(await fact(page, 'holder')).toContain('Tomasz Wójcik');
    // The record itself is still genuine: the signature is valid, the status says it no longer counts.
    expect(await fact(page, 'signature')).toMatch(/^Signature valid/);
    await shot(page, 'verify-revoked');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('answers an unknown number with "No credential has this number." and nothing else', async () => {
    const { page, errors } = await openPage(browser);
    await page.goto(url('/verify'));
    await page.getByRole('heading', { level: 1, name: 'Verify a credential' }).waitFor();
    await page.getByLabel('Credential number').fill('dpc 0000 0000 0');
    await page.getByRole('button', { name: 'Verify' }).click();

    await page.waitForURL((u) => u.pathname === '/verify/DPC-0000-0000-0');
    const answer = page.getByTestId('not-found');
    await answer.getByRole('heading', { name: 'No credential has this number.' }).waitFor();
    expect((await answer.innerText()).replace(/\s+/g, ' ').trim()).toBe('No credential has this number. You checked DPC-0000-0000-0.');
    expect(await page.getByTestId('verification-result').count()).toBe(0);
    // The answer is announced and takes the focus after a check from the form.
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe('No credential has this number.');
    await shot(page, 'verify-not-found');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('says at once, without asking the server, that a mistyped number is not a number', async () => {
    const { page, errors } = await openPage(browser);
    const checks: string[] = [];
    page.on('request', (r) => r.url().includes('/api/verify/') && checks.push(r.url()));
    await page.goto(url('/verify'));
    await page.getByRole('heading', { level: 1, name: 'Verify a credential' }).waitFor();
    // One character of a real number changed: the check character catches it.
    const typo = active.number.slice(0, 4) + (active.number[4] === 'A' ? 'B' : 'A') + active.number.slice(5);
    await page.getByLabel('Credential number').fill(typo);
    await page.getByRole('button', { name: 'Verify' }).click();

    const error = page.getByTestId('number-error');
    await error.waitFor();
    expect(await error.innerText()).toMatch(/^That is not a valid credential number/);
    expect(await page.getByLabel('Credential number').getAttribute('aria-invalid')).toBe('true');
    expect(new URL(page.url()).pathname).toBe('/verify');
    expect(checks).toEqual([]);
    await shot(page, 'verify-invalid');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('warns when the QR link carries a signature that is not the one on record', async () => {
    const { page, errors } = await openPage(browser);
    const forged = active.signature.slice(0, -4) + (active.signature.endsWith('AAAA') ? 'BBBB' : 'AAAA');
    await page.goto(url(`/verify/${active.number}?s=${forged}`));
    await page.getByRole('heading', { level: 2, name: 'The QR link does not match the record' }).waitFor();
    expect(await fact(page, 'qr')).toMatch(/^Does not match/);
    expect(await fact(page, 'status')).toBe('Active');
    await shot(page, 'verify-forged-link');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('tells a visitor who checks too often to wait, and checks again when asked', async () => {
    const { page } = await openPage(browser);
    // The limit itself (60 a minute) is tested against the API; here the page's answer to it.
    let limited = true;
    await page.route('**/api/verify/**', (route) =>
      limited
        ? route.fulfill({ status: 429, contentType: 'application/json', body: JSON.stringify({ error: { code: 'rate_limited', message: 'Too many checks from your network. Wait a minute and try again.' } }) })
        : route.continue(),
    );
    await page.goto(url(`/verify/${active.number}`));
    const message = page.getByTestId('rate-limited');
    await message.getByText('Too many checks from your network. Wait a minute and try again.').waitFor();
    await shot(page, 'verify-rate-limited');
    limited = false;
    await message.getByRole('button', { name: 'Try again' }).click();
    await page.getByRole('heading', { level: 2, name: 'Active and genuine' }).waitFor();
    expect(await fact(page, 'qr')).toMatch(/^Not compared/);
    await page.close();
  });
});

describe('HR bulk verification', () => {
  it('checks a small CSV file, shows each row, and downloads the results as CSV', async () => {
    await resetRateLimits(t.ctx);
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('hr'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Bulk check' }).click();
    await page.getByRole('heading', { level: 1, name: 'Bulk verification' }).waitFor();

    // A file the server refuses: the reason is shown.
    await page.getByLabel('CSV file of credential numbers').setInputFiles({ name: 'wrong.csv', mimeType: 'text/csv', buffer: Buffer.from('id,who\n1,2\n') });
    await page.getByRole('button', { name: 'Check the numbers' }).click();
    await page.getByTestId('bulk-failure').getByText('The file needs a header with a "number" column').waitFor();

    const csv = [
      'number,name',
      `${active.number},ilse brønnum-ødegård`,
      `${active.number.toLowerCase()},Someone Else`,
      `${revoked.number},Tomasz Wójcik`,
      'DPC-0000-0000-0,Nobody Known',
      '',
    ].join('\n');
    await page.getByLabel('CSV file of credential numbers').setInputFiles({ name: 'staff.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    await page.getByRole('button', { name: 'Check the numbers' }).click();

    await page.getByRole('heading', { level: 2, name: 'Results for staff.csv' }).waitFor();
    expect(await page.getByTestId('bulk-summary').innerText()).toBe('4 rows checked: 1 valid, 1 not found, 1 revoked, 1 name differs.');
    expect(await page.getByTestId('bulk-failure').count()).toBe(0);
    const table = page.getByTestId('bulk-results');
    const rowOf = async (line: number) =>
      (await table.getByRole('row').filter({ has: page.getByRole('cell', { name: String(line), exact: true }) }).innerText()).replace(/\s+/g, ' ');
    expect(await rowOf(2)).toMatch(/Valid .*Yes Active Ilse Brønnum-Ødegård .*Yes Aisle operator .*Valid/);
    expect(await rowOf(3)).toMatch(/Name differs .*Someone Else No/);
    expect(await rowOf(4)).toMatch(/Revoked .*Yes Revoked Tomasz Wójcik/);
    expect(await rowOf(5)).toMatch(/Not found DPC-0000-0000-0 No/);
    await shot(page, 'verify-bulk');

    // Only the rows that need attention.
    await page.getByLabel('Only rows that are not valid').check();
    expect(await table.getByRole('row').count()).toBe(1 + 3);

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download results (CSV)' }).click()]);
    expect(download.suggestedFilename()).toMatch(/^staff-checked-\d{4}-\d{2}-\d{2}\.csv$/);
    const saved = readFileSync((await download.path())!, 'utf8');
    const lines = saved.trim().split(/\r\n/);
    expect(lines[0]).toBe('line,number,name,found,status,holder_name,level,expires_at,name_matches,signature_valid');
    expect(lines[1]).toBe(`2,${active.number},ilse brønnum-ødegård,yes,active,Ilse Brønnum-Ødegård,Aisle operator,${active.expiresAt.toISOString().slice(0, 10)},yes,yes`);
    expect(lines[4]).toBe('5,DPC-0000-0000-0,Nobody Known,no,,,,,,');
    expect(errors).toEqual([]);
    await page.close();
  });
});
