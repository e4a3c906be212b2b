/**
 * The design's two scalings of the true motion's noise (DESIGN.md, "drift profile", "floor zone",
 * "creep"): a floor zone's drift multiplier scales the alphas (variances), and a creep pass is
 * slower with less slip (CREEP_SLIP_FACTOR). Both are checked by the spread of the true pose over
 * many secret seeds on an open floor, where nothing else differs between the seeds.
 */
import { describe, expect, it } from 'vitest';
import type { Call } from '../../../shared/schemas';
import { CREEP_SLIP_FACTOR, DriveSim, PASS_SPEED } from '../../../shared/sim';
import { openFloorSetup, repeat, shippedContent } from './fixtures';

const SEEDS = Array.from({ length: 150 }, (_v, i) => `scale-${i}`);

function variance(values: number[]): number {
  const mean = values.reduce((s, v) => s + v, 0) / values.length;
  return values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1);
}

const square = (x0: number, y0: number, x1: number, y1: number) => [
  { x: x0, y: y0 },
  { x: x1, y: y0 },
  { x: x1, y: y1 },
  { x: x0, y: y1 },
];

describe('floor zones scale the drift', () => {
  it("on the wet wash bay floor the position variance is the surface's multiplier times that on plain floor", () => {
    const multiplier = shippedContent().surfaces.get('wet-wash-bay')!.driftMultiplier;
    const spread = (wet: boolean) => {
      const xs: number[] = [];
      const ys: number[] = [];
      for (const seed of SEEDS.slice(0, 100)) {
        const setup = openFloorSetup(seed);
        if (wet) setup.trial.zones = [{ id: 'flood', surfaceId: 'wet-wash-bay', polygon: square(0, 0, 200, 200) }];
        const sim = new DriveSim(setup);
        sim.applyBatch(repeat(60, { v: 1, w: 0 }));
        expect(sim.world.driftMultiplierAt(sim.truePose().x, sim.truePose().y)).toBe(wet ? multiplier : 1);
        xs.push(sim.truePose().x);
        ys.push(sim.truePose().y);
      }
      return variance(xs) + variance(ys);
    };
    // Every variance scales by the multiplier; the same seeds give the same normal draws, so the
    // ratio is close to the multiplier (the systematic Ed, Eb are the same in both drives).
    const ratio = spread(true) / spread(false);
    expect(multiplier).toBeGreaterThan(1.5);
    expect(ratio).toBeGreaterThan(0.75 * multiplier);
    expect(ratio).toBeLessThan(1.25 * multiplier);
  });
});

describe('a creep pass slips less than a proceed pass', () => {
  it('along the pass the true travel varies about 5 times less: half the step length, times the slip factor', () => {
    // A call point on the open floor: trigger x 101–102, pass (102, 100) → (110, 100).
    const along = (call: Call) =>
      SEEDS.map((seed) => {
        const setup = openFloorSetup(seed);
        setup.trial.callPoints = [
          { id: 'gate', label: 'Gate', trigger: square(101, 99, 102, 101), passPath: [{ x: 102, y: 100 }, { x: 110, y: 100 }], askEstimate: false },
        ];
        const sim = new DriveSim(setup);
        expect(sim.applyBatch(repeat(100, { v: 0.5, w: 0 })).state.status).toBe('awaiting_call');
        const from = sim.truePose();
        sim.answerCall('gate', call, null);
        const to = sim.truePose();
        return Math.cos(from.theta) * (to.x - from.x) + Math.sin(from.theta) * (to.y - from.y);
      });
    const proceed = variance(along('proceed'));
    const creep = variance(along('creep'));
    // Per step the travel variance is a3·trans²·multiplier; over a pass of length L at speed v
    // that sums to a3·L·v·dt·multiplier. So proceed/creep = (PASS_SPEED · 1)/(creepSpeed ·
    // CREEP_SLIP_FACTOR) = 0.6/(0.3 · 0.4) = 5 for the aisle tugger (by hand); without the slip
    // factor it would be 2.
    const { creepSpeed, limits } = openFloorSetup('x').robot;
    const expected = Math.min(PASS_SPEED, limits.maxSpeed) / (creepSpeed * CREEP_SLIP_FACTOR);
    expect(expected).toBeCloseTo(5, 9);
    expect(proceed / creep).toBeGreaterThan(0.7 * expected);
    expect(proceed / creep).toBeLessThan(1.4 * expected);
  });
});
