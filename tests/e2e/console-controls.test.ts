/**
 * The console's other controls in a real Chromium: a gamepad (a stand-in for the Gamepad API,
 * injected before the page loads) drives into a rack; the contact notice stays until
 * acknowledged; the bumper needs a stop or a reverse; the emergency stop; abandoning a drive.
 */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SCREENSHOTS, demoEmail, launch, openPage, signIn, type Browser } from './browser';
import { counters, readPose, startPractice, until } from './console-helpers';

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

declare global {
  interface Window {
    __testPad: { axes: number[]; buttons: { pressed: boolean; touched: boolean; value: number }[] };
  }
}

describe('the drive console with a gamepad', () => {
  it('drives with the sticks into a rack: contact notice, bumper, emergency stop, abandon', async () => {
    const { page, errors } = await openPage(browser);
    await page.addInitScript(() => {
      const pad = {
        id: 'Test pad (STANDARD GAMEPAD Vendor: 0000 Product: 0000)',
        index: 0,
        connected: true,
        mapping: 'standard',
        timestamp: 0,
        axes: [0, 0, 0, 0],
        buttons: Array.from({ length: 17 }, () => ({ pressed: false, touched: false, value: 0 })),
        vibrationActuator: null,
      };
      window.__testPad = pad;
      Object.defineProperty(navigator, 'getGamepads', { value: () => [pad, null, null, null], configurable: true });
    });
    const stick = (axes: number[]) => page.evaluate((a) => (window.__testPad.axes = a), axes);
    const button = (index: number, pressed: boolean) =>
      page.evaluate(([i, p]) => (window.__testPad.buttons[i as number] = { pressed: p as boolean, touched: p as boolean, value: p ? 1 : 0 }), [index, pressed]);

    await signIn(page, demoEmail('operator2'));
    await startPractice(page, 'Long aisle run');

    // Keyboard reach: Tab goes from the map's view buttons to the map itself, with a visible focus ring.
    await page.getByRole('button', { name: 'Pan east' }).focus();
    await page.keyboard.press('Tab');
    const focused = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement;
      const style = getComputedStyle(el);
      return { label: el.getAttribute('aria-label'), outline: style.outlineStyle, width: parseFloat(style.outlineWidth) };
    });
    expect(focused.label).toMatch(/^Site map/);
    expect(focused.outline).not.toBe('none');
    expect(focused.width).toBeGreaterThanOrEqual(2);
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    await page.screenshot({ path: join(SCREENSHOTS, 'console-focus.png'), animations: 'disabled' });
    // The map keys work from anywhere on the console: zoom in with "+".
    const zoomBefore = Number(await page.getByTestId('site-map').getAttribute('data-zoom'));
    await page.keyboard.press('Equal');
    expect(Number(await page.getByTestId('site-map').getAttribute('data-zoom'))).toBeGreaterThan(zoomBefore);

    const status = page.getByTestId('gamepad-status');
    await status.getByText('connected').waitFor();
    expect(await status.innerText()).toContain('Test pad');

    // A resting stick inside the dead zone does not start the drive.
    await stick([0.05, -0.1, 0, 0]);
    await page.waitForTimeout(400);
    expect((await counters(page)).queued).toBe(0);

    // Left stick up: forward, until past the west end of rack A.
    await stick([0, -1, 0, 0]);
    await until(async () => (await readPose(page)).x > 11, 20_000, 'the robot to pass x = 11');
    // Stick right as well: the robot turns clockwise into rack A.
    await stick([0.8, -1, 0, 0]);
    const notice = page.getByTestId('contact-notice');
    await notice.waitFor({ timeout: 20_000 });
    expect(await notice.innerText()).toContain('Rack row A');
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: join(SCREENSHOTS, 'console-contact.png'), animations: 'disabled' });

    // The notice stays: Escape does not close it, only the button does.
    await page.keyboard.press('Escape');
    await page.waitForTimeout(300);
    expect(await notice.isVisible()).toBe(true);
    await stick([0, 0, 0, 0]);
    await page.getByRole('button', { name: 'I understand' }).click();
    await notice.waitFor({ state: 'hidden' });
    expect(await page.getByTestId('readout-contacts').innerText()).toContain('1');

    // Reverse away (the bumper needs a stop or a reverse), then the emergency stop button.
    await stick([0, 1, 0, 0]);
    await page.waitForTimeout(1200);
    await button(1, true);
    await page.getByText('Emergency stop', { exact: true }).first().waitFor();
    await button(1, false);
    // Still zero while the stick stays pushed: it must be let go first.
    const afterStop = await counters(page);
    await page.waitForTimeout(600);
    expect(await page.getByTestId('drive-status').innerText()).toContain('Emergency stop');
    await stick([0, 0, 0, 0]);
    expect(afterStop.queued).toBeGreaterThan(0);

    // Abandon: asks first, then shows the summary.
    await page.getByRole('button', { name: 'Abandon' }).click();
    await page.locator('.p-confirmdialog').getByRole('button', { name: 'Abandon the drive' }).click();
    await page.getByTestId('drive-summary').waitFor();
    expect(await page.getByRole('heading', { name: 'Drive abandoned' }).isVisible()).toBe(true);
    expect(await page.getByTestId('summary-contacts').innerText()).toContain('1');
    expect(errors).toEqual([]);
    await page.close();
  }, 120_000);
});

describe('the drive console on a narrow touch screen', () => {
  it('stacks the map above the readout and drives with the on-screen buttons', async () => {
    const { page, errors } = await openPage(browser);
    await page.setViewportSize({ width: 412, height: 900 });
    await signIn(page, demoEmail('operator1'));
    await startPractice(page, 'Rack-end slalom');
    const forward = page.getByRole('button', { name: 'Forward' });
    await forward.scrollIntoViewIfNeeded();
    const box = (await forward.boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await page.mouse.down();
    await until(async () => (await readPose(page)).y > 16.2, 15_000, 'the robot to move north');
    await page.mouse.up();
    await page.getByRole('button', { name: 'Emergency stop' }).click();
    await page.getByTestId('drive-status').getByText('Emergency stop').waitFor();
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: join(SCREENSHOTS, 'console-narrow.png'), fullPage: true, animations: 'disabled' });
    // Nothing sticks out sideways.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(412);
    expect(errors).toEqual([]);
    await page.close();
  }, 60_000);
});
