/** The attempt report's own logic: breakdown by weights, wording of risks and bands, review states, paths. */
import { describe, expect, it } from 'vitest';
import type { ReviewInfo } from '@shared/schemas';
import { applyAmendments } from '@shared/scoring';
import type { TraceStep } from '@shared/sim';
import {
  GRADE_LOOKS,
  amendedCalls,
  amendmentText,
  bandText,
  callPosition,
  chartDistanceAt,
  distanceDriven,
  drivePaths,
  percent,
  pinMiss,
  reviewHeadline,
  scoreBreakdown,
  shownScore,
} from '@/components/report/report-logic';
import { scoredDrive } from './report-fixtures';

const review = (over: Partial<ReviewInfo>): ReviewInfo => ({
  status: 'not_required',
  assessorId: null,
  assessorName: null,
  claimedAt: null,
  verdict: null,
  reason: null,
  amendments: [],
  signedAt: null,
  ...over,
});

describe('score breakdown', () => {
  it('the parts times the weights add up to the total the scoring gave (estimate pins asked)', async () => {
    const drive = await scoredDrive('wash-bay-crossing', () => 'proceed');
    const { score } = drive;
    expect(score.parts.estimates).not.toBeNull();
    const { rows, total } = scoreBreakdown(score.parts, drive.trial.rubric.weights);
    // shared/scoring rounds the total to one decimal.
    expect(Math.abs(total - score.total)).toBeLessThanOrEqual(0.05 + 1e-9);
    expect(rows.map((r) => r.key)).toEqual(['calls', 'estimates', 'docking', 'time']);
    expect(rows.reduce((s, r) => s + r.share, 0)).toBeCloseTo(1, 12);

    // After an amendment the breakdown follows the amended parts.
    const amended = applyAmendments(score, [{ target: 'docking', dockScore: 0.5, reason: 'Dock plate mis-surveyed by 10 cm.' }], drive.trial.rubric);
    expect(Math.abs(scoreBreakdown(amended.parts, drive.trial.rubric.weights).total - amended.total)).toBeLessThanOrEqual(0.05 + 1e-9);
  });

  it('a part that does not apply carries no weight', () => {
    const weights = { calls: 0.5, estimates: 0.2, docking: 0.2, time: 0.1 };
    const { rows, total } = scoreBreakdown({ calls: 1, estimates: null, docking: 0.5, time: 0 }, weights);
    expect(rows.find((r) => r.key === 'estimates')).toMatchObject({ part: null, share: 0, points: 0, weight: 0.2 });
    // (0.5·1 + 0.2·0.5 + 0.1·0) / 0.8 = 0.75
    expect(total).toBeCloseTo(75, 12);
  });
});

describe('words and marks', () => {
  it('risks as percentages; tiny risks do not read as zero', () => {
    expect(percent(0.034)).toBe('3.4 %');
    expect(percent(0)).toBe('0.0 %');
    expect(percent(0.0004)).toBe('< 0.1 %');
    expect(percent(1)).toBe('100.0 %');
    expect(percent(Number.NaN)).toBe('—');
  });

  it('bands by the rubric’s edges', () => {
    expect(bandText('low', [0.02, 0.1])).toBe('Low: under 2 %');
    expect(bandText('mid', [0.02, 0.1])).toBe('Middle: 2 % to 10 %');
    expect(bandText('high', [0.025, 0.1])).toBe('High: 10 % or more');
  });

  it('every grade has a word and an icon of its own', () => {
    const labels = Object.values(GRADE_LOOKS).map((l) => l.label);
    const icons = Object.values(GRADE_LOOKS).map((l) => l.icon);
    expect(new Set(labels).size).toBe(5);
    expect(new Set(icons).size).toBe(5);
  });

  it('the review headline: provisional while waiting, final when signed, voided says so', () => {
    expect(reviewHeadline(review({ status: 'awaiting' })).state).toBe('provisional');
    expect(reviewHeadline(review({ status: 'in_review', assessorName: 'Priya Castellane' })).text).toContain('Priya Castellane is reviewing');
    expect(reviewHeadline(review({ status: 'confirmed', assessorName: 'Priya Castellane' }))).toMatchObject({ state: 'final', title: 'Final result, confirmed' });
    expect(reviewHeadline(review({ status: 'amended' })).title).toBe('Final result, amended');
    expect(reviewHeadline(review({ status: 'voided' }))).toMatchObject({ state: 'voided', title: 'This attempt was voided' });
    expect(reviewHeadline(review({ status: 'not_required' })).state).toBe('final');
  });
});

describe('amendments in the report', () => {
  it('names the calls an assessor changed with the engine’s grade, and words each change', async () => {
    const drive = await scoredDrive('wash-bay-crossing', () => 'proceed');
    const first = drive.score.calls[0];
    const amendments = [
      { target: 'call' as const, callPointId: first.callPointId, grade: 'risky' as const, reason: 'Marker glare at the door.' },
      { target: 'time' as const, timeScore: 0.25, reason: 'Lift outage held the robot.' },
    ];
    const report = { score: drive.score, review: review({ status: 'amended', amendments }) };
    expect([...amendedCalls(report)]).toEqual([[first.callPointId, first.grade]]);
    expect(amendmentText(amendments[0], () => first.label)).toBe(`Call at ${first.label} graded risky`);
    expect(amendmentText(amendments[1], () => '')).toBe('Time part set to 25 %');
    expect(amendmentText({ target: 'contacts', contacts: 0, reason: 'x'.repeat(10) }, () => '')).toBe('Contacts set to 0');
    expect(shownScore({ score: drive.score, finalScore: null })).toBe(drive.score);
  });
});

describe('paths and pins', () => {
  const pose = (x: number, y = 0) => ({ x, y, theta: 0 });
  const trace: TraceStep[] = [
    { t: 0.1, odometry: pose(1), truth: pose(1, 0.1), source: 'command' },
    { t: 0.2, odometry: pose(1), truth: pose(1, 0.1), source: 'command' },
    { t: 20, odometry: pose(1.5, 0.2), truth: pose(1, 0.1), source: 'pass', reanchor: { position: 0.02, heading: 0.01 } },
    { t: 20.1, odometry: pose(2.5, 0.2), truth: pose(2, 0.2), source: 'pass' },
  ];

  it('the believed path breaks where the belief restarted; standing still adds no points', () => {
    const { believed, truth } = drivePaths(trace, pose(0));
    expect(believed).toEqual([0, 0, 1, 0, NaN, NaN, 1.5, 0.2, 2.5, 0.2]);
    expect(truth).toEqual([0, 0, 1, 0.1, 2, 0.2]);
    expect(distanceDriven(trace, pose(0))).toBeCloseTo(2, 12);
  });

  it('tells whether the estimate pin’s ring held the true pose', () => {
    const estimate = { pin: { x: 1, y: 1, radius: 0.5 }, coverage: 0.9, sharpness: 0.5, score: 0.47 };
    expect(pinMiss({ estimate, truth: pose(1.3, 1.4) })).toEqual({ distance: 0.5, inside: true });
    expect(pinMiss({ estimate, truth: pose(2, 1) })?.inside).toBe(false);
    expect(pinMiss({ estimate: null, truth: pose(0) })).toBeNull();
  });
});

describe('calls on the uncertainty chart', () => {
  it('distances are counted as the scoring counts them, so calls line up with its chart', async () => {
    const drive = await scoredDrive('wash-bay-crossing', (markers) => (markers.length ? 'reanchor' : 'halt'));
    expect(drive.trace.some((s) => s.reanchor)).toBe(true);
    const cumulative = new Set(drive.trace.map((_s, i) => chartDistanceAt(drive.trace, drive.trial.start, i + 1)));
    cumulative.add(0);
    // Every point of the scoring's chart sits exactly at one of these distances (same sums, same order).
    for (const point of drive.score.uncertainty) expect(cumulative.has(point.distance), String(point.distance)).toBe(true);
    const last = chartDistanceAt(drive.trace, drive.trial.start, drive.trace.length);
    expect(last).toBeGreaterThanOrEqual(distanceDriven(drive.trace, drive.trial.start));
    for (const call of drive.score.calls) {
      const d = chartDistanceAt(drive.trace, drive.trial.start, callPosition(drive.trace, call.time));
      expect(d).toBeGreaterThan(0);
      expect(d).toBeLessThanOrEqual(last);
    }
  });
});
