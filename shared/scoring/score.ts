/**
 * Scores a submitted drive: a pure, deterministic function of the trial, the public seed and the
 * stored trace and calls. The belief is rebuilt from the odometry alone (shared/sim/belief), each
 * call is graded by the risk of its pass, estimate pins by coverage and sharpness, and the outcome
 * by contacts, docking error of the true pose, and time. Scoring the same drive twice gives the
 * same numbers.
 * @module
 */
import { createRng, normalizeAngle, type Pose } from '../motion';
import type { Robot, Rubric, Surface, Trial } from '../schemas/content';
import { Belief, CLOUD_SIZE, nominalPass, passSlip, passSpeed, World, type CallRecord, type DriveStatus, type TraceStep } from '../sim';
import { scoreEstimate } from './estimate';
import { gradeCall, nearEdge, riskBand } from './grade';
import { passRisk } from './risk';
import { SCORING_VERSION, type AttemptScore, type CallScore, type Grade, type OutcomeScore, type ScoreParts, type UncertaintyPoint } from './types';

export interface ScoreInput {
  trial: Trial;
  robot: Robot;
  surfaces: Surface[];
  publicSeed: string;
  trace: readonly TraceStep[];
  calls: readonly CallRecord[];
  status: DriveStatus;
  /** Drive time at the end, penalties included. */
  time: number;
  /** Contact episodes, as the drive counted them. */
  contacts: number;
  truePose: Pose;
}

const SAMPLE = 400;
/** Distance between two points of the uncertainty chart, metres of odometry. */
const CHART_STEP = 0.5;

function sampleCloud(belief: Belief): { x: number[]; y: number[] } {
  const { x, y } = belief.cloud;
  const every = Math.max(1, Math.floor(x.length / SAMPLE));
  const out = { x: [] as number[], y: [] as number[] };
  for (let i = 0; i < x.length; i += every) {
    out.x.push(x[i]);
    out.y.push(y[i]);
  }
  return out;
}

export function scoreAttempt(input: ScoreInput): AttemptScore {
  const { trial, robot, surfaces, publicSeed, trace, calls } = input;
  const { rubric } = trial;
  const world = new World(trial, robot, surfaces);
  const alphas = robot.assumedProfile.alphas;
  const belief = new Belief(trial.start, publicSeed, alphas, (x, y) => world.driftMultiplierAt(x, y), CLOUD_SIZE);
  const callScores: CallScore[] = [];
  const uncertainty: UncertaintyPoint[] = [];
  let distance = 0;
  let nextChart = 0;
  let previous = trial.start;

  const chart = () => {
    const c = belief.snapshot().covariance;
    uncertainty.push({ distance, positionSd: Math.sqrt(Math.max(0, c[0][0] + c[1][1])), headingSd: Math.sqrt(Math.max(0, c[2][2])) });
  };
  chart();

  const callsAt = new Map<number, CallRecord[]>();
  for (const call of calls) callsAt.set(call.traceIndex, [...(callsAt.get(call.traceIndex) ?? []), call]);

  for (let index = 0; index <= trace.length; index++) {
    for (const call of callsAt.get(index) ?? []) callScores.push(scoreCall(call));
    if (index === trace.length) break;
    const step = trace[index];
    if (step.reanchor) belief.reanchor(step.odometry, step.reanchor);
    else belief.advance(step.odometry);
    distance += Math.hypot(step.odometry.x - previous.x, step.odometry.y - previous.y);
    previous = step.odometry;
    if (distance >= nextChart) {
      chart();
      nextChart = distance + CHART_STEP;
    }
  }

  function scoreCall(record: CallRecord): CallScore {
    const callPoint = trial.callPoints.find((c) => c.id === record.callPointId)!;
    const snapshot = belief.snapshot();
    const risk = (kind: 'proceed' | 'creep') =>
      passRisk({
        cloud: belief.cloud,
        pass: nominalPass(snapshot.odometry, callPoint.passPath, passSpeed(kind, robot), robot),
        alphas,
        slip: passSlip(kind),
        world,
        rng: createRng(`risk:${publicSeed}:${record.callPointId}:${kind}`),
      });
    const riskProceed = risk('proceed');
    const riskCreep = risk('creep');
    const markerInView = record.markersInView.length > 0;
    const grade = gradeCall({ call: record.call, riskProceed, riskCreep, markerInView, bands: rubric.riskBands });
    const deciding = record.call === 'creep' ? [riskProceed, riskCreep] : [riskProceed];
    return {
      callPointId: record.callPointId,
      label: callPoint.label,
      call: record.call,
      markersInView: record.markersInView,
      riskProceed,
      riskCreep,
      band: riskBand(riskProceed, rubric.riskBands),
      grade,
      points: rubric.gradePoints[grade],
      maxPoints: rubric.gradePoints.sound,
      nearBandEdge: deciding.some((r) => nearEdge(r, rubric.riskBands, rubric.reviewMargins.risk)),
      belief: { odometry: snapshot.odometry, ring: snapshot.ring, covariance: snapshot.covariance },
      truth: record.truth,
      estimate: record.estimate ? scoreEstimate(record.estimate, belief.cloud, snapshot.ring) : null,
      cloudSample: sampleCloud(belief),
      time: record.time,
    };
  }

  const contactObstacles = [...new Set(trace.filter((s) => s.contact).map((s) => s.contact!))];
  const contacts = input.contacts;
  const dock = trial.dock;
  const dockPositionError = Math.hypot(input.truePose.x - dock.pose.x, input.truePose.y - dock.pose.y);
  const dockHeadingError = Math.abs(normalizeAngle(input.truePose.theta - dock.pose.theta));
  const ratio = Math.max(dockPositionError / dock.positionTolerance, dockHeadingError / dock.headingTolerance);
  const timedOut = input.status === 'time_up' || input.time >= trial.timeLimit;
  const called = new Set(calls.map((c) => c.callPointId));
  const outcome: OutcomeScore = {
    skippedCallPoints: trial.callPoints.filter((c) => !called.has(c.id)).map((c) => c.label),
    contacts,
    contactObstacles,
    dockPositionError,
    dockHeadingError,
    docked: ratio <= 1,
    dockScore: ratio <= 1 ? 1 - 0.5 * ratio : 0,
    time: input.time,
    timeLimit: trial.timeLimit,
    timeScore: timedOut ? 0 : Math.min(1, Math.max(0, (trial.timeLimit - input.time) / (0.5 * trial.timeLimit))),
    timedOut,
  };
  return combine(callScores, outcome, rubric, uncertainty, input.status === 'submitted');
}

/** Totals the parts by the rubric's weights, decides pass or fail and the review flags. */
export function combine(calls: CallScore[], outcome: OutcomeScore, rubric: Rubric, uncertainty: UncertaintyPoint[], submitted: boolean): AttemptScore {
  const estimates = calls.filter((c) => c.estimate).map((c) => c.estimate!.score);
  // A skipped call point counts as a call with no points.
  const skipped = outcome.skippedCallPoints.length;
  const maxCallPoints = rubric.gradePoints.sound;
  const parts: ScoreParts = {
    calls: calls.length + skipped ? calls.reduce((s, c) => s + c.points, 0) / (calls.reduce((s, c) => s + c.maxPoints, 0) + skipped * maxCallPoints) : 1,
    estimates: estimates.length ? estimates.reduce((a, b) => a + b, 0) / estimates.length : null,
    docking: outcome.dockScore,
    time: outcome.timeScore,
  };
  const w = rubric.weights;
  const weighted = [
    [w.calls, parts.calls],
    [parts.estimates === null ? 0 : w.estimates, parts.estimates ?? 0],
    [w.docking, parts.docking],
    [w.time, parts.time],
  ];
  const weightSum = weighted.reduce((s, [weight]) => s + weight, 0) || 1;
  const total = Math.round((1000 * weighted.reduce((s, [weight, part]) => s + weight * part, 0)) / weightSum) / 10;
  const criticalFaults = [
    ...(outcome.contacts > 0 ? [`${outcome.contacts} contact${outcome.contacts > 1 ? 's' : ''} with ${outcome.contactObstacles.join(', ')}`] : []),
    ...calls.filter((c) => c.grade === 'unsafe').map((c) => `unsafe call at ${c.label}`),
    ...outcome.skippedCallPoints.map((label) => `no call made at ${label}`),
  ];
  const flags = [
    ...(Math.abs(total - rubric.passMark) <= rubric.reviewMargins.total ? ['total near the pass mark'] : []),
    ...calls.filter((c) => c.nearBandEdge).map((c) => `risk near a band edge at ${c.label}`),
  ];
  return {
    version: SCORING_VERSION,
    calls,
    outcome,
    parts,
    total,
    passMark: rubric.passMark,
    criticalFaults,
    passed: submitted && total >= rubric.passMark && criticalFaults.length === 0,
    flags,
    uncertainty,
  };
}

/** An assessor's change to a score: a call's grade, or an outcome part, each with its reason. */
export type Amendment =
  | { target: 'call'; callPointId: string; grade: Grade; reason: string }
  | { target: 'contacts'; contacts: number; reason: string }
  | { target: 'docking'; dockScore: number; reason: string }
  | { target: 'time'; timeScore: number; reason: string };

/** The score with the amendments applied, totalled again by the same rule. */
export function applyAmendments(score: AttemptScore, amendments: readonly Amendment[], rubric: Rubric): AttemptScore {
  const calls = score.calls.map((c) => {
    const change = amendments.find((a) => a.target === 'call' && a.callPointId === c.callPointId);
    return change && change.target === 'call' ? { ...c, grade: change.grade, points: rubric.gradePoints[change.grade] } : c;
  });
  const outcome = { ...score.outcome };
  for (const a of amendments) {
    if (a.target === 'contacts') outcome.contacts = a.contacts;
    if (a.target === 'docking') outcome.dockScore = a.dockScore;
    if (a.target === 'time') outcome.timeScore = a.timeScore;
  }
  if (outcome.contacts === 0) outcome.contactObstacles = [];
  return combine(calls, outcome, rubric, score.uncertainty, true);
}
