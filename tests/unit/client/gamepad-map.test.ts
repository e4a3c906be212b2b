import { describe, expect, it } from 'vitest';
import { GAMEPAD_DEAD_ZONE, STOP_BUTTON, deadZone, readGamepad, stickDeadZone } from '@/drive/gamepad-map';
import { FINE_SPEED, FINE_TURN, keyboardCommand, type DriveKey } from '@/drive/keyboard-map';

const limits = { maxSpeed: 1.2, maxReverseSpeed: 0.3, maxTurnRate: 1.0 };
const buttons = (pressed: number[] = []) => Array.from({ length: 17 }, (_, i) => ({ pressed: pressed.includes(i) }));

describe('gamepad dead zone', () => {
  it('ignores a resting stick and rescales the travel beyond the zone to 0..1', () => {
    expect(deadZone(0.1)).toBe(0);
    expect(deadZone(-GAMEPAD_DEAD_ZONE)).toBe(0);
    expect(deadZone(1)).toBe(1);
    expect(deadZone(-1)).toBe(-1);
    // Halfway through the live travel gives half the output.
    expect(deadZone(GAMEPAD_DEAD_ZONE + (1 - GAMEPAD_DEAD_ZONE) / 2)).toBeCloseTo(0.5, 12);
    expect(deadZone(Number.NaN)).toBe(0);
    expect(deadZone(1.3)).toBe(1);
  });

  it('is radial on a stick: a diagonal inside the zone stays still, the direction is kept outside it', () => {
    expect(stickDeadZone(0.1, 0.1)).toEqual([0, 0]);
    const [x, y] = stickDeadZone(0.6, 0.8);
    expect(Math.hypot(x, y)).toBeCloseTo(1, 12);
    expect(x / y).toBeCloseTo(0.75, 12);
  });
});

describe('gamepad mapping (standard layout)', () => {
  it('drives forward with the left stick pushed up (axis 1 negative)', () => {
    const r = readGamepad([0, -1, 0, 0], buttons(), limits);
    expect(r.command).toEqual({ v: 1.2, w: 0 });
    expect(r.active).toBe(true);
  });

  it('reverses at most at the reverse limit', () => {
    expect(readGamepad([0, 1, 0, 0], buttons(), limits).command).toEqual({ v: -0.3, w: 0 });
  });

  it('turns clockwise (negative turn rate) with a stick pushed right, left stick or right stick', () => {
    expect(readGamepad([1, 0, 0, 0], buttons(), limits).command).toEqual({ v: 0, w: -1 });
    expect(readGamepad([0, 0, -1, 0], buttons(), limits).command).toEqual({ v: 0, w: 1 });
    // The stick pushed further wins.
    expect(readGamepad([0.5, 0, -1, 0], buttons(), limits).command.w).toBe(1);
  });

  it('reads a resting pad as idle, with an exact zero command', () => {
    const r = readGamepad([0.05, -0.08, 0.1, 0.02], buttons(), limits);
    expect(r).toEqual({ command: { v: 0, w: 0 }, stop: false, active: false });
    expect(Object.is(r.command.w, -0)).toBe(false);
  });

  it('the stop button zeroes the command whatever the sticks say', () => {
    const r = readGamepad([0, -1, 0, 0], buttons([STOP_BUTTON]), limits);
    expect(r.command).toEqual({ v: 0, w: 0 });
    expect(r.stop).toBe(true);
  });

  it('copes with pads that report fewer axes', () => {
    expect(readGamepad([0, -1], [], limits).command).toEqual({ v: 1.2, w: 0 });
  });
});

describe('keyboard mapping', () => {
  const held = (...keys: DriveKey[]) => new Set(keys);

  it('maps held keys to the robot limits, opposite keys cancelling', () => {
    expect(keyboardCommand(held('forward'), false, limits)).toEqual({ v: 1.2, w: 0 });
    expect(keyboardCommand(held('reverse'), false, limits)).toEqual({ v: -0.3, w: 0 });
    expect(keyboardCommand(held('forward', 'left'), false, limits)).toEqual({ v: 1.2, w: 1 });
    expect(keyboardCommand(held('right'), false, limits)).toEqual({ v: 0, w: -1 });
    expect(keyboardCommand(held('left', 'right', 'forward', 'reverse'), false, limits)).toEqual({ v: 0, w: 0 });
  });

  it('scales down with fine control', () => {
    expect(keyboardCommand(held('forward', 'left'), true, limits)).toEqual({ v: 1.2 * FINE_SPEED, w: FINE_TURN });
  });
});
