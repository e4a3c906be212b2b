/**
 * The console's keys, as physical key codes (KeyboardEvent.code), so WASD sits in the same place
 * on every layout. Shown on screen by KeyGuide.vue from this one list.
 */
import type { Command } from '@shared/sim';
import type { DriveLimits } from './gamepad-map';

export type DriveKey = 'forward' | 'reverse' | 'left' | 'right';

export const DRIVE_KEYS: Record<string, DriveKey> = {
  ArrowUp: 'forward',
  KeyW: 'forward',
  ArrowDown: 'reverse',
  KeyS: 'reverse',
  ArrowLeft: 'left',
  KeyA: 'left',
  ArrowRight: 'right',
  KeyD: 'right',
};

export const STOP_KEYS = ['Space', 'Escape'];
export const FINE_KEYS = ['ShiftLeft', 'ShiftRight'];

/** Share of the robot's limits used while Shift is held: for docking and tight gaps. */
export const FINE_SPEED = 0.25;
export const FINE_TURN = 0.4;

/** The key guide shown beside the map (the same list the handlers use). */
export const KEY_GUIDE: { keys: string[]; action: string }[] = [
  { keys: ['↑', 'W'], action: 'Drive forward' },
  { keys: ['↓', 'S'], action: 'Reverse (slow)' },
  { keys: ['←', 'A'], action: 'Turn left' },
  { keys: ['→', 'D'], action: 'Turn right' },
  { keys: ['Shift'], action: 'Hold for fine control (quarter speed)' },
  { keys: ['Space', 'Esc'], action: 'Emergency stop' },
  { keys: ['+', '−'], action: 'Zoom the map in or out' },
  { keys: ['0'], action: 'Fit the whole site' },
  { keys: ['F'], action: 'Follow the robot on or off' },
];

/** The command for the drive keys held down now. */
export function keyboardCommand(held: ReadonlySet<DriveKey>, fine: boolean, limits: DriveLimits): Command {
  const forward = (held.has('forward') ? 1 : 0) - (held.has('reverse') ? 1 : 0);
  const turn = (held.has('left') ? 1 : 0) - (held.has('right') ? 1 : 0);
  const speedShare = fine ? FINE_SPEED : 1;
  const turnShare = fine ? FINE_TURN : 1;
  const v = forward > 0 ? limits.maxSpeed * speedShare : forward < 0 ? -limits.maxReverseSpeed * speedShare : 0;
  const w = turn * limits.maxTurnRate * turnShare;
  return { v, w: w === 0 ? 0 : w };
}

/** Whether a key event comes from a field where keys mean typing, not driving. */
export function isTypingTarget(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable) return true;
  if (target instanceof HTMLTextAreaElement || target instanceof HTMLSelectElement) return true;
  if (target instanceof HTMLInputElement) return !['button', 'checkbox', 'radio', 'submit', 'reset'].includes(target.type);
  return target.getAttribute('role') === 'spinbutton' || target.getAttribute('role') === 'slider';
}
