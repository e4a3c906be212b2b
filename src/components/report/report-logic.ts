/**
 * Pure helpers of the attempt report: how grades, bands, risks and review states are named and
 * marked (a word and an icon besides the colour), the score breakdown by the rubric's weights,
 * where each call and contact sits in the stored trace, and the true and believed paths.
 */
import type { Pose } from '@shared/motion';
import type { AttemptReport, ReviewInfo, ReviewStatus, Rubric } from '@shared/schemas';
import type { AttemptScore, CallScore, Grade, RiskBand, ScoreParts } from '@shared/scoring';
import type { TraceStep } from '@shared/sim';

export type TagSeverity = 'success' | 'info' | 'warn' | 'danger' | 'secondary' | 'contrast';

export interface Look {
  label: string;
  icon: string;
  severity: TagSeverity;
}

/** Each grade has its own word and icon, so colour is never the only cue. */
export const GRADE_LOOKS: Record<Grade, Look> = {
  sound: { label: 'Sound', icon: 'pi pi-check-circle', severity: 'success' },
  acceptable: { label: 'Acceptable', icon: 'pi pi-check', severity: 'info' },
  overCautious: { label: 'Over-cautious', icon: 'pi pi-hourglass', severity: 'secondary' },
  risky: { label: 'Risky', icon: 'pi pi-exclamation-triangle', severity: 'warn' },
  unsafe: { label: 'Unsafe', icon: 'pi pi-times-circle', severity: 'danger' },
};

export const GRADE_ORDER: readonly Grade[] = ['sound', 'acceptable', 'overCautious', 'risky', 'unsafe'];

/** "3.4 %": a share as a percentage; tiny non-zero shares do not read as zero. */
export function percent(share: number, digits = 1): string {
  if (!Number.isFinite(share)) return '—';
  if (share > 0 && share * 100 < 10 ** -digits) return `< ${(10 ** -digits).toFixed(digits)} %`;
  return `${(share * 100).toFixed(digits)} %`;
}

/** "Low: under 2 %", "Middle: 2 % to 10 %", "High: 10 % or more", by the rubric's band edges. */
export function bandText(band: RiskBand, [low, high]: Rubric['riskBands']): string {
  const p = (x: number) => `${+(x * 100).toFixed(2)} %`;
  if (band === 'low') return `Low: under ${p(low)}`;
  if (band === 'mid') return `Middle: ${p(low)} to ${p(high)}`;
  return `High: ${p(high)} or more`;
}

export const BAND_LOOKS: Record<RiskBand, Omit<Look, 'severity'>> = {
  low: { label: 'Low', icon: 'pi pi-angle-down' },
  mid: { label: 'Middle', icon: 'pi pi-minus' },
  high: { label: 'High', icon: 'pi pi-angle-double-up' },
};

/** Radians as whole degrees: "4°". */
export function degrees(radians: number, digits = 0): string {
  return `${((radians * 180) / Math.PI).toFixed(digits)}°`;
}

// ---------------------------------------------------------------------------------------
// Review state

export interface ReviewHeadline {
  /** Short state for a tag. */
  state: 'final' | 'provisional' | 'voided';
  look: Look;
  title: string;
  text: string;
}

export const REVIEW_STATUS_LABELS: Record<ReviewStatus, string> = {
  not_required: 'No review needed',
  awaiting: 'Waiting for an assessor',
  in_review: 'In review',
  confirmed: 'Confirmed',
  amended: 'Amended',
  voided: 'Voided',
};

export const REVIEW_STATUS_LOOKS: Record<ReviewStatus, Look> = {
  not_required: { label: 'No review needed', icon: 'pi pi-check', severity: 'secondary' },
  awaiting: { label: 'Waiting', icon: 'pi pi-clock', severity: 'warn' },
  in_review: { label: 'In review', icon: 'pi pi-eye', severity: 'info' },
  confirmed: { label: 'Confirmed', icon: 'pi pi-verified', severity: 'success' },
  amended: { label: 'Amended', icon: 'pi pi-pen-to-square', severity: 'info' },
  voided: { label: 'Voided', icon: 'pi pi-ban', severity: 'secondary' },
};

/** What the report says about the result's standing, from the review. */
export function reviewHeadline(review: ReviewInfo): ReviewHeadline {
  switch (review.status) {
    case 'awaiting':
    case 'in_review':
      return {
        state: 'provisional',
        look: { label: 'Provisional', icon: 'pi pi-clock', severity: 'warn' },
        title: 'Provisional result',
        text:
          review.status === 'awaiting'
            ? 'This exam drive waits for an assessor. The score below is the scoring engine’s and may still change; it counts once an assessor signs the review.'
            : `${review.assessorName ?? 'An assessor'} is reviewing this exam drive. The score below is the scoring engine’s and may still change.`,
      };
    case 'voided':
      return {
        state: 'voided',
        look: { label: 'Voided', icon: 'pi pi-ban', severity: 'secondary' },
        title: 'This attempt was voided',
        text: 'An assessor voided this attempt after a technical fault. It does not count for or against a level, and the exam seat went back to the organization.',
      };
    case 'confirmed':
      return {
        state: 'final',
        look: { label: 'Final', icon: 'pi pi-verified', severity: 'success' },
        title: 'Final result, confirmed',
        text: `${review.assessorName ?? 'An assessor'} reviewed this drive and confirmed the score.`,
      };
    case 'amended':
      return {
        state: 'final',
        look: { label: 'Final', icon: 'pi pi-verified', severity: 'success' },
        title: 'Final result, amended',
        text: `${review.assessorName ?? 'An assessor'} reviewed this drive and amended the score. Each change and its reason is listed below.`,
      };
    default:
      return {
        state: 'final',
        look: { label: 'Final', icon: 'pi pi-verified', severity: 'success' },
        title: 'Final result',
        text: 'This drive did not need an assessor’s review: the score below is final.',
      };
  }
}

/** The score to show as the result: the final one once signed (amended if so), else the engine's. */
export function shownScore(report: Pick<AttemptReport, 'score' | 'finalScore'>): AttemptScore {
  return report.finalScore ?? report.score;
}

// ---------------------------------------------------------------------------------------
// Score breakdown

export interface BreakdownRow {
  key: keyof ScoreParts;
  label: string;
  /** 0..1, or null when the trial asked for no estimate pins. */
  part: number | null;
  /** The rubric's weight. */
  weight: number;
  /** Share of the total this part carries (weight over the weights that count). */
  share: number;
  /** Points this part adds to the total (0..100 scale). */
  points: number;
}

const PART_LABELS: Record<keyof ScoreParts, string> = {
  calls: 'Calls',
  estimates: 'Estimate pins',
  docking: 'Docking',
  time: 'Time',
};

/**
 * The parts times the rubric's weights, as shared/scoring's combine() totals them: a part that
 * does not apply (no estimate pins asked) carries no weight.
 */
export function scoreBreakdown(parts: ScoreParts, weights: Rubric['weights']): { rows: BreakdownRow[]; total: number } {
  const keys: (keyof ScoreParts)[] = ['calls', 'estimates', 'docking', 'time'];
  const counted = keys.map((key) => ({ key, part: parts[key], weight: parts[key] === null ? 0 : weights[key] }));
  const weightSum = counted.reduce((s, c) => s + c.weight, 0) || 1;
  const rows = counted.map(({ key, part, weight }) => ({
    key,
    label: PART_LABELS[key],
    part,
    weight: weights[key],
    share: weight / weightSum,
    points: (100 * weight * (part ?? 0)) / weightSum,
  }));
  return { rows, total: rows.reduce((s, r) => s + r.points, 0) };
}

// ---------------------------------------------------------------------------------------
// The drive in the trace

/** Drive time after `position` steps of the trace (position 0: the start). */
export function timeAtPosition(trace: readonly TraceStep[], position: number): number {
  return position <= 0 ? 0 : trace[Math.min(position, trace.length) - 1].t;
}

/**
 * The trace position (steps applied) at which a call was made: the first moment the drive time
 * reached the call's time. Time grows by a control period each step up to the call, so this is
 * the position the scoring rebuilt the belief to; a re-anchor or halt step that follows at the
 * same time is not passed over.
 */
export function callPosition(trace: readonly TraceStep[], callTime: number): number {
  const eps = 1e-9;
  let lo = 0;
  let hi = trace.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (timeAtPosition(trace, mid) >= callTime - eps) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

export interface ContactEpisode {
  /** Trace position just after the contact step (the moment it is seen). */
  position: number;
  obstacleId: string;
  truth: Pose;
  time: number;
}

/** Contacts in the trace, one per episode: consecutive contact steps on one obstacle count once. */
export function contactEpisodes(trace: readonly TraceStep[]): ContactEpisode[] {
  const out: ContactEpisode[] = [];
  let previous: string | undefined;
  trace.forEach((step, index) => {
    if (step.contact && step.contact !== previous) {
      out.push({ position: index + 1, obstacleId: step.contact, truth: step.truth, time: step.t });
    }
    previous = step.contact;
  });
  return out;
}

/**
 * The believed (odometry) and true paths as flat x, y arrays. The believed path breaks (a NaN
 * pair) where the belief restarted: a re-anchoring or an assisted recovery moves the odometry
 * pose without driving there.
 */
export function drivePaths(trace: readonly TraceStep[], start: Pose): { believed: number[]; truth: number[] } {
  const believed = [start.x, start.y];
  const truth = [start.x, start.y];
  for (const step of trace) {
    if (step.reanchor) believed.push(NaN, NaN);
    const b = believed.length;
    if (step.reanchor || believed[b - 2] !== step.odometry.x || believed[b - 1] !== step.odometry.y) believed.push(step.odometry.x, step.odometry.y);
    const n = truth.length;
    if (truth[n - 2] !== step.truth.x || truth[n - 1] !== step.truth.y) truth.push(step.truth.x, step.truth.y);
  }
  return { believed, truth };
}

/** Odometry distance driven, metres (re-anchoring jumps are not driven). */
export function distanceDriven(trace: readonly TraceStep[], start: Pose): number {
  let d = 0;
  let prev = start;
  for (const step of trace) {
    if (!step.reanchor) d += Math.hypot(step.odometry.x - prev.x, step.odometry.y - prev.y);
    prev = step.odometry;
  }
  return d;
}

/**
 * Odometry distance at a trace position as the scoring's uncertainty chart counts it (every step's
 * odometry change, re-anchoring jumps included), so marks placed on that chart line up with it.
 */
export function chartDistanceAt(trace: readonly TraceStep[], start: Pose, position: number): number {
  let d = 0;
  let prev = start;
  for (let i = 0; i < Math.min(position, trace.length); i++) {
    d += Math.hypot(trace[i].odometry.x - prev.x, trace[i].odometry.y - prev.y);
    prev = trace[i].odometry;
  }
  return d;
}

/** How far the true pose was from the estimate pin, and whether the pin's ring held it. */
export function pinMiss(call: Pick<CallScore, 'estimate' | 'truth'>): { distance: number; inside: boolean } | null {
  if (!call.estimate) return null;
  const { pin } = call.estimate;
  const distance = Math.hypot(call.truth.x - pin.x, call.truth.y - pin.y);
  return { distance, inside: distance <= pin.radius };
}

/** Which calls an assessor changed: callPointId → the engine's grade, for "was … now …". */
export function amendedCalls(report: Pick<AttemptReport, 'score' | 'review'>): Map<string, Grade> {
  const out = new Map<string, Grade>();
  for (const a of report.review.amendments) {
    if (a.target !== 'call') continue;
    const engine = report.score.calls.find((c) => c.callPointId === a.callPointId);
    if (engine) out.set(a.callPointId, engine.grade);
  }
  return out;
}

/** Words for one amendment, as the report and the audit log list them. */
export function amendmentText(
  a: AttemptReport['review']['amendments'][number],
  labelOf: (callPointId: string) => string,
): string {
  switch (a.target) {
    case 'call':
      return `Call at ${labelOf(a.callPointId)} graded ${GRADE_LOOKS[a.grade].label.toLowerCase()}`;
    case 'contacts':
      return `Contacts set to ${a.contacts}`;
    case 'docking':
      return `Docking part set to ${percent(a.dockScore, 0)}`;
    case 'time':
      return `Time part set to ${percent(a.timeScore, 0)}`;
  }
}

/** The box around the drive: both paths and, at each call, the ring, the cloud sample and the pin. */
export function driveBox(trace: readonly TraceStep[], start: Pose, calls: readonly CallScore[]): { minX: number; minY: number; maxX: number; maxY: number } {
  const box = { minX: start.x, minY: start.y, maxX: start.x, maxY: start.y };
  const add = (x: number, y: number, r = 0) => {
    box.minX = Math.min(box.minX, x - r);
    box.minY = Math.min(box.minY, y - r);
    box.maxX = Math.max(box.maxX, x + r);
    box.maxY = Math.max(box.maxY, y + r);
  };
  for (const step of trace) {
    add(step.odometry.x, step.odometry.y);
    add(step.truth.x, step.truth.y);
  }
  for (const c of calls) {
    add(c.belief.odometry.x, c.belief.odometry.y, c.belief.ring.major);
    for (let i = 0; i < c.cloudSample.x.length; i++) add(c.cloudSample.x[i], c.cloudSample.y[i]);
    if (c.estimate) add(c.estimate.pin.x, c.estimate.pin.y, c.estimate.pin.radius);
  }
  // A little room for the robot's footprint and the call numbers.
  return { minX: box.minX - 1, minY: box.minY - 1, maxX: box.maxX + 1, maxY: box.maxY + 1 };
}
