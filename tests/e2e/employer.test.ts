/**
 * The employer's way through Driftproof in a real browser: a company signs up and confirms its
 * e-mail from the link, buys seats on the payment stand-in's page (a declined card on a second
 * order), enrols two operators from a CSV roster, and one of them joins from the invitation and
 * lands on the operator home. Then the administrator's side: prices, orders, a refund refused
 * for seats in use, a refund and a grant.
 */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, demoEmail, demoPassword, launch, openPage, signIn, submitSignIn, url, type Browser } from './browser';

const TEST_CARDS = { succeeds: '4242 4242 4242 4242', declined: '4000 0000 0000 0002' };

const stamp = Date.now().toString(36);
const company = {
  organizationName: `Brackwater Cold Store ${stamp}`,
  name: 'Ines Halvorsen',
  email: `ines.${stamp}@brackwater.example.test`,
  password: 'odometry-drifts-on-ice',
};
const operators = [
  { email: `cara.lind.${stamp}@brackwater.example.test`, name: 'Cara Lind', levels: 'aisle-operator;floor-and-dock' },
  { email: `dev.orme.${stamp}@brackwater.example.test`, name: 'Dev Orme', levels: 'drift-judgement' },
];

let browser: Browser;

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

// ---------------------------------------------------------------------------------------
// The mail sink, read through the admin API (the same messages the Mail sink page shows)

let adminCookie = '';

async function adminFetch(path: string): Promise<Response> {
  if (!adminCookie) {
    const res = await fetch(url('/api/auth/sign-in'), {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: demoEmail('admin'), password: demoPassword() }),
    });
    expect(res.status).toBe(200);
    adminCookie = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  }
  return fetch(url(path), { headers: { cookie: adminCookie, accept: 'application/json' } });
}

/**
 * The path and query of the link containing `linkPart` in the newest e-mail to `to`, once at least
 * `count` such e-mails have arrived (a new link retires the earlier ones, so the test waits for it).
 */
async function linkFromMail(to: string, linkPart: string, count = 1): Promise<string> {
  const pattern = new RegExp(`https?://[^\\s"<>]*${linkPart.replace(/[?&]/g, '\\$&')}[^\\s"<>]*`);
  for (let attempt = 0; attempt < 60; attempt++) {
    const list = (await (await adminFetch(`/api/mail-messages?q=${encodeURIComponent(to)}&pageSize=20`)).json()) as {
      items: { id: number }[];
    };
    const links: string[] = [];
    for (const { id } of list.items) {
      const { message } = (await (await adminFetch(`/api/mail-messages/${id}`)).json()) as { message: { text: string | null } };
      const found = pattern.exec(message.text ?? '');
      if (found) links.push(found[0]);
    }
    if (links.length >= count) {
      const link = new URL(links[0].replace(/&amp;/g, '&'));
      return `${link.pathname}${link.search}`;
    }
    // Mail arrives a moment later (invitations go out through the job queue).
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`Fewer than ${count} e-mails to ${to} with a link containing ${linkPart}`);
}

// ---------------------------------------------------------------------------------------

async function pay(page: Page, card: string) {
  await page.getByRole('heading', { name: /^Pay / }).waitFor();
  await page.getByLabel('Card number').fill(card);
  await page.getByRole('button', { name: 'Pay' }).click();
}

async function startOrder(page: Page, quantity: number) {
  await page.goto(url('/employer/seats/buy'));
  await page.getByRole('heading', { level: 1, name: 'Buy seats' }).waitFor();
  const input = page.getByLabel('Number of seats');
  await input.fill(String(quantity));
  await page.getByTestId('price-total').waitFor();
}

describe('employer', () => {
  it('a company signs up, confirms its e-mail from the link and buys seats; a declined card adds none', async () => {
    const { page, errors } = await openPage(browser);
    await page.goto(url('/'));
    await page.getByRole('link', { name: 'Sign up your company' }).first().click();
    await page.getByRole('heading', { level: 1, name: 'Sign up your company' }).waitFor();

    // The shared schema checks the form in the browser first.
    await page.getByRole('button', { name: 'Create the organization' }).click();
    await page.getByText('Enter the organization name.').waitFor();
    await page.getByText('Use at least 10 characters.').waitFor();

    await page.getByLabel('Organization name').fill(company.organizationName);
    await page.getByLabel('Your name').fill(company.name);
    await page.getByLabel('Work e-mail').fill(company.email);
    await page.getByLabel('Password', { exact: true }).fill(company.password);
    await page.getByRole('button', { name: 'Create the organization' }).click();
    await page.getByRole('heading', { level: 1, name: 'Check your e-mail' }).waitFor();
    expect(await page.getByTestId('signup-done').innerText()).toContain(company.organizationName);
    await shot(page, 'employer-signup-done');

    // Signed in already; until the address is confirmed, buying is held back and the banner says why.
    await page.getByRole('link', { name: 'Go to your employer home' }).click();
    await page.getByRole('heading', { level: 1, name: 'Employer home' }).waitFor();
    await page.getByTestId('confirm-email-banner').waitFor();
    expect(await page.getByTestId('seat-balance').innerText()).toContain('0');
    await startOrder(page, 2);
    expect(await page.getByRole('button', { name: 'Continue to payment' }).isDisabled()).toBe(true);
    await page.getByRole('button', { name: 'Send a new link' }).click();
    await page.getByText('A new confirmation link is on its way.').waitFor();

    // The link from the newest e-mail (the second one) confirms the address.
    await page.goto(url(await linkFromMail(company.email, '/confirm-email?token=', 2)));
    await page.getByRole('heading', { level: 1, name: 'Your e-mail is confirmed' }).waitFor();
    await shot(page, 'employer-email-confirmed');
    await page.getByRole('link', { name: 'Go to your home page' }).click();
    await page.getByRole('heading', { level: 1, name: 'Employer home' }).waitFor();
    expect(await page.getByTestId('confirm-email-banner').count()).toBe(0);

    // 12 seats: the 10-seat tier's price, live as the quantity changes (demo pricing: 44.00 from 10 seats).
    await startOrder(page, 12);
    await page.getByTestId('price-total').getByText('€528.00').waitFor();
    expect(await page.getByTestId('price-quote').innerText()).toContain('€44.00');
    await shot(page, 'employer-buy-seats');
    await page.getByRole('button', { name: 'Continue to payment' }).click();
    await pay(page, TEST_CARDS.succeeds);
    await page.waitForURL((u) => u.pathname.startsWith('/employer/orders/') && u.searchParams.get('checkout') === 'success');
    await page.getByRole('heading', { name: 'Paid — 12 seats added' }).waitFor();
    expect(await page.getByTestId('order-balance').innerText()).toBe('12 seats');
    await shot(page, 'employer-order-paid');

    // A second order with the declined card: the stand-in refuses it; going back adds nothing.
    await startOrder(page, 3);
    await page.getByRole('button', { name: 'Continue to payment' }).click();
    await pay(page, TEST_CARDS.declined);
    await page.getByRole('alert').getByText('Your card was declined.').waitFor();
    await page.getByRole('link', { name: 'Cancel and go back' }).click();
    await page.waitForURL((u) => u.searchParams.get('checkout') === 'cancelled');
    await page.getByRole('heading', { name: 'Payment cancelled' }).waitFor();
    await shot(page, 'employer-order-cancelled');

    await page.goto(url('/employer/seats'));
    expect(await page.getByTestId('seats-balance').innerText()).toBe('12 seats');
    const ledger = await page.getByTestId('seat-ledger').innerText();
    expect(ledger).toContain('+12');
    expect(ledger).toContain('Bought');
    // Going back from the payment page gave the checkout up: the order is settled as not paid.
    await page.getByRole('table').first().getByText('Not paid (expired)').waitFor();
    await shot(page, 'employer-seats');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('enrols two operators from a CSV roster: a preview with errors blocks the import, a good one imports', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, company.email, company.password);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Enrol' }).click();
    await page.getByRole('heading', { level: 1, name: 'Enrol operators' }).waitFor();
    await page.getByText('aisle-operator').first().waitFor();
    const template = await page.getByRole('link', { name: 'Download a template (CSV)' }).getAttribute('href');
    expect(decodeURIComponent(template!.split(',').slice(1).join(','))).toMatch(/^email,name,levels\r\n/);

    const fileInput = page.getByLabel('Roster file (CSV)');
    const header = 'email,name,levels';
    const rows = operators.map((o) => `${o.email},${o.name},${o.levels}`);

    // A level typo and a bad address: the preview shows the errors per row and nothing can be imported.
    await fileInput.setInputFiles({
      name: 'roster-with-errors.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from([header, rows[0], 'not-an-address,Nobody,', `x.${stamp}@brackwater.example.test,Lev Typo,aisle-operater`].join('\n')),
    });
    const preview = page.getByTestId('roster-preview');
    await preview.getByText('rows have errors').waitFor();
    expect(await preview.innerText()).toContain('No level "aisle-operater".');
    expect(await page.getByRole('button', { name: 'Import 1 operator' }).isDisabled()).toBe(true);
    await shot(page, 'employer-roster-errors');

    // The good roster: two new operators.
    await fileInput.setInputFiles({ name: 'roster.csv', mimeType: 'text/csv', buffer: Buffer.from([header, ...rows].join('\r\n') + '\r\n') });
    await preview.getByText('2 new to invite').waitFor();
    expect(await preview.getByRole('row').filter({ hasText: operators[0].email }).innerText()).toContain('New');
    await shot(page, 'employer-roster-preview');
    await page.getByRole('button', { name: 'Import 2 operators' }).click();
    await page.getByTestId('roster-result').getByText('Imported: 2 operators invited').waitFor();
    await shot(page, 'employer-roster-imported');

    // The dashboard lists both, invited, with their levels; search narrows the table on the server.
    await page.getByRole('link', { name: 'See your operators and their progress' }).click();
    await page.getByRole('heading', { level: 1, name: 'Employer home' }).waitFor();
    const table = page.getByRole('table', { name: 'Operators and their progress' });
    const cara = table.getByRole('row').filter({ hasText: operators[0].email });
    await cara.waitFor();
    const caraText = await cara.innerText();
    expect(caraText).toContain('Invited');
    expect(caraText).toContain('0/2 trials');
    expect(caraText).toContain('Not assigned'); // drift judgement
    expect(await page.getByTestId('seat-balance').innerText()).toContain('12');
    await shot(page, 'employer-dashboard');
    await page.getByLabel('Search operators').fill('Dev Orme');
    await cara.waitFor({ state: 'detached' });
    await table.getByRole('row').filter({ hasText: operators[1].email }).waitFor();

    // Levels for Dev: add the first level.
    await page.getByRole('button', { name: 'Levels for Dev Orme' }).click();
    const dialog = page.getByRole('dialog', { name: 'Levels for Dev Orme' });
    await dialog.getByLabel('Aisle operator').check();
    await dialog.getByRole('button', { name: 'Save levels' }).click();
    await page.getByText('Levels saved for Dev Orme').waitFor();
    const csv = await page.request.get(url(await page.getByRole('link', { name: 'Download as CSV' }).getAttribute('href') ?? ''));
    expect(await csv.text()).toContain(`Dev Orme,${operators[1].email},invited,assigned; 0/2 trials`);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('keeps the organization profile and enrols one operator by form, with the server’s answers on the fields', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, company.email, company.password);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Organization' }).click();
    await page.getByRole('heading', { level: 1, name: 'Organization profile' }).waitFor();
    const billing = page.getByLabel('Billing e-mail (optional)');
    await billing.fill('accounts at brackwater');
    await page.getByRole('button', { name: 'Save profile' }).click();
    await page.locator('#org-billing-email-error').getByText('Enter a valid e-mail address.').waitFor();
    await billing.fill(`accounts.${stamp}@brackwater.example.test`);
    await page.getByLabel('Address (optional)').fill('Quay 4\nBrackwater');
    await page.getByRole('button', { name: 'Save profile' }).click();
    await page.getByText('Organization profile saved').waitFor();
    await page.reload();
    expect(await page.getByLabel('Billing e-mail (optional)').inputValue()).toBe(`accounts.${stamp}@brackwater.example.test`);

    await page.goto(url('/employer/enrol'));
    await page.getByLabel('Full name').fill('Someone Else');
    await page.getByLabel('E-mail', { exact: true }).fill(demoEmail('operator1'));
    await page.getByRole('button', { name: 'Enrol and invite' }).click();
    // The server refuses an operator of another organization; its message sits on the e-mail field.
    await page.locator('#enrol-email-error').getByText('another organization').waitFor();
    await page.getByLabel('E-mail', { exact: true }).fill(`eli.${stamp}@brackwater.example.test`);
    await page.getByLabel('Full name').fill('Eli Brandt');
    await page.getByLabel('Floors and docking').check();
    await page.getByRole('button', { name: 'Enrol and invite' }).click();
    await page.getByTestId('enrol-done').getByText('Eli Brandt is enrolled.').waitFor();
    expect(errors).toEqual([]);
    await page.close();
  });

  it('an invited operator joins from the e-mail link and lands on the operator home', async () => {
    const invitation = await linkFromMail(operators[0].email, '&invited=1');
    const { page, errors } = await openPage(browser);
    await page.goto(url(invitation));
    await page.getByRole('heading', { level: 1, name: 'Welcome to Driftproof' }).waitFor();
    await page.getByLabel('Your password').fill('cara-reads-the-drift');
    await page.getByLabel('Type it again').fill('cara-reads-the-drift');
    await page.getByRole('button', { name: 'Save my password' }).click();
    await page.getByText('Your password is set. Sign in to start using Driftproof.').waitFor();
    await submitSignIn(page, operators[0].email, 'cara-reads-the-drift');
    await page.waitForURL((u) => u.pathname === '/operator');
    await page.getByRole('heading', { level: 1, name: 'Operator home' }).waitFor();
    await shot(page, 'employer-operator-joined');

    // Cara starts an exam drive: one of the organization's seats is now in use.
    const start = await page.request.post(url('/api/attempts'), { data: { trialId: 'long-aisle-run', mode: 'exam' } });
    expect(start.status()).toBe(201);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('the employer sees the operator joined and a seat used', async () => {
    const { page } = await openPage(browser);
    await signIn(page, company.email, company.password);
    const row = page.getByRole('table', { name: 'Operators and their progress' }).getByRole('row').filter({ hasText: operators[0].email });
    await row.getByText('Joined').waitFor();
    expect(await page.getByTestId('seat-balance').innerText()).toContain('11');
    await page.close();
  });
});

describe('administrator', () => {
  it('sees the prices, refuses a refund of seats in use with the reason, refunds two and grants three', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('admin'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Pricing' }).click();
    await page.getByRole('heading', { level: 1, name: 'Seat pricing' }).waitFor();
    await page.getByRole('row', { name: /10–49 seats/ }).getByText('€44.00').waitFor();
    await shot(page, 'admin-pricing');
    // The shared schema refuses a tier from one seat (that is the base price); undo, then save as it was.
    await page.getByLabel('From seats').first().fill('1');
    await page.getByRole('button', { name: 'Save prices' }).click();
    await page.getByText('From 2 seats at the least').waitFor();
    await page.getByRole('button', { name: 'Undo changes' }).click();
    await page.getByText('From 2 seats at the least').waitFor({ state: 'detached' });
    await page.getByRole('button', { name: 'Save prices' }).click();
    await page.getByText('Seat prices saved').waitFor();

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Orders' }).click();
    await page.getByRole('heading', { level: 1, name: 'Seat orders' }).waitFor();
    const order = page.getByRole('row').filter({ hasText: company.organizationName }).filter({ hasText: '€528.00' });
    await order.waitFor();
    await order.getByRole('button', { name: /^Refund seats/ }).click();
    const dialog = page.getByRole('dialog', { name: 'Refund seats' });
    await dialog.getByLabel('Seats to refund').fill('12');
    await dialog.getByRole('button', { name: 'Refund', exact: true }).click();
    // One seat is in use by the exam drive: the server says how many can go back.
    await dialog.getByTestId('refund-error').getByText('At most 11 seats of this order can be refunded').waitFor();
    await shot(page, 'admin-refund-refused', false);
    await dialog.getByLabel('Seats to refund').fill('2');
    await dialog.getByRole('button', { name: 'Refund', exact: true }).click();
    await page.getByText('2 seats refunded').waitFor();
    await order.getByText('Partly refunded').waitFor();

    await page.getByRole('combobox', { name: 'Organization', exact: true }).click();
    await page.getByRole('option', { name: company.organizationName }).click();
    await page.getByLabel('Seats', { exact: true }).fill('3');
    await page.getByRole('button', { name: 'Grant seats' }).click();
    await page.getByRole('button', { name: 'Grant 3 seats' }).click();
    // 12 bought − 1 exam drive − 2 refunded + 3 granted
    await page.getByText('Its balance is now 12 seats.').waitFor();
    await shot(page, 'admin-orders');
    expect(errors).toEqual([]);
    await page.close();
  });
});
