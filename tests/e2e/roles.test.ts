import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  SCREENSHOTS,
  demoEmail,
  demoPassword,
  launch,
  navLinks,
  openPage,
  signIn,
  signOut,
  submitSignIn,
  url,
  type Browser,
} from './browser';

const ACCOUNTS = [
  { account: 'admin', home: '/admin', heading: 'Administrator home', role: 'Administrator', nav: ['Home', 'Users', 'Orders', 'Pricing', 'Credentials', 'Mail sink'], safety: false },
  { account: 'employer', home: '/employer', heading: 'Employer home', role: 'Employer', nav: ['Home', 'Enrol', 'Seats', 'Fleet calibration', 'Credentials', 'Organization'], safety: true },
  { account: 'hr', home: '/hr', heading: 'HR home', role: 'HR', nav: ['Home', 'Verify', 'Bulk check', 'Credentials'], safety: true },
  { account: 'assessor', home: '/assessor', heading: 'Assessor home', role: 'Assessor', nav: ['Home', 'Review queue', 'Credentials'], safety: false },
  { account: 'operator1', home: '/operator', heading: 'Operator home', role: 'Operator', nav: ['Home', 'Trials', 'Credentials'], safety: true },
  { account: 'operator2', home: '/operator', heading: 'Operator home', role: 'Operator', nav: ['Home', 'Trials', 'Credentials'], safety: true },
] as const;

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

describe('each demo account', () => {
  for (const account of ACCOUNTS) {
    it(`${account.account}: signs in to the ${account.heading}, sees only its links, signs out`, async () => {
      const { page, errors } = await openPage(browser);

      await signIn(page, demoEmail(account.account));

      expect(new URL(page.url()).pathname).toBe(account.home);
      await page.getByRole('heading', { level: 1, name: account.heading }).waitFor();
      expect(await navLinks(page)).toEqual([...account.nav]);
      const who = await page.getByTestId('signed-in-as').innerText();
      expect(who).toContain(account.role);
      expect(await page.getByRole('note').filter({ hasText: 'Safety caution' }).count()).toBe(account.safety ? 1 : 0);

      // Give web fonts a moment so the screenshot shows the real typeface.
      await page.evaluate(() => document.fonts.ready);
      await page.screenshot({ path: join(SCREENSHOTS, `${account.account}.png`), fullPage: true, animations: 'disabled' });

      await signOut(page);
      await page.getByText('You are signed out.').waitFor();

      // The session is really gone: the home page now asks for sign-in.
      await page.goto(url(account.home));
      await page.waitForURL((u) => u.pathname === '/sign-in');
      expect(errors).toEqual([]);
      await page.close();
    });
  }
});

describe('signing in', () => {
  it('shows the server message for a wrong password and stays on sign-in', async () => {
    const { page, errors } = await openPage(browser);
    await page.goto(url('/sign-in'));

    await submitSignIn(page, demoEmail('hr'), 'not-the-right-password');

    const alert = page.getByTestId('sign-in-error');
    await alert.waitFor();
    expect(await alert.innerText()).toContain('That e-mail and password do not match an account.');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await page.screenshot({ path: join(SCREENSHOTS, 'sign-in-wrong-password.png'), animations: 'disabled' });
    expect(errors).toEqual([]);
    await page.close();
  });

  it('checks the form in the browser before sending it', async () => {
    const { page } = await openPage(browser);
    await page.goto(url('/sign-in'));

    await submitSignIn(page, 'not-an-address', '');

    await page.getByText('Enter a valid e-mail address.').waitFor();
    await page.getByText('Enter your password.').waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');

    // The show/hide control is a keyboard-reachable button.
    const password = page.getByLabel('Password', { exact: true });
    await password.fill('visible-now');
    await password.press('Tab');
    await page.getByRole('button', { name: 'Show password' }).press('Enter');
    expect(await password.getAttribute('type')).toBe('text');
    await page.getByRole('button', { name: 'Hide password' }).click();
    expect(await password.getAttribute('type')).toBe('password');
    await page.close();
  });

  it('sends an anonymous visitor to sign-in and back to the page they wanted', async () => {
    const { page, errors } = await openPage(browser);

    await page.goto(url('/admin/users'));
    await page.waitForURL((u) => u.pathname === '/sign-in' && u.searchParams.get('redirect') === '/admin/users');
    await page.getByText('Sign in to open that page.').waitFor();

    await submitSignIn(page, demoEmail('admin'), demoPassword());

    await page.waitForURL((u) => u.pathname === '/admin/users');
    await page.getByRole('heading', { level: 1, name: 'Users' }).waitFor();
    await signOut(page);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('sends a signed-in user from a page of another role to their own home, with a notice', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('operator1'));

    await page.goto(url('/admin/mail'));

    await page.waitForURL((u) => u.pathname === '/operator');
    await page.getByText('That page is for Administrator accounts.').waitFor();
    await page.goto(url('/sign-in'));
    await page.waitForURL((u) => u.pathname === '/operator');
    await signOut(page);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('shows a not-found page for an unknown address', async () => {
    const { page } = await openPage(browser);
    await page.goto(url('/no/such/page'));
    await page.getByRole('heading', { level: 1, name: 'Page not found' }).waitFor();
    await page.getByRole('link', { name: 'Go to sign in' }).click();
    await page.waitForURL((u) => u.pathname === '/sign-in');
    await page.close();
  });

  it('always gives the same answer to a forgotten-password request', async () => {
    const { page, errors } = await openPage(browser);
    await page.goto(url('/sign-in'));
    await page.getByRole('link', { name: 'Forgotten password?' }).click();
    await page.getByRole('heading', { level: 1, name: 'Forgotten password' }).waitFor();

    await page.getByLabel('E-mail').fill('nobody-here@example.test');
    await page.getByRole('button', { name: 'Send reset link' }).click();

    await page.getByText('If an account exists for that e-mail, a reset link is on its way.').waitFor();
    expect(errors).toEqual([]);
    await page.close();
  });

  it('explains an incomplete password link', async () => {
    const { page } = await openPage(browser);
    await page.goto(url('/reset-password?token=short'));
    await page.getByRole('heading', { level: 1, name: 'This link is incomplete' }).waitFor();
    await page.getByRole('link', { name: 'Request a new link' }).waitFor();
    await page.close();
  });
});

describe('at phone width', () => {
  it('keeps the navigation behind a menu button and everything reachable', async () => {
    const { page, errors } = await openPage(browser);
    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto(url('/sign-in'));
    await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
    await page.screenshot({ path: join(SCREENSHOTS, 'phone-sign-in.png'), animations: 'disabled' });

    await signIn(page, demoEmail('admin'));
    await page.getByRole('heading', { level: 1, name: 'Administrator home' }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Main' });
    expect(await nav.isVisible()).toBe(false);

    await page.getByRole('button', { name: 'Menu' }).click();
    await nav.waitFor();
    await page.screenshot({ path: join(SCREENSHOTS, 'phone-admin-menu.png'), animations: 'disabled' });
    await nav.getByRole('link', { name: 'Users' }).click();
    await page.getByRole('heading', { level: 1, name: 'Users' }).waitFor();
    expect(await nav.isVisible()).toBe(false);
    await page.getByRole('table').getByText(demoEmail('operator1')).waitFor();
    // The page itself does not scroll sideways; only the table does, inside its frame.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await page.screenshot({ path: join(SCREENSHOTS, 'phone-admin-users.png'), fullPage: true, animations: 'disabled' });

    await page.getByRole('button', { name: 'Menu' }).click();
    await signOut(page);
    expect(errors).toEqual([]);
    await page.close();
  });
});
