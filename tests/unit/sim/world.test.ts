/**
 * World: contacts of the footprint, the map edge, which markers can be read, the floor under a
 * point. A small hand-made 10 m × 10 m trial; all expected values computed by hand.
 */
import { describe, expect, it } from 'vitest';
import type { AnchorMarker, Surface, Trial } from '../../../shared/schemas';
import { MAP_EDGE, World } from '../../../shared/sim';
import { openFloorTrial, shippedContent } from './fixtures';

const square = (x0: number, y0: number, x1: number, y1: number) => [
  { x: x0, y: y0 },
  { x: x1, y: y0 },
  { x: x1, y: y1 },
  { x: x0, y: y1 },
];

const marker = (m: Partial<AnchorMarker> & Pick<AnchorMarker, 'id' | 'x' | 'y' | 'facing'>): AnchorMarker => ({
  range: 4,
  fov: Math.PI / 2,
  noise: { position: 0.03, heading: 0.02 },
  ...m,
});

const surfaces: Surface[] = [
  { id: 'wet', name: 'Wet', driftMultiplier: 6, description: '' },
  { id: 'mat', name: 'Mat', driftMultiplier: 2.2, description: '' },
];

const trial: Trial = {
  ...openFloorTrial(),
  map: { width: 10, height: 10, obstacles: [{ id: 'crate', kind: 'equipment', polygon: square(4, 4, 6, 6) }] },
  zones: [
    { id: 'puddle', surfaceId: 'wet', polygon: square(1, 1, 3, 3) },
    // Drawn later, over the puddle's corner: it wins where they overlap.
    { id: 'mat-over', surfaceId: 'mat', polygon: square(2, 2, 4, 3) },
    { id: 'unknown', surfaceId: 'no-such-surface', polygon: square(7, 7, 8, 8) },
  ],
  markers: [
    marker({ id: 'west', x: 0, y: 5, facing: 0 }),
    marker({ id: 'east', x: 10, y: 5, facing: Math.PI, range: 3 }),
  ],
};

// Footprint 1 m long, 0.5 m wide.
const world = new World(trial, { footprint: { length: 1, width: 0.5 } }, surfaces);

describe('World.contactAt', () => {
  it('a footprint overlapping the crate reports its id; a clear pose reports null', () => {
    expect(world.contactAt({ x: 3.4, y: 5, theta: 0 })).toBeNull(); // front edge at x 3.9
    expect(world.contactAt({ x: 3.6, y: 5, theta: 0 })).toBe('crate'); // front edge at x 4.1
    expect(world.contactAt({ x: 5, y: 5, theta: 0.3 })).toBe('crate'); // wholly inside
    // Turned a quarter: only 0.25 m to each side, so x 3.35–3.85 is clear.
    expect(world.contactAt({ x: 3.6, y: 5, theta: Math.PI / 2 })).toBeNull();
    // Diagonal: a corner of the footprint reaches into the crate's corner (4, 4).
    // At (3.6, 3.6, pi/4) the front-left corner is at (3.6 + 0.5·c − 0.25·s, 3.6 + 0.5·s + 0.25·c)
    // ≈ (3.777, 4.130) and the front-right at ≈ (4.130, 3.777): the front edge crosses x = 4 at y ≈ 3.9.
    expect(world.contactAt({ x: 3.6, y: 3.6, theta: Math.PI / 4 })).toBeNull();
    expect(world.contactAt({ x: 3.8, y: 3.8, theta: Math.PI / 4 })).toBe('crate');
  });

  it('a footprint leaving the map reports "map-edge"', () => {
    expect(MAP_EDGE).toBe('map-edge');
    expect(world.contactAt({ x: 0.4, y: 5, theta: 0 })).toBe('map-edge'); // rear edge at x −0.1
    expect(world.contactAt({ x: 0.6, y: 5, theta: 0 })).toBeNull();
    expect(world.contactAt({ x: 9.8, y: 5, theta: Math.PI / 2 })).toBe('map-edge'); // right side at x 10.05
    expect(world.contactAt({ x: 5, y: 9.6, theta: Math.PI / 2 })).toBe('map-edge'); // front at y 10.1
    expect(world.contactAt({ x: 5, y: 9.4, theta: Math.PI / 2 })).toBeNull();
  });
});

describe('World.markersInView', () => {
  it('honours the range: just inside and just outside', () => {
    expect(world.markersInView({ x: 3.99, y: 5, theta: 0 })).toEqual(['west']);
    expect(world.markersInView({ x: 4.01, y: 5, theta: 0 })).toEqual([]);
    expect(world.markersInView({ x: 7.01, y: 5, theta: 0 })).toEqual(['east']);
    expect(world.markersInView({ x: 6.99, y: 5, theta: 0 })).toEqual([]);
  });

  it('honours the viewing cone: just inside and just outside fov/2 (45°)', () => {
    const at = (angle: number) => ({ x: 2 * Math.cos(angle), y: 5 + 2 * Math.sin(angle), theta: 0 });
    expect(world.markersInView(at((44 * Math.PI) / 180))).toEqual(['west']);
    expect(world.markersInView(at((-44 * Math.PI) / 180))).toEqual(['west']);
    expect(world.markersInView(at((46 * Math.PI) / 180))).toEqual([]);
    expect(world.markersInView(at((-46 * Math.PI) / 180))).toEqual([]);
  });

  it('works across the ±pi seam for a marker facing west', () => {
    // From the east marker at (10, 5) facing pi, the direction to (8, 4.9) is about −pi + 0.05.
    expect(world.markersInView({ x: 8, y: 4.9, theta: 0 })).toEqual(['east']);
    expect(world.markersInView({ x: 8, y: 5.1, theta: 0 })).toEqual(['east']);
    // 50° off its axis: outside the cone although in range.
    const off = (50 * Math.PI) / 180;
    expect(world.markersInView({ x: 10 - 2 * Math.cos(off), y: 5 + 2 * Math.sin(off), theta: 0 })).toEqual([]);
  });

  it('lists every readable marker in content order', () => {
    const both = new World({ ...trial, markers: [...trial.markers, marker({ id: 'west-2', x: 0, y: 6, facing: 0, range: 6 })] }, { footprint: { length: 1, width: 0.5 } }, surfaces);
    expect(both.markersInView({ x: 3, y: 5.5, theta: 0 })).toEqual(['west', 'west-2']);
  });
});

describe('World.driftMultiplierAt', () => {
  it("gives the zone's surface multiplier inside a zone and 1 outside every zone", () => {
    expect(world.driftMultiplierAt(1.5, 1.5)).toBe(6);
    expect(world.driftMultiplierAt(3.5, 2.5)).toBe(2.2);
    expect(world.driftMultiplierAt(5, 8)).toBe(1);
    expect(world.driftMultiplierAt(0.5, 0.5)).toBe(1);
  });

  it('where zones overlap, the one drawn later wins', () => {
    expect(world.driftMultiplierAt(2.5, 2.5)).toBe(2.2);
    expect(world.driftMultiplierAt(2.5, 1.5)).toBe(6);
  });

  it('a zone whose surface is unknown counts as the plain floor (the loader rejects such content)', () => {
    expect(world.driftMultiplierAt(7.5, 7.5)).toBe(1);
  });
});

describe('shipped trials on their world', () => {
  const content = shippedContent();
  for (const trial of content.trials.values()) {
    it(`${trial.id}: the start and the dock are clear of obstacles, each trigger has its pass path start near it`, () => {
      const robot = content.robots.get(trial.robotId)!;
      const w = new World(trial, robot, [...content.surfaces.values()]);
      expect(w.contactAt(trial.start)).toBeNull();
      expect(w.contactAt(trial.dock.pose)).toBeNull();
      for (const c of trial.callPoints) {
        // The pass path's first point lies within a metre of the trigger area's box.
        const xs = c.trigger.map((p) => p.x);
        const ys = c.trigger.map((p) => p.y);
        const p = c.passPath[0];
        const dx = Math.max(Math.min(...xs) - p.x, 0, p.x - Math.max(...xs));
        const dy = Math.max(Math.min(...ys) - p.y, 0, p.y - Math.max(...ys));
        expect(Math.hypot(dx, dy)).toBeLessThan(1);
      }
    });
  }

  it("the wash bay has the wet surface's multiplier (above 1) and the open floor 1, in wash-bay-crossing", () => {
    const trial = content.trials.get('wash-bay-crossing')!;
    const w = new World(trial, content.robots.get(trial.robotId)!, [...content.surfaces.values()]);
    const wet = content.surfaces.get('wet-wash-bay')!.driftMultiplier;
    expect(wet).toBeGreaterThan(1);
    expect(w.driftMultiplierAt(43.6, 27.5)).toBe(wet);
    expect(w.driftMultiplierAt(34, 27.5)).toBe(1);
  });
});
