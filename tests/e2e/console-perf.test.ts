/**
 * How smoothly the console draws with the 2,000-particle drift cloud in headless Chromium: frame
 * times from requestAnimationFrame while driving with the on-screen buttons, and the cost of one
 * full redraw of the map. Printed, not judged (DEVELOPERS.md: no test fails on time).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, launch, openPage, signIn, type Browser } from './browser';
import { readPose, startPractice, until } from './console-helpers';

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

declare global {
  interface Window {
    Konva?: { stages: { draw(): void; getLayers(): { draw(): void; getCanvas(): { _canvas: HTMLCanvasElement } }[] }[] };
  }
}

describe('console frame rate', () => {
  it('measures frames while driving with 2,000 particles', async () => {
    const { page, errors } = await openPage(browser);
    await signIn(page, demoEmail('operator1'));
    await startPractice(page, 'Long aisle run');

    // Hold the on-screen Forward button with the mouse (the touch and pointer path).
    const forward = page.getByRole('button', { name: 'Forward' });
    const box = (await forward.boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await page.mouse.down();
    await until(async () => (await readPose(page)).x > 12, 20_000, 'the cloud to spread over 8 m');

    const frames = await page.evaluate(
      () =>
        new Promise<number[]>((resolve) => {
          const gaps: number[] = [];
          let last = 0;
          const end = performance.now() + 4000;
          const step = (t: number) => {
            if (last) gaps.push(t - last);
            last = t;
            if (t < end) requestAnimationFrame(step);
            else resolve(gaps);
          };
          requestAnimationFrame(step);
        }),
    );
    const { redraw, layers } = await page.evaluate(() => {
      const stage = window.Konva!.stages[0];
      // Reading a pixel back makes the canvas really rasterise what was drawn, not just record it.
      const flush = (layer: ReturnType<typeof stage.getLayers>[number]) => layer.getCanvas()._canvas.getContext('2d')!.getImageData(0, 0, 1, 1);
      const time = (draw: () => void) => {
        const t0 = performance.now();
        for (let i = 0; i < 60; i++) draw();
        return (performance.now() - t0) / 60;
      };
      return {
        redraw: time(() => {
          stage.draw();
          stage.getLayers().forEach(flush);
        }),
        layers: stage.getLayers().map((layer) =>
          time(() => {
            layer.draw();
            flush(layer);
          }),
        ),
      };
    });
    await page.mouse.up();

    const total = frames.reduce((a, b) => a + b, 0);
    const sorted = [...frames].sort((a, b) => a - b);
    const p95 = sorted[Math.floor(sorted.length * 0.95)];
    const fps = (frames.length / total) * 1000;
    console.log(
      `Console frames while driving (2,000 particles, headless Chromium): ${fps.toFixed(1)} fps over ${(total / 1000).toFixed(1)} s, ` +
        `mean frame ${(total / frames.length).toFixed(1)} ms, 95th percentile ${p95.toFixed(1)} ms, worst ${sorted.at(-1)!.toFixed(1)} ms; ` +
        `one full redraw of the map (all layers) ${redraw.toFixed(2)} ms, i.e. up to ${(1000 / redraw).toFixed(0)} redraws per second ` +
        `(site ${layers[0].toFixed(2)} ms, drive with the cloud ${layers[1].toFixed(2)} ms, names ${layers[2].toFixed(2)} ms)`,
    );
    expect(frames.length).toBeGreaterThan(10);
    expect(errors).toEqual([]);
    await page.close();
  }, 90_000);
});
