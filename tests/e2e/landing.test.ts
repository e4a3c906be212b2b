/** The public landing page: what a visitor who is not signed in sees at `/`. */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SCREENSHOTS, demoEmail, launch, openPage, signIn, url, type Browser } from './browser';

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

describe('landing page', () => {
  it('explains Driftproof, lists the levels and the seat prices, and links onwards', async () => {
    const { page, errors } = await openPage(browser);
    await page.goto(url('/'));
    await page.getByRole('heading', { level: 1, name: /Certify the judgement of people who drive robots/ }).waitFor();

    // Levels come from the API, in their order, with their trials.
    const levels = page.getByTestId('landing-levels');
    await levels.waitFor();
    const levelText = await levels.innerText();
    expect(levelText.indexOf('Aisle operator')).toBeLessThan(levelText.indexOf('Floors and docking'));
    expect(levelText).toContain('Long aisle run');
    expect(levelText).toContain('Valid for 24 months');

    // Seat prices from the admin's settings (demo pricing: 49.00, 44.00 from 10, 39.00 from 50).
    const prices = page.getByTestId('landing-prices');
    await prices.waitFor();
    const priceText = await prices.innerText();
    expect(priceText).toContain('1–9 seats');
    expect(priceText).toContain('€49.00');
    expect(priceText).toContain('50 seats or more');

    for (const section of ['How a drive is scored', 'Levels', 'Seat prices', 'Checking a credential']) {
      await page.getByRole('heading', { level: 2, name: section }).waitFor();
    }
    expect(await page.getByRole('note').filter({ hasText: 'Safety caution' }).count()).toBe(1);
    expect(await page.getByRole('link', { name: 'Verify a credential' }).first().getAttribute('href')).toBe('/verify');
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: join(SCREENSHOTS, 'landing.png'), fullPage: true, animations: 'disabled' });

    // The section links move focus to their sections; sign-in is one click away.
    await page.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: 'Prices' }).click();
    expect(new URL(page.url()).hash).toBe('#prices');
    await page.getByRole('link', { name: 'Sign in', exact: true }).first().click();
    await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
    expect(errors).toEqual([]);
    await page.close();
  });

  it('fits a phone screen', async () => {
    const { page, errors } = await openPage(browser);
    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto(url('/'));
    await page.getByTestId('landing-prices').waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: join(SCREENSHOTS, 'landing-phone.png'), fullPage: true, animations: 'disabled' });
    expect(errors).toEqual([]);
    await page.close();
  });

  it('sends a signed-in person from / to their home', async () => {
    const { page } = await openPage(browser);
    await signIn(page, demoEmail('hr'));
    await page.goto(url('/'));
    await page.waitForURL((u) => u.pathname === '/hr');
    await page.close();
  });
});
