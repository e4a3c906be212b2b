import { describe, expect, it } from 'vitest';
import { Belief, DriveSim, type BatchResult } from '../../../shared/sim';
import { driveSetup } from '../../support/content';
import { driveTrial } from '../../support/scripted-operator';

function beliefFor(trialId: string, publicSeed: string) {
  const setup = driveSetup(trialId, 'secret');
  const sim = new DriveSim(setup);
  const belief = new Belief(setup.trial.start, publicSeed, setup.robot.assumedProfile.alphas, (x, y) => sim.world.driftMultiplierAt(x, y), 500);
  return { setup, sim, belief };
}

const markerNoise = (setup: ReturnType<typeof driveSetup>) => (id: string | null) =>
  id ? setup.trial.markers.find((m) => m.id === id)!.noise : { position: 0, heading: 0 };

describe('the belief (drift cloud and covariance)', () => {
  it('is the same whether fed response by response (client) or from the stored trace (server)', async () => {
    const client = beliefFor('long-aisle-run', 'public-1');
    const results: BatchResult[] = [];
    await driveTrial(client.setup.trial, client.setup.robot, {
      step: (_s, c) => {
        const r = client.sim.applyBatch(c);
        results.push(r);
        return r;
      },
      call: (id, call, pin) => {
        const r = client.sim.answerCall(id, call, pin);
        results.push(r);
        return r;
      },
    }, client.sim.state(), { chooseCall: () => 'reanchor', batch: 3 });
    for (const r of results) client.belief.applyResult(r, markerNoise(client.setup));

    const server = beliefFor('long-aisle-run', 'public-1');
    server.belief.followTrace(client.sim.trace);
    expect(Array.from(server.belief.cloud.x)).toEqual(Array.from(client.belief.cloud.x));
    expect(server.belief.snapshot()).toEqual(client.belief.snapshot());
    expect(client.sim.trace.some((s) => s.reanchor)).toBe(true);
  });

  it('a different public seed gives a different cloud around the same odometry', () => {
    const a = beliefFor('long-aisle-run', 'one');
    const b = beliefFor('long-aisle-run', 'two');
    const r = a.sim.applyBatch(Array.from({ length: 30 }, () => ({ v: 1, w: 0 })));
    a.belief.applyResult(r, markerNoise(a.setup));
    b.belief.applyResult(r, markerNoise(b.setup));
    expect(a.belief.snapshot()).toEqual(b.belief.snapshot());
    expect(Array.from(a.belief.cloud.y)).not.toEqual(Array.from(b.belief.cloud.y));
  });

  it("the cloud's spread matches the linearised covariance on a straight drive (small noise)", () => {
    // Check: sample covariance of the particle set vs first-order propagation
    // (Thrun, Burgard & Fox 2005, §5.4 and the EKF prediction step, Table 3.3 line 3).
    const setup = driveSetup('long-aisle-run', 'secret');
    const sim = new DriveSim(setup);
    const belief = new Belief(setup.trial.start, 'p', setup.robot.assumedProfile.alphas, () => 1, 4000);
    belief.applyResult(sim.applyBatch(Array.from({ length: 50 }, () => ({ v: 1.2, w: 0 }))), markerNoise(setup));
    const sample = belief.cloud.covariance();
    const linear = belief.snapshot().covariance;
    expect(sample[1][1] / linear[1][1]).toBeGreaterThan(0.85);
    expect(sample[1][1] / linear[1][1]).toBeLessThan(1.15);
    expect(sample[0][0] / linear[0][0]).toBeGreaterThan(0.85);
    expect(sample[0][0] / linear[0][0]).toBeLessThan(1.15);
  });

  it('re-anchoring shrinks the ring to the marker noise', () => {
    const { setup, sim, belief } = beliefFor('long-aisle-run', 'p');
    belief.applyResult(sim.applyBatch(Array.from({ length: 50 }, () => ({ v: 1.2, w: 0 }))), markerNoise(setup));
    const before = belief.snapshot().ring.major;
    belief.reanchor(sim.state().odometry, { position: 0.03, heading: 0.02 });
    const after = belief.snapshot();
    // 95 % ring of an isotropic normal: radius sigma·sqrt(5.991) (chi-square 2 dof, NIST table).
    expect(after.ring.major).toBeCloseTo(0.03 * Math.sqrt(5.991465), 5);
    expect(after.ring.major).toBeLessThan(before);
  });
});
