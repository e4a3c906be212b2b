import { describe, expect, it } from 'vitest';
import type { LevelProgress } from '@shared/schemas';
import {
  LEDGER_KIND_LABELS,
  OPERATOR_STATUS_CHIPS,
  formatDelta,
  levelCell,
  operatorStatus,
  orderPhase,
  pollDelay,
  seatsText,
  shouldPoll,
  trialsText,
} from '@/components/employer/progress';

const level = (over: Partial<LevelProgress>): LevelProgress => ({
  levelId: 'aisle-operator',
  assigned: true,
  trialsPassed: 0,
  trialsRequired: 2,
  status: 'not_started',
  ...over,
});

describe('operators', () => {
  it('are invited, joined or inactive, each with a word and an icon', () => {
    expect(operatorStatus({ active: true, invited: true })).toBe('invited');
    expect(operatorStatus({ active: true, invited: false })).toBe('joined');
    expect(operatorStatus({ active: false, invited: true })).toBe('inactive');
    for (const chip of Object.values(OPERATOR_STATUS_CHIPS)) {
      expect(chip.label).not.toBe('');
      expect(chip.icon).toMatch(/^pi pi-/);
    }
  });

  it('show progress per level in words, not only in colour', () => {
    expect(trialsText({ trialsPassed: 1, trialsRequired: 2 })).toBe('1/2 trials');
    expect(trialsText({ trialsPassed: 0, trialsRequired: 1 })).toBe('0/1 trial');
    expect(levelCell(level({}))).toMatchObject({ text: '0/2 trials', detail: 'not started' });
    expect(levelCell(level({ trialsPassed: 1, status: 'in_progress' }))).toMatchObject({ text: '1/2 trials', detail: 'in progress' });
    expect(levelCell(level({ trialsPassed: 2, status: 'passed' }))).toMatchObject({ text: '2/2 trials', detail: 'passed' });
    expect(levelCell(level({ assigned: false }))).toMatchObject({ text: 'Not assigned', detail: '' });
    // A trial passed for another level counts here too; it is shown even when this level is not assigned.
    expect(levelCell(level({ assigned: false, trialsPassed: 1, status: 'in_progress' }))).toMatchObject({ text: '1/2 trials', detail: 'not assigned' });
    expect(levelCell(level({ assigned: false, trialsPassed: 2, status: 'passed' }))).toMatchObject({ detail: 'passed' });
  });
});

describe('seats', () => {
  it('are counted and signed in words', () => {
    expect(seatsText(1)).toBe('1 seat');
    expect(seatsText(12)).toBe('12 seats');
    expect(formatDelta(12)).toBe('+12');
    expect(formatDelta(-1)).toBe('−1');
    expect(Object.keys(LEDGER_KIND_LABELS).sort()).toEqual(['exam_start', 'grant', 'purchase', 'refund', 'void_return']);
  });
});

describe('the order page after the payment page', () => {
  it('waits for the confirmation after a payment and stops once the order is settled', () => {
    expect(orderPhase('pending', 'success')).toBe('confirming');
    expect(orderPhase('pending', 'cancelled')).toBe('cancelled');
    expect(orderPhase('pending', null)).toBe('pending');
    expect(orderPhase('paid', 'success')).toBe('paid');
    expect(orderPhase('partially_refunded', null)).toBe('paid');
    expect(orderPhase('refunded', undefined)).toBe('paid');
    expect(orderPhase('expired', 'success')).toBe('expired');
    expect(shouldPoll('confirming')).toBe(true);
    expect(shouldPoll('pending')).toBe(true);
    expect(shouldPoll('cancelled')).toBe(false);
    expect(shouldPoll('paid')).toBe(false);
    expect(shouldPoll('expired')).toBe(false);
  });

  it('asks every second at first, then every five seconds, and gives up after about five minutes', () => {
    const delays: number[] = [];
    for (let attempt = 0; ; attempt++) {
      const delay = pollDelay(attempt);
      if (delay === null) break;
      delays.push(delay);
    }
    expect(delays.slice(0, 30).every((d) => d === 1000)).toBe(true);
    const total = delays.reduce((a, b) => a + b, 0);
    expect(total).toBeGreaterThanOrEqual(4.5 * 60_000);
    expect(total).toBeLessThanOrEqual(5.5 * 60_000);
  });
});
