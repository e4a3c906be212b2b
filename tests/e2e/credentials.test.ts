/**
 * The credentials pages in Chromium: an operator's own credentials and certificate, HR's list of
 * the organization's credentials with its filters, and an administrator revoking one with a reason.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { User, type Credential } from '../../server/db/models';
import { createTestApp, resetRateLimits, type TestApp } from '../support/api';
import { credentialHolder } from '../support/credentials';
import { SCREENSHOTS, demoEmail, launch, openPage, signIn, url, type Browser } from './browser';

let browser: Browser;
let t: TestApp;
let holder: { user: User; credential: Credential };
let soon: Credential;
let old: Credential;
const DAY = 86_400_000;
const shortDate = (d: Date | string) => new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeZone: 'UTC' }).format(new Date(d));

beforeAll(async () => {
  t = createTestApp();
  await resetRateLimits(t.ctx);
  holder = await credentialHolder(t.ctx, 'Nadia Kowalczyk');
  // The demo operator's password, so the holder can sign in.
  const demo = await User.findOne({ where: { email: demoEmail('operator1') } });
  await holder.user.update({ passwordHash: demo!.passwordHash });
  // Valid 24 months: issued 710 days ago it expires in about 20 days; issued three years ago it has expired.
  soon = (await credentialHolder(t.ctx, 'Rune Halvorsen', new Date(Date.now() - 710 * DAY))).credential;
  old = (await credentialHolder(t.ctx, 'Old Timer', new Date(Date.now() - 3 * 365 * DAY))).credential;
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

const rowOf = (page: Page, number: string) => page.getByTestId('credentials-table').getByRole('row').filter({ hasText: number });

describe('operator', () => {
  it('sees their credential on their home and in full, and downloads the certificate', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, holder.user.email);
    const mine = page.getByTestId('my-credentials');
    await mine.getByText(holder.credential.number, { exact: true }).waitFor();
    expect(await mine.getByTestId('credential-status').innerText()).toBe('Active');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Credentials' }).click();
    await page.getByRole('heading', { level: 1, name: 'Your credentials' }).waitFor();
    const card = page.getByTestId('credential-card');
    await card.getByRole('heading', { name: 'Aisle operator' }).waitFor();
    await card.getByText('Trials passed (2)').click();
    await card.getByText('Long aisle run').waitFor();
    await page.getByRole('note').filter({ hasText: 'Safety caution' }).waitFor();
    await shot(page, 'credentials-operator');

    const [download] = await Promise.all([page.waitForEvent('download'), card.getByRole('link', { name: /Certificate \(PDF\)/ }).click()]);
    expect(download.suggestedFilename()).toBe(`driftproof-${holder.credential.number}.pdf`);
    expect(readFileSync((await download.path())!).subarray(0, 5).toString()).toBe('%PDF-');
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe('HR', () => {
  it("lists the organization's credentials with status and expiring-soon filters", async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('hr'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Credentials' }).click();
    await page.getByRole('heading', { level: 1, name: 'Credentials of your organization' }).waitFor();
    await rowOf(page, old.number).waitFor();
    expect(await rowOf(page, old.number).getByTestId('credential-status').innerText()).toBe('Expired');
    expect((await rowOf(page, soon.number).innerText()).replace(/\s+/g, ' ')).toMatch(/in (19|20|21) days/);
    // HR may check a credential but not download the certificate or revoke.
    expect(await rowOf(page, soon.number).getByRole('link', { name: /PDF/ }).count()).toBe(0);
    expect(await rowOf(page, soon.number).getByRole('button', { name: /Revoke/ }).count()).toBe(0);

    await page.getByRole('combobox', { name: 'Status' }).click();
    await page.getByRole('option', { name: 'Expired', exact: true }).click();
    await page.waitForURL((u) => u.searchParams.get('status') === 'expired');
    await rowOf(page, old.number).waitFor();
    expect(await rowOf(page, soon.number).count()).toBe(0);

    await page.getByRole('button', { name: 'Clear filters' }).click();
    await page.getByLabel('Active and expiring within 60 days').check();
    await page.waitForURL((u) => u.searchParams.get('expiring') === '1');
    await rowOf(page, soon.number).waitFor();
    expect(await rowOf(page, old.number).count()).toBe(0);
    expect(await rowOf(page, holder.credential.number).count()).toBe(0);
    await shot(page, 'credentials-hr-expiring');

    // The details of a row: the trials behind it.
    await rowOf(page, soon.number).getByRole('button', { name: `Details of ${soon.number}` }).click();
    await page.getByTestId(`details-${soon.number}`).getByText('Rack-end slalom').waitFor();

    // HR home: counts and the expiring list.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Home' }).click();
    await page.getByTestId('expiring-soon').getByText(soon.number).waitFor();
    await page.getByTestId('credential-counts').getByText(/expiring within 60 days/).waitFor();
    await shot(page, 'credentials-hr-home');
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe('administrator', () => {
  it('revokes a credential with a written reason; the list and the public check then say revoked', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('admin'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Credentials' }).click();
    await page.getByRole('heading', { level: 1, name: 'Credentials' }).waitFor();
    await page.getByLabel('Search').fill(holder.credential.number.toLowerCase());
    const row = rowOf(page, holder.credential.number);
    await row.waitFor();
    expect(await page.getByTestId('credentials-table').getByRole('row').count()).toBe(2);

    await row.getByRole('button', { name: `Revoke ${holder.credential.number}` }).click();
    const dialog = page.getByRole('dialog', { name: 'Revoke credential' });
    await dialog.getByText('Nadia Kowalczyk').waitFor();
    await dialog.getByLabel('Reason').fill('Too short');
    await dialog.getByRole('button', { name: 'Revoke credential' }).click();
    await dialog.getByText('Write the reason in at least 10 characters.').waitFor();
    await dialog.getByLabel('Reason').fill('The exam drives were taken with help from a colleague.');
    await shot(page, 'credentials-admin-revoke');
    await dialog.getByRole('button', { name: 'Revoke credential' }).click();
    await dialog.waitFor({ state: 'hidden' });
    await page.getByText(`${holder.credential.number} is revoked`).waitFor();

    const today = shortDate(new Date());
    expect(await row.getByTestId('credential-status').innerText()).toBe(`Revoked on ${today}`);
    expect(await row.getByRole('button', { name: /Revoke/ }).count()).toBe(0);
    await row.getByRole('button', { name: `Details of ${holder.credential.number}` }).click();
    await page.getByTestId(`details-${holder.credential.number}`).getByText('The exam drives were taken with help from a colleague.').waitFor();
    await shot(page, 'credentials-admin');

    // The public check, from the row's link.
    await row.getByRole('link', { name: /^Check/ }).click();
    await page.getByRole('heading', { level: 2, name: `Revoked on ${today}` }).waitFor();
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe('a page for the signed-in only', () => {
  it('sends a visitor to sign in first', async () => {
    const { page } = await openPage(browser);
    await page.goto(url('/credentials'));
    await page.waitForURL((u) => u.pathname === '/sign-in' && u.searchParams.get('redirect') === '/credentials');
    await page.close();
  });
});
