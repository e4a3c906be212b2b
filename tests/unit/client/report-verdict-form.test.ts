/** The assessor's verdict form → the API body, checked with the shared verdictSchema, messages back on their fields. */
import { beforeAll, describe, expect, it } from 'vitest';
import { verdictSchema, type Rubric } from '@shared/schemas';
import { applyAmendments, type AttemptScore } from '@shared/scoring';
import { checkVerdict, emptyVerdictForm, fieldKeys, previewAmended, serverFieldErrors, verdictBody, type VerdictForm } from '@/components/report/verdict-form';
import { scoredDrive } from './report-fixtures';

let score: AttemptScore;
let rubric: Rubric;
let west: string;
let south: string;

beforeAll(async () => {
  const drive = await scoredDrive('wash-bay-crossing', () => 'proceed');
  score = drive.score;
  rubric = drive.trial.rubric;
  [west, south] = score.calls.map((c) => c.callPointId);
});

const form = (change: (f: VerdictForm) => void = () => undefined): VerdictForm => {
  const f = emptyVerdictForm(score);
  change(f);
  return f;
};
const REASON = 'Marker glare made the marker unreadable at the door.';

describe('an empty form', () => {
  it('starts with every call and outcome at the engine’s value, nothing chosen', () => {
    const f = form();
    expect(f.verdict).toBeNull();
    expect(f.calls.map((c) => [c.callPointId, c.engineGrade, c.change])).toEqual(score.calls.map((c) => [c.callPointId, c.grade, false]));
    expect(f.contacts.value).toBe(score.outcome.contacts);
    expect(f.docking.value).toBeCloseTo(score.parts.docking * 100, 1);
    expect(checkVerdict(f)).toEqual({ ok: false, errors: { verdict: 'Choose confirm, amend or void.' } });
  });
});

describe('confirm and void', () => {
  it('confirm needs no reason; a reason given must be at least 10 characters', () => {
    expect(checkVerdict(form((f) => (f.verdict = 'confirm')))).toEqual({ ok: true, body: { verdict: 'confirm' } });
    expect(checkVerdict(form((f) => Object.assign(f, { verdict: 'confirm', reason: 'fine' })))).toEqual({
      ok: false,
      errors: { reason: 'Write the reason in at least 10 characters.' },
    });
    expect(checkVerdict(form((f) => Object.assign(f, { verdict: 'confirm', reason: '  Replay matches the score.  ' })))).toEqual({
      ok: true,
      body: { verdict: 'confirm', reason: 'Replay matches the score.' },
    });
  });

  it('void needs a reason; rows changed for an amend are not sent with it', () => {
    const noReason = checkVerdict(form((f) => (f.verdict = 'void')));
    expect(noReason.ok).toBe(false);
    expect(!noReason.ok && noReason.errors.reason).toBe('Write the reason in at least 10 characters.');
    const ok = checkVerdict(
      form((f) => {
        f.verdict = 'void';
        f.reason = 'The drive froze for 40 s on our side.';
        f.calls[0].change = true;
      }),
    );
    expect(ok).toEqual({ ok: true, body: { verdict: 'void', reason: 'The drive froze for 40 s on our side.' } });
  });
});

describe('amend', () => {
  it('needs at least one change', () => {
    expect(checkVerdict(form((f) => (f.verdict = 'amend')))).toEqual({ ok: false, errors: { amendments: 'Amend at least one thing.' } });
  });

  it('a changed call needs a new grade (not the engine’s) and its own reason', () => {
    const missing = checkVerdict(
      form((f) => {
        f.verdict = 'amend';
        f.calls[1].change = true;
      }),
    );
    expect(missing).toEqual({
      ok: false,
      errors: { [fieldKeys.callGrade(south)]: 'Choose the new grade.', [fieldKeys.callReason(south)]: 'Write the reason in at least 10 characters.' },
    });
    const same = checkVerdict(
      form((f) => {
        f.verdict = 'amend';
        Object.assign(f.calls[1], { change: true, grade: f.calls[1].engineGrade, reason: REASON });
      }),
    );
    expect(same.ok).toBe(false);
    expect(!same.ok && same.errors[fieldKeys.callGrade(south)]).toMatch(/other than the engine/);
  });

  it('builds the body from the changed rows only, in order, with percentages as shares', () => {
    const f = form((f) => {
      f.verdict = 'amend';
      f.reason = 'Replay shows the door sensor reported late.';
      Object.assign(f.calls[1], { change: true, grade: 'risky', reason: REASON });
      Object.assign(f.docking, { change: true, value: 50, reason: 'Dock plate was mis-surveyed by 10 cm on this site.' });
      Object.assign(f.time, { change: true, value: 100, reason: 'A lift outage held the robot for 30 s.' });
      // Typed in, then unticked: not sent.
      Object.assign(f.contacts, { change: false, value: 3, reason: 'never sent' });
    });
    const checked = checkVerdict(f);
    const expected = {
      verdict: 'amend',
      reason: 'Replay shows the door sensor reported late.',
      amendments: [
        { target: 'call', callPointId: south, grade: 'risky', reason: REASON },
        { target: 'docking', dockScore: 0.5, reason: 'Dock plate was mis-surveyed by 10 cm on this site.' },
        { target: 'time', timeScore: 1, reason: 'A lift outage held the robot for 30 s.' },
      ],
    };
    expect(checked).toEqual({ ok: true, body: expected });
    // The same body the server's schema accepts.
    expect(verdictSchema.parse(verdictBody(f))).toEqual(expected);
  });

  it('puts outcome messages on their own fields', () => {
    const checked = checkVerdict(
      form((f) => {
        f.verdict = 'amend';
        Object.assign(f.contacts, { change: true, value: 1.5, reason: 'The bumper touched twice.' });
        Object.assign(f.docking, { change: true, value: 120, reason: 'short' });
        Object.assign(f.time, { change: true, value: null, reason: 'A lift outage held the robot.' });
      }),
    );
    expect(checked).toEqual({
      ok: false,
      errors: {
        [fieldKeys.outcomeValue('contacts')]: 'Enter the number of contacts: a whole number, 0 or more.',
        [fieldKeys.outcomeValue('docking')]: 'Enter a percentage from 0 to 100.',
        [fieldKeys.outcomeReason('docking')]: 'Write the reason in at least 10 characters.',
        [fieldKeys.outcomeValue('time')]: 'Enter a percentage from 0 to 100.',
      },
    });
  });

  it('maps the server’s field names back to the fields', () => {
    const f = form((f) => {
      f.verdict = 'amend';
      Object.assign(f.calls[0], { change: true, grade: 'sound', reason: REASON });
      Object.assign(f.docking, { change: true, value: 40, reason: REASON });
    });
    expect(serverFieldErrors(f, { 'amendments.0.callPointId': 'No call was made at that call point.', 'amendments.1.reason': 'Write the reason.', reason: 'Too long.', amendments: 'Amend at least one thing.' })).toEqual({
      [fieldKeys.callGrade(west)]: 'No call was made at that call point.',
      [fieldKeys.outcomeReason('docking')]: 'Write the reason.',
      reason: 'Too long.',
      amendments: 'Amend at least one thing.',
    });
  });

  it('previews the total as the server will total it', () => {
    const f = form((f) => {
      f.verdict = 'amend';
      Object.assign(f.calls[1], { change: true, grade: 'risky', reason: '' });
      Object.assign(f.docking, { change: true, value: 50, reason: '' });
      Object.assign(f.time, { change: true, value: 250, reason: '' });
    });
    const expected = applyAmendments(
      score,
      [
        { target: 'call', callPointId: south, grade: 'risky', reason: '' },
        { target: 'docking', dockScore: 0.5, reason: '' },
      ],
      rubric,
    );
    expect(previewAmended(f, score, rubric)).toEqual(expected);
    expect(previewAmended(form(), score, rubric)).toBe(score);
  });
});
