/**
 * Turns a gamepad's sticks into a drive command. The browser's "standard" mapping
 * (W3C Gamepad, §"Remapping"): axes 0/1 are the left stick (x right, y down), axes 2/3 the right
 * stick; button 0 is the bottom face button, 1 the right one.
 *
 * Our mapping: left stick up/down = speed, left stick left/right (or the right stick, whichever is
 * pushed further) = turn rate; the right face button (1) = emergency stop. A radial dead zone keeps
 * a resting stick from creeping the robot, and the stick's travel beyond it is rescaled to 0..1 so
 * the smallest speeds stay reachable.
 */
import type { Command } from '@shared/sim';

export const GAMEPAD_DEAD_ZONE = 0.15;
export const STOP_BUTTON = 1;

export interface DriveLimits {
  maxSpeed: number;
  maxReverseSpeed: number;
  maxTurnRate: number;
}

/** Applies a dead zone to one axis value and rescales what is left to -1..1. */
export function deadZone(value: number, zone = GAMEPAD_DEAD_ZONE): number {
  if (!Number.isFinite(value)) return 0;
  const magnitude = Math.min(1, Math.abs(value));
  if (magnitude <= zone) return 0;
  return (Math.sign(value) * (magnitude - zone)) / (1 - zone);
}

/** Radial dead zone on a stick (x, y): keeps the direction, rescales the length beyond the zone. */
export function stickDeadZone(x: number, y: number, zone = GAMEPAD_DEAD_ZONE): [number, number] {
  const fx = Number.isFinite(x) ? x : 0;
  const fy = Number.isFinite(y) ? y : 0;
  const length = Math.hypot(fx, fy);
  if (length <= zone) return [0, 0];
  const scaled = Math.min(1, (Math.min(1, length) - zone) / (1 - zone));
  return [(fx / length) * scaled, (fy / length) * scaled];
}

export interface PadReading {
  /** The command the sticks ask for. */
  command: Command;
  /** The emergency stop button is down. */
  stop: boolean;
  /** Any stick is outside its dead zone or a button is down: the pad is in use. */
  active: boolean;
}

export function readGamepad(
  axes: readonly number[],
  buttons: readonly { pressed: boolean }[],
  limits: DriveLimits,
  zone = GAMEPAD_DEAD_ZONE,
): PadReading {
  const [lx, ly] = stickDeadZone(axes[0] ?? 0, axes[1] ?? 0, zone);
  const rx = deadZone(axes[2] ?? 0, zone);
  const forward = -ly; // stick y grows downwards
  const turn = Math.abs(rx) > Math.abs(lx) ? rx : lx;
  const v = forward >= 0 ? forward * limits.maxSpeed : forward * limits.maxReverseSpeed;
  const w = -turn * limits.maxTurnRate; // pushing right turns clockwise: negative turn rate
  const stop = buttons[STOP_BUTTON]?.pressed ?? false;
  const anyButton = buttons.some((b) => b?.pressed);
  return {
    command: stop ? { v: 0, w: 0 } : { v: v === 0 ? 0 : v, w: w === 0 ? 0 : w },
    stop,
    active: v !== 0 || w !== 0 || anyButton,
  };
}
