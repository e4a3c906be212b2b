/** A scripted drive of a shipped trial, scored the way the server scores it, for the report and replay tests. */
import type { Call, PublicTrial } from '@shared/schemas';
import { scoreAttempt, type AttemptScore } from '@shared/scoring';
import { DriveSim, type TraceStep } from '@shared/sim';
import { publicTrial } from '../../../server/services/trials';
import { driveSetup, shippedContent } from '../../support/content';
import { driveTrial } from '../../support/scripted-operator';
import { simPort } from '../sim/fixtures';

export const PUBLIC_SEED = 'replay-public-seed';

export interface ScoredDrive {
  trial: PublicTrial;
  trace: TraceStep[];
  score: AttemptScore;
}

export async function scoredDrive(trialId: string, chooseCall: (markers: string[]) => Call, secretSeed = 'replay-secret-seed'): Promise<ScoredDrive> {
  const setup = driveSetup(trialId, secretSeed);
  const sim = new DriveSim(setup);
  const { state } = await driveTrial(setup.trial, setup.robot, simPort(sim), sim.state(), { chooseCall: (_cp, st) => chooseCall(st.markersInView) });
  const score = scoreAttempt({
    trial: setup.trial,
    robot: setup.robot,
    surfaces: setup.surfaces,
    publicSeed: PUBLIC_SEED,
    trace: sim.trace,
    calls: sim.calls,
    status: 'submitted',
    time: state.time,
    contacts: state.contacts,
    truePose: sim.truePose(),
  });
  return { trial: publicTrial(shippedContent(), trialId), trace: [...sim.trace], score };
}
