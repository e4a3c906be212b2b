import { describe, expect, it } from 'vitest';
import { MAX_ZOOM, fitView, panBy, toScreen, toWorld, worldTransform, zoomAt } from '@/drive/map-view';

const size = { width: 800, height: 500 };

describe('map view', () => {
  it('puts the view centre in the middle of the canvas with north up', () => {
    const view = { cx: 10, cy: 5, zoom: 20 };
    expect(toScreen(view, size, 10, 5)).toEqual({ x: 400, y: 250 });
    expect(toScreen(view, size, 11, 6)).toEqual({ x: 420, y: 230 });
    const t = worldTransform(view, size);
    // The konva transform maps a world point the same way.
    expect(t.x + 11 * t.scaleX).toBe(420);
    expect(t.y + 6 * t.scaleY).toBe(230);
  });

  it('converts screen to world and back', () => {
    const view = { cx: 3.3, cy: -2, zoom: 37 };
    const w = toWorld(view, size, 123, 456);
    const s = toScreen(view, size, w.x, w.y);
    expect(s.x).toBeCloseTo(123, 9);
    expect(s.y).toBeCloseTo(456, 9);
  });

  it('fits a 48 × 30 m site with a margin', () => {
    const view = fitView(48, 30, size, 16);
    expect(view.zoom).toBeCloseTo(Math.min(768 / 48, 468 / 30), 9);
    expect(view).toMatchObject({ cx: 24, cy: 15 });
  });

  it('zooms about the pointer: the world point under it stays put', () => {
    const view = { cx: 10, cy: 5, zoom: 20 };
    const before = toWorld(view, size, 600, 100);
    const zoomed = zoomAt(view, size, 2, 600, 100);
    const after = toWorld(zoomed, size, 600, 100);
    expect(zoomed.zoom).toBe(40);
    expect(after.x).toBeCloseTo(before.x, 9);
    expect(after.y).toBeCloseTo(before.y, 9);
    expect(zoomAt({ ...view, zoom: MAX_ZOOM }, size, 2).zoom).toBe(MAX_ZOOM);
  });

  it('pans with the drag: the map moves with the pointer', () => {
    const view = { cx: 10, cy: 5, zoom: 20 };
    const moved = panBy(view, 40, -20);
    expect(toScreen(moved, size, 10, 5)).toEqual({ x: 440, y: 230 });
  });
});
