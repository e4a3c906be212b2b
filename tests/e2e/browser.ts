/**
 * Browser helpers for the e2e tests: Debian's chromium driven by playwright-core, a fresh
 * profile under the git-ignored .data/ folder, and sign-in through the real form.
 */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';
import { DEMO_DOMAIN } from '../../server/db/seeders/0001-demo-organization';

export const ROOT = resolve(import.meta.dirname, '../..');
export const SCREENSHOTS = join(ROOT, '.data/screenshots');

export const baseUrl = () => inject('baseUrl');
export const demoPassword = () => inject('demoPassword');
export const demoEmail = (account: string) => `${account}@${DEMO_DOMAIN}`;

export interface Browser {
  context: BrowserContext;
  close(): Promise<void>;
}

export async function launch(): Promise<Browser> {
  const tmp = join(ROOT, '.data/tmp');
  mkdirSync(tmp, { recursive: true });
  mkdirSync(SCREENSHOTS, { recursive: true });
  const profile = mkdtempSync(join(tmp, 'chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
    env: { ...process.env, TMPDIR: tmp },
    viewport: { width: 1280, height: 860 },
    locale: 'en-GB',
    timezoneId: 'UTC',
  });
  context.setDefaultTimeout(15_000);
  return {
    context,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** A new page that records uncaught script errors, so a test can insist there were none. */
export async function openPage(browser: Browser): Promise<{ page: Page; errors: string[] }> {
  // Each test starts signed out, whatever the one before it left behind.
  await browser.context.clearCookies();
  const page = await browser.context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (error) => errors.push(error.message));
  return { page, errors };
}

export function url(path: string): string {
  return new URL(path, baseUrl()).toString();
}

/** Fills and sends the sign-in form (the page must show it). */
export async function submitSignIn(page: Page, email: string, password: string): Promise<void> {
  await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

export async function signIn(page: Page, email: string, password = demoPassword()): Promise<void> {
  await page.goto(url('/sign-in'));
  await submitSignIn(page, email, password);
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}

/** The labels of the links in the main navigation, in order. */
export async function navLinks(page: Page): Promise<string[]> {
  const nav = page.getByRole('navigation', { name: 'Main' });
  await nav.waitFor();
  return (await nav.getByRole('link').allInnerTexts()).map((text) => text.trim());
}

export async function signOut(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((u) => u.pathname === '/sign-in');
  await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
}
