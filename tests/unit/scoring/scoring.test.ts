import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { createRng, ParticleCloud } from '../../../shared/motion';
import type { Call, CallPoint, Robot, Trial } from '../../../shared/schemas';
import { applyAmendments, GRADES, gradeCall, passRisk, scoreAttempt, scoreEstimate, type AttemptScore } from '../../../shared/scoring';
import { DriveSim, nominalPass, World, type DriveState } from '../../../shared/sim';
import { driveSetup } from '../../support/content';
import { driveTrial } from '../../support/scripted-operator';

const rect = (x0: number, y0: number, x1: number, y1: number) => [
  { x: x0, y: y0 },
  { x: x1, y: y0 },
  { x: x1, y: y1 },
  { x: x0, y: y1 },
];

describe('risk of a pass', () => {
  it('matches the normal CDF for a cloud spread across a straight gap (jstat)', () => {
    // Independent computation: particles spread N(0, sigma²) across the gap, headings exactly along
    // it, no pass noise: a footprint of width W touches a wall of a gap of width g when
    // |offset| > g/2 − W/2 = m, so risk = 2·(1 − Phi(m/sigma)).
    const sigma = 0.25;
    const gap = 1.5;
    const width = 0.6;
    const robot = driveSetup('long-aisle-run', 's').robot;
    const testRobot: Robot = { ...robot, footprint: { length: 0.2, width }, assumedProfile: { alphas: [0, 0, 0, 0], ed: 1, eb: 1 } };
    const trial = {
      ...driveSetup('long-aisle-run', 's').trial,
      map: { width: 20, height: 10, obstacles: [{ id: 'lower', kind: 'wall', polygon: rect(9, 0.5, 11, 5 - gap / 2) }, { id: 'upper', kind: 'wall', polygon: rect(9, 5 + gap / 2, 11, 9.5) }] },
      zones: [],
      markers: [],
    } as Trial;
    const world = new World(trial, testRobot, []);
    const n = 20_000;
    const cloud = new ParticleCloud(n);
    cloud.resetGaussian({ x: 8, y: 5, theta: 0 }, [[1e-14, 0, 0], [0, sigma * sigma, 0], [0, 0, 1e-14]], createRng('cloud'));
    const pass = nominalPass({ x: 8, y: 5, theta: 0 }, [{ x: 8, y: 5 }, { x: 12, y: 5 }], 0.6, testRobot);
    const risk = passRisk({ cloud, pass, alphas: [0, 0, 0, 0], slip: 1, world, rng: createRng('pass') });
    const m = gap / 2 - width / 2;
    const expected = 2 * (1 - jStat.normal.cdf(m / sigma, 0, 1));
    const standardError = Math.sqrt((expected * (1 - expected)) / n);
    expect(expected).toBeCloseTo(0.0719, 3); // 2·(1 − 0.9641), Phi(1.8) from a standard normal table
    expect(Math.abs(risk - expected)).toBeLessThan(3 * standardError);
  });
});

describe('grades', () => {
  const bands: [number, number] = [0.02, 0.1];
  const grade = (call: Call, riskProceed: number, riskCreep = riskProceed, markerInView = true) => gradeCall({ call, riskProceed, riskCreep, markerInView, bands });

  it('follows the rubric table for each call and band', () => {
    expect([grade('proceed', 0.01), grade('proceed', 0.05), grade('proceed', 0.2)]).toEqual(['sound', 'risky', 'unsafe']);
    expect([grade('creep', 0.01), grade('creep', 0.05, 0.01), grade('creep', 0.2, 0.01), grade('creep', 0.2, 0.05), grade('creep', 0.2, 0.15)]).toEqual([
      'acceptable',
      'sound',
      'acceptable',
      'risky',
      'unsafe',
    ]);
    expect([grade('reanchor', 0.01), grade('reanchor', 0.05), grade('reanchor', 0.3)]).toEqual(['overCautious', 'sound', 'sound']);
    expect([grade('halt', 0.01), grade('halt', 0.05, 0.05, true), grade('halt', 0.05, 0.05, false), grade('halt', 0.3, 0.3, true), grade('halt', 0.3, 0.3, false)]).toEqual([
      'overCautious',
      'overCautious',
      'acceptable',
      'acceptable',
      'sound',
    ]);
  });
});

describe('estimate pins', () => {
  it('coverage of a ring around an isotropic normal cloud is 1 − exp(−r²/2σ²) (Rayleigh distribution)', () => {
    const sigma = 0.4;
    const cloud = new ParticleCloud(20_000);
    cloud.resetGaussian({ x: 3, y: 4, theta: 0 }, [[sigma ** 2, 0, 0], [0, sigma ** 2, 0], [0, 0, 1e-6]], createRng('pin'));
    const ring = { major: sigma * Math.sqrt(5.991465), minor: sigma * Math.sqrt(5.991465), angle: 0 };
    for (const radius of [0.3, 0.6, 1.0]) {
      const s = scoreEstimate({ x: 3, y: 4, radius }, cloud, ring);
      const expected = 1 - Math.exp(-(radius ** 2) / (2 * sigma ** 2));
      expect(Math.abs(s.coverage - expected)).toBeLessThan(3 * Math.sqrt((expected * (1 - expected)) / 20_000));
    }
    // A ring exactly the 95 % ring covers about 95 % and is perfectly sharp.
    const exact = scoreEstimate({ x: 3, y: 4, radius: ring.major }, cloud, ring);
    expect(exact.coverage).toBeCloseTo(0.95, 2);
    expect(exact.sharpness).toBeCloseTo(1, 9);
    // Twice as wide: full coverage, a quarter of the sharpness.
    const wide = scoreEstimate({ x: 3, y: 4, radius: 2 * ring.major }, cloud, ring);
    expect(wide.sharpness).toBeCloseTo(0.25, 9);
    // In the wrong place: little coverage.
    expect(scoreEstimate({ x: 5, y: 4, radius: ring.major }, cloud, ring).coverage).toBeLessThan(0.05);
  });
});

describe('scoring whole drives', () => {
  type Policy = (callPoint: CallPoint, state: DriveState) => Call;
  async function drive(trialId: string, seed: string, policy: Policy): Promise<AttemptScore> {
    const setup = driveSetup(trialId, seed);
    const sim = new DriveSim(setup);
    await driveTrial(setup.trial, setup.robot, { step: (_s, c) => sim.applyBatch(c), call: (id, call, pin) => sim.answerCall(id, call, pin) }, sim.state(), {
      chooseCall: policy,
      batch: 2,
    });
    const state = sim.finish('submitted');
    return scoreAttempt({ ...setup, publicSeed: `public-${seed}`, trace: sim.trace, calls: sim.calls, status: 'submitted', time: state.time, contacts: state.contacts, truePose: sim.truePose() });
  }

  // On the wet wash bay (drift multiplier 12) the south door is 1.4 m for a 0.7 m robot.
  it('on a drift-heavy trial: reckless gets unsafe calls, cautious none, always-halt is over-cautious and fails on time', async () => {
    for (const seed of ['a', 'b']) {
      const reckless = await drive('wash-bay-crossing', seed, () => 'proceed');
      expect(reckless.calls.map((c) => c.grade)).toContain('unsafe');
      expect(reckless.passed).toBe(false);
      expect(reckless.criticalFaults.some((f) => f.startsWith('unsafe call'))).toBe(true);

      const cautious = await drive('wash-bay-crossing', seed, (_cp, state) => (state.markersInView.length ? 'reanchor' : 'creep'));
      expect(cautious.calls.map((c) => c.grade)).not.toContain('unsafe');
      expect(cautious.calls.map((c) => c.grade)).not.toContain('risky');

      const halting = await drive('wash-bay-crossing', seed, () => 'halt');
      expect(halting.calls.map((c) => c.grade)).toContain('overCautious');
      expect(halting.outcome.timedOut).toBe(true);
      expect(halting.passed).toBe(false);
    }
  });

  it('scoring the same drive twice gives the same numbers', async () => {
    const setup = driveSetup('long-aisle-run', 'twice');
    const sim = new DriveSim(setup);
    await driveTrial(setup.trial, setup.robot, { step: (_s, c) => sim.applyBatch(c), call: (id, call, pin) => sim.answerCall(id, call, pin) }, sim.state(), {
      chooseCall: () => 'reanchor',
      batch: 3,
    });
    const input = { ...setup, publicSeed: 'p', trace: sim.trace, calls: sim.calls, status: 'submitted' as const, time: sim.state().time, contacts: sim.state().contacts, truePose: sim.truePose() };
    const first = scoreAttempt(input);
    expect(scoreAttempt(structuredClone(input))).toEqual(first);
    expect(first.version).toBe('scoring-1');
    expect(first.uncertainty.length).toBeGreaterThan(20);
    // Common practice, no source: the belief's spread grows with distance until a re-anchoring.
    const beforeCall = first.uncertainty.filter((u) => u.distance < 30);
    expect(beforeCall[beforeCall.length - 1].positionSd).toBeGreaterThan(beforeCall[5].positionSd);
  });

  it('amendments change grades and outcome parts and total again by the same rule', async () => {
    const reckless = await drive('wash-bay-crossing', 'a', () => 'proceed');
    const rubric = driveSetup('wash-bay-crossing', 'a').trial.rubric;
    const unsafe = reckless.calls.find((c) => c.grade === 'unsafe')!;
    const amended = applyAmendments(reckless, [{ target: 'call', callPointId: unsafe.callPointId, grade: 'acceptable', reason: 'test' }], rubric);
    expect(amended.calls.find((c) => c.callPointId === unsafe.callPointId)!.grade).toBe('acceptable');
    expect(amended.criticalFaults.some((f) => f.startsWith('unsafe call'))).toBe(false);
    expect(amended.total).toBeGreaterThan(reckless.total);
    const docked = applyAmendments(amended, [{ target: 'docking', dockScore: 1, reason: 'test' }], rubric);
    expect(docked.parts.docking).toBe(1);
    expect(GRADES).toContain(amended.calls[0].grade);
  });
});

describe('skipped call points', () => {
  it('a drive that goes past a call point without a call fails with a critical fault', () => {
    const setup = driveSetup('long-aisle-run', 'skip');
    const sim = new DriveSim(setup);
    sim.applyBatch([{ v: 0.5, w: 0 }]);
    const state = sim.finish('submitted');
    const score = scoreAttempt({ ...setup, publicSeed: 'p', trace: sim.trace, calls: sim.calls, status: 'submitted', time: state.time, contacts: 0, truePose: sim.truePose() });
    expect(score.outcome.skippedCallPoints).toEqual(['Gap between the pallet stacks']);
    expect(score.criticalFaults).toContain('no call made at Gap between the pallet stacks');
    expect(score.parts.calls).toBe(0);
    expect(score.passed).toBe(false);
  });
});
