import { describe, expect, it } from 'vitest';
import {
  alphasLine,
  degrees,
  fileSize,
  fixed,
  legRadius,
  mm,
  ratio,
  ratioDeviation,
  scientific,
  toDegrees,
  toMetres,
  toMillimetres,
} from '@/components/fleet/fleet-format';

describe('fleet calibration units', () => {
  it('converts metres and millimetres both ways, and radians to degrees', () => {
    expect(toMillimetres(0.0125)).toBeCloseTo(12.5, 12);
    expect(toMetres(75)).toBeCloseTo(0.075, 12);
    // π rad = 180° (definition of the radian).
    expect(toDegrees(Math.PI)).toBeCloseTo(180, 12);
    expect(toDegrees(Math.PI / 2)).toBeCloseTo(90, 12);
  });

  it('writes lengths in millimetres and angles in degrees with a real minus sign and no −0', () => {
    expect(mm(0.0123)).toBe('12.3 mm');
    expect(mm(-0.0123)).toBe('\u221212.3 mm');
    expect(mm(-0.00001)).toBe('0.0 mm');
    expect(degrees(Math.PI / 180)).toBe('1.000°');
    expect(degrees(-0.5 * (Math.PI / 180), 2)).toBe('\u22120.50°');
    expect(fixed(-0.0004, 3)).toBe('0.000');
  });

  it('writes ratios and their distance from 1 in per cent', () => {
    expect(ratio(1.0031234)).toBe('1.00312');
    expect(ratioDeviation(1.0031)).toBe('+0.31 %');
    expect(ratioDeviation(0.9995)).toBe('\u22120.05 %');
    expect(ratioDeviation(1)).toBe('0.00 %');
    expect(ratioDeviation(1.00001)).toBe('0.00 %');
  });

  it('writes the leg radius in metres, or straight legs when the server sent no finite radius', () => {
    expect(legRadius(312.44)).toBe('312.4 m');
    expect(legRadius(-1520.6)).toBe('\u22121521 m');
    expect(legRadius(4.567)).toBe('4.57 m');
    expect(legRadius(null)).toBe('straight legs (β = 0)');
    expect(legRadius(Infinity)).toBe('straight legs (β = 0)');
  });

  it('writes small alphas in scientific notation with superscript powers', () => {
    expect(scientific(0.00241)).toBe('2.41 × 10\u207b\u00b3');
    expect(scientific(2.5e-5, 2)).toBe('2.5 × 10\u207b\u2075');
    expect(scientific(0)).toBe('0');
    expect(scientific(0.0512)).toBe('0.0512');
    expect(scientific(1.25)).toBe('1.25');
    expect(scientific(Number.NaN)).toBe('—');
    expect(alphasLine([0.002, 0, 1e-4, 0.03])).toBe('a1 2.0 × 10\u207b\u00b3 · a2 0 · a3 1.0 × 10\u207b\u2074 · a4 0.030');
  });

  it('writes file sizes', () => {
    expect(fileSize(512)).toBe('512 B');
    expect(fileSize(3400)).toBe('3.4 kB');
    expect(fileSize(1_250_000)).toBe('1.3 MB');
  });
});
