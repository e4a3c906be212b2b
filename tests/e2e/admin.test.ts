import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { DEMO_ORGANIZATION } from '../../server/db/seeders/0001-demo-organization';
import { SCREENSHOTS, demoEmail, launch, openPage, signIn, signOut, submitSignIn, url, type Browser } from './browser';

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

/** Opens a PrimeVue Select by its label and picks an option (the list opens at the page's end). */
async function choose(page: Page, scope: Locator, label: string, option: string) {
  await scope.getByRole('combobox', { name: label, exact: true }).click();
  await page.getByRole('option', { name: option, exact: true }).click();
}

const stamp = Date.now().toString(36);
const newUser = { name: `Rosa Quintero ${stamp}`, email: `rosa.${stamp}@example.test`, password: 'wheel-slip-on-wet-floors' };

describe('administrator', () => {
  let invitationPath = '';

  it('creates a user in the Users page and sees it in the table', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('admin'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Users' }).click();
    await page.getByRole('heading', { level: 1, name: 'Users' }).waitFor();
    const table = page.getByRole('table');
    await table.getByText(demoEmail('operator2')).waitFor();
    await page.locator('.p-datatable-mask').waitFor({ state: 'detached' });
    await page.screenshot({ path: join(SCREENSHOTS, 'admin-users.png'), fullPage: true, animations: 'disabled' });

    await page.getByRole('button', { name: 'New user' }).click();
    const dialog = page.getByRole('dialog', { name: 'New user' });
    await dialog.waitFor();

    // The shared schema checks the form in the browser first.
    await dialog.getByRole('button', { name: 'Create user' }).click();
    await dialog.getByText('Enter a name.').waitFor();

    await dialog.getByLabel('Full name').fill(newUser.name);
    await dialog.getByLabel('E-mail').fill(newUser.email);
    await choose(page, dialog, 'Role', 'Operator');
    // Operators belong to an organization: the choice appears only now.
    await choose(page, dialog, 'Organization', DEMO_ORGANIZATION);
    await page.screenshot({ path: join(SCREENSHOTS, 'admin-new-user.png'), animations: 'disabled' });
    await dialog.getByRole('button', { name: 'Create user' }).click();

    await page.getByText(`Account created for ${newUser.name}`).waitFor();
    await dialog.waitFor({ state: 'hidden' });

    const row = table.getByRole('row').filter({ hasText: newUser.email });
    await row.waitFor();
    // Searching narrows the table down to the new account (server-side filtering).
    await page.getByLabel('Search').fill(newUser.email);
    await table.getByText(demoEmail('operator2')).waitFor({ state: 'detached' });
    expect(await row.innerText()).toContain(newUser.name);
    expect(await row.innerText()).toContain('Active');
    expect(await table.getByRole('row').count()).toBe(2); // the header and the one match

    // The same e-mail again is refused, and the message sits on the e-mail field.
    await page.getByRole('button', { name: 'New user' }).click();
    await dialog.getByLabel('Full name').fill('Someone Else');
    await dialog.getByLabel('E-mail').fill(newUser.email);
    await choose(page, dialog, 'Role', 'Assessor');
    await dialog.getByRole('button', { name: 'Create user' }).click();
    await dialog.locator('#new-user-email-error').waitFor();
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    expect(errors).toEqual([]);
    await page.close();
  });

  it('finds the invitation in the mail sink', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('admin'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Mail sink' }).click();
    await page.getByRole('heading', { level: 1, name: 'Mail sink' }).waitFor();

    await page.getByLabel('Search').fill(newUser.email);
    // Invitations go out from the job queue, so the message may land a moment later: refresh until
    // the search answers with it (one invitation) before picking the row.
    for (let i = 0; i < 20 && !(await page.getByText('1–1 of 1').isVisible()); i++) {
      await page.waitForTimeout(500);
      await page.getByRole('button', { name: 'Refresh' }).click();
    }
    await page.getByText('1–1 of 1').waitFor();
    const row = page.getByRole('row').filter({ hasText: newUser.email });
    await row.click();

    const detail = page.getByRole('region', { name: 'Selected message' });
    await detail.getByText(newUser.email).first().waitFor();
    const frame = detail.locator('iframe');
    if ((await frame.count()) > 0) expect(await frame.getAttribute('sandbox')).toBe('');
    const link = detail.getByRole('link').filter({ hasText: 'reset-password?token=' }).first();
    const href = await link.getAttribute('href');
    expect(href).toContain('invited=1');
    const target = new URL(href!);
    invitationPath = `${target.pathname}${target.search}`;
    await page.screenshot({ path: join(SCREENSHOTS, 'admin-mail-sink.png'), fullPage: true, animations: 'disabled' });
    await signOut(page);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('the new person chooses a password from the invitation and signs in; the link then no longer works', async () => {
    expect(invitationPath).not.toBe('');
    const { page, errors } = await openPage(browser);

    await page.goto(url(invitationPath));
    await page.getByRole('heading', { level: 1, name: 'Welcome to Driftproof' }).waitFor();
    await page.screenshot({ path: join(SCREENSHOTS, 'invitation.png'), animations: 'disabled' });
    await page.getByLabel('Your password').fill('too-short');
    await page.getByLabel('Type it again').fill('too-short');
    await page.getByRole('button', { name: 'Save my password' }).click();
    await page.getByText('Use at least 10 characters.').waitFor();

    await page.getByLabel('Your password').fill(newUser.password);
    await page.getByLabel('Type it again').fill(newUser.password);
    await page.getByRole('button', { name: 'Save my password' }).click();

    await page.waitForURL((u) => u.pathname === '/sign-in');
    await page.getByText('Your password is set. Sign in to start using Driftproof.').waitFor();
    await submitSignIn(page, newUser.email, newUser.password);
    await page.waitForURL((u) => u.pathname === '/operator');
    await page.getByRole('heading', { level: 1, name: 'Operator home' }).waitFor();
    await signOut(page);

    await page.goto(url(invitationPath));
    await page.getByLabel('Your password').fill('another-long-password');
    await page.getByLabel('Type it again').fill('another-long-password');
    await page.getByRole('button', { name: 'Save my password' }).click();
    await page.getByRole('heading', { level: 1, name: 'This link no longer works' }).waitFor();
    await page.getByRole('link', { name: 'Request a new link' }).waitFor();
    expect(errors).toEqual([]);
    await page.close();
  });

  it('changes the role after confirming, asking for an organization when the new role needs one', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('admin'));
    await page.goto(url('/admin/users'));
    await page.getByLabel('Search').fill(newUser.email);
    const row = page.getByRole('row').filter({ hasText: newUser.email });
    await page.getByRole('table').getByText(demoEmail('operator2')).waitFor({ state: 'detached' });

    // Operator → Assessor: confirmed, and the organization goes.
    await choose(page, row, `Role of ${newUser.name}`, 'Assessor');
    const confirm = page.getByRole('alertdialog');
    await confirm.getByText('from Operator to Assessor').waitFor();
    await confirm.getByRole('button', { name: 'Make Assessor' }).click();
    await page.getByText(`${newUser.name} now has the Assessor role`).waitFor();
    await row.getByText(DEMO_ORGANIZATION).waitFor({ state: 'detached' });

    // Assessor → HR: HR accounts belong to an organization, so one must be chosen first.
    await choose(page, row, `Role of ${newUser.name}`, 'HR');
    const dialog = page.getByRole('dialog', { name: 'Choose an organization' });
    await dialog.getByRole('button', { name: 'Make HR' }).click();
    await dialog.getByText('Choose the organization this account belongs to.').waitFor();
    await choose(page, dialog, 'Organization', DEMO_ORGANIZATION);
    await dialog.getByRole('button', { name: 'Make HR' }).click();
    await page.getByText(`${newUser.name} now has the HR role`).waitFor();
    await row.getByText(DEMO_ORGANIZATION).waitFor();
    expect(errors).toEqual([]);
    await page.close();
  });

  it('deactivates the account after confirming, and the person can no longer sign in', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('admin'));
    await page.goto(url('/admin/users'));
    await page.getByLabel('Search').fill(newUser.email);
    const row = page.getByRole('row').filter({ hasText: newUser.email });
    await row.waitFor();

    await row.getByRole('button', { name: `Deactivate ${newUser.name}` }).click();
    const confirm = page.getByRole('alertdialog');
    await confirm.getByText('They can no longer sign in').waitFor();
    await confirm.getByRole('button', { name: 'Deactivate' }).click();
    await page.getByText(`${newUser.name} is deactivated`).waitFor();
    await row.getByText('Deactivated').waitFor();

    // Their own row: no role change and no deactivation for the signed-in admin.
    await page.getByLabel('Search').fill(demoEmail('admin'));
    const own = page.getByRole('row').filter({ hasText: demoEmail('admin') });
    await own.getByText('You', { exact: true }).waitFor();
    expect(await own.getByRole('button', { name: /Deactivate/ }).isDisabled()).toBe(true);
    await signOut(page);

    await submitSignIn(page, newUser.email, newUser.password);
    const alert = page.getByTestId('sign-in-error');
    await alert.waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(errors).toEqual([]);
    await page.close();
  });
});
