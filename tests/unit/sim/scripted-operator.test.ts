/**
 * Every shipped trial can be driven from start to dock: the scripted operator (pure pursuit on
 * the odometry along the route, Coulter 1992) re-anchors where a marker can be read and otherwise
 * calls `halt` (assisted recovery), for three seeds.
 */
import { describe, expect, it } from 'vitest';
import { angleDifference } from '../../../shared/motion';
import type { Call } from '../../../shared/schemas';
import { DriveSim } from '../../../shared/sim';
import { driveTrial } from '../../support/scripted-operator';
import { driveSetup, shippedContent, simPort } from './fixtures';

const SEEDS = ['alpha', 'bravo', 'charlie'];
const trialIds = [...shippedContent().trials.keys()].sort();

describe('the scripted operator drives every shipped trial to the dock', () => {
  it('there are six trials to drive', () => {
    expect(trialIds).toHaveLength(6);
  });

  for (const id of trialIds) {
    it.each(SEEDS)(`${id}, seed %s: docked, still driving, no contact, every call point answered`, async (seed) => {
      const setup = driveSetup(id, seed);
      const sim = new DriveSim(setup);
      const chooseCall = (_cp: unknown, st: { markersInView: string[] }): Call => (st.markersInView.length ? 'reanchor' : 'halt');
      const { state, results } = await driveTrial(setup.trial, setup.robot, simPort(sim), sim.state(), { chooseCall });
      const where = `status ${state.status} at ${state.time.toFixed(1)} s of ${setup.trial.timeLimit} s, odometry (${state.odometry.x.toFixed(2)}, ${state.odometry.y.toFixed(2)}), contacts ${state.contacts}`;
      expect(state.docked, where).toBe(true);
      expect(state.status).toBe('driving');
      expect(state.contacts).toBe(0);
      expect(results.flatMap((r) => r.events).filter((e) => e.type === 'contact')).toEqual([]);
      expect(results.flatMap((r) => r.events).some((e) => e.type === 'dock_reached')).toBe(true);
      expect(state.answeredCallPoints.sort()).toEqual(setup.trial.callPoints.map((c) => c.id).sort());
      expect(sim.calls.every((c) => c.call === (c.markersInView.length ? 'reanchor' : 'halt'))).toBe(true);
      expect(state.time).toBeLessThan(setup.trial.timeLimit);
      // Docked on the odometry, within the dock tolerances.
      const { pose, positionTolerance, headingTolerance } = setup.trial.dock;
      expect(Math.hypot(state.odometry.x - pose.x, state.odometry.y - pose.y)).toBeLessThanOrEqual(positionTolerance);
      expect(Math.abs(angleDifference(state.odometry.theta, pose.theta))).toBeLessThanOrEqual(headingTolerance);
    });
  }
});
