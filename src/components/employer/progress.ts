/** Words for operators, levels, orders and the seat ledger: text first, colour only as a second cue. */
import type { LevelProgress, OperatorProgress, SeatOrderView } from '@shared/schemas';
import type { SeatLedgerRow } from '@/api';

export type TagSeverity = 'success' | 'info' | 'warn' | 'danger' | 'secondary' | 'contrast';

export interface StatusChip {
  label: string;
  icon: string;
  severity: TagSeverity;
}

export type OperatorStatus = 'invited' | 'joined' | 'inactive';

export function operatorStatus(operator: Pick<OperatorProgress, 'active' | 'invited'>): OperatorStatus {
  if (!operator.active) return 'inactive';
  return operator.invited ? 'invited' : 'joined';
}

export const OPERATOR_STATUS_CHIPS: Record<OperatorStatus, StatusChip> = {
  invited: { label: 'Invited', icon: 'pi pi-envelope', severity: 'info' },
  joined: { label: 'Joined', icon: 'pi pi-check', severity: 'success' },
  inactive: { label: 'Inactive', icon: 'pi pi-ban', severity: 'secondary' },
};

/** "1/2 trials" */
export function trialsText(level: Pick<LevelProgress, 'trialsPassed' | 'trialsRequired'>): string {
  return `${level.trialsPassed}/${level.trialsRequired} trial${level.trialsRequired === 1 ? '' : 's'}`;
}

export const LEVEL_STATUS_LABELS: Record<LevelProgress['status'], string> = {
  not_started: 'not started',
  in_progress: 'in progress',
  passed: 'passed',
};

/** What one level cell of the progress table says. */
export function levelCell(level: LevelProgress): { text: string; detail: string; icon: string; tone: 'passed' | 'progress' | 'idle' | 'off' } {
  const trials = trialsText(level);
  if (level.status === 'passed') return { text: trials, detail: 'passed', icon: 'pi pi-verified', tone: 'passed' };
  if (!level.assigned) {
    // Trials passed for another level still count here; say so even when this level is not assigned.
    return level.trialsPassed > 0
      ? { text: trials, detail: 'not assigned', icon: 'pi pi-minus', tone: 'off' }
      : { text: 'Not assigned', detail: '', icon: 'pi pi-minus', tone: 'off' };
  }
  if (level.status === 'in_progress') return { text: trials, detail: 'in progress', icon: 'pi pi-spinner-dotted', tone: 'progress' };
  return { text: trials, detail: 'not started', icon: 'pi pi-circle', tone: 'idle' };
}

export const ORDER_STATUS_CHIPS: Record<SeatOrderView['status'], StatusChip> = {
  pending: { label: 'Awaiting payment', icon: 'pi pi-clock', severity: 'warn' },
  paid: { label: 'Paid', icon: 'pi pi-check', severity: 'success' },
  expired: { label: 'Not paid (expired)', icon: 'pi pi-times', severity: 'secondary' },
  refunded: { label: 'Refunded', icon: 'pi pi-replay', severity: 'secondary' },
  partially_refunded: { label: 'Partly refunded', icon: 'pi pi-replay', severity: 'info' },
};

export const LEDGER_KIND_LABELS: Record<SeatLedgerRow['kind'], string> = {
  purchase: 'Bought',
  grant: 'Granted by Driftproof',
  exam_start: 'Exam drive started',
  void_return: 'Returned (attempt voided)',
  refund: 'Refunded',
};

/** "+12", "−1" (a real minus sign). */
export function formatDelta(delta: number): string {
  return delta > 0 ? `+${delta}` : `−${Math.abs(delta)}`;
}

/** "12 seats", "1 seat" */
export function seatsText(n: number): string {
  return `${n} seat${n === 1 ? '' : 's'}`;
}

// ---------------------------------------------------------------------------------------
// The order page after the payment page

/**
 * Where an order stands for the buyer:
 * - confirming: back from a payment; the seats follow once the payment service confirms it;
 * - pending: not paid (yet); cancelled: the buyer left the payment page;
 * - paid (also partly or fully refunded later), expired.
 */
export type OrderPhase = 'confirming' | 'pending' | 'cancelled' | 'paid' | 'expired';

export function orderPhase(status: SeatOrderView['status'], checkout: string | null | undefined): OrderPhase {
  if (status === 'paid' || status === 'partially_refunded' || status === 'refunded') return 'paid';
  if (checkout === 'cancelled') return 'cancelled'; // left the payment page: the checkout is given up, pending or expired
  if (status === 'expired') return 'expired';
  if (checkout === 'success') return 'confirming';
  return 'pending';
}

/** Whether to keep asking the server (the webhook may still be on its way). */
export function shouldPoll(phase: OrderPhase): boolean {
  return phase === 'confirming' || phase === 'pending';
}

/**
 * How long to wait before asking again: every second for half a minute, then every five seconds
 * up to about five minutes; null means stop and offer a button instead.
 */
export function pollDelay(attempt: number): number | null {
  if (attempt < 30) return 1000;
  if (attempt < 84) return 5000;
  return null;
}
