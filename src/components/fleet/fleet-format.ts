/**
 * How the fleet calibration pages write numbers: the engine works in metres and radians, the
 * pages show millimetres and degrees (what a tape measure and a protractor read), ratios with
 * enough digits to see a fraction of a per cent, and the alphas in scientific notation with
 * their units.
 */

/** Metres → millimetres. */
export function toMillimetres(metres: number): number {
  return metres * 1000;
}

/** Millimetres → metres. */
export function toMetres(millimetres: number): number {
  return millimetres / 1000;
}

/** Radians → degrees. */
export function toDegrees(radians: number): number {
  return (radians * 180) / Math.PI;
}

const MINUS = '\u2212';

/** A number with a real minus sign, fixed decimals, and no "−0". */
export function fixed(value: number, digits: number): string {
  const text = value.toFixed(digits);
  if (Number(text) === 0) return (0).toFixed(digits);
  return text.startsWith('-') ? MINUS + text.slice(1) : text;
}

/** A length given in metres, written in millimetres: `12.3 mm`. */
export function mm(metres: number, digits = 1): string {
  return `${fixed(toMillimetres(metres), digits)} mm`;
}

/** An angle given in radians, written in degrees: `0.125°`. */
export function degrees(radians: number, digits = 3): string {
  return `${fixed(toDegrees(radians), digits)}°`;
}

/** A ratio close to 1 (Ed, Eb): `1.00312`. */
export function ratio(value: number, digits = 5): string {
  return fixed(value, digits);
}

/** How far a ratio is from 1, in per cent: `+0.31 %`, `−0.05 %`, `0.00 %`. */
export function ratioDeviation(value: number, digits = 2): string {
  const pct = (value - 1) * 100;
  const text = fixed(pct, digits);
  return `${Number(text.replace(MINUS, '-')) > 0 ? '+' : ''}${text} %`;
}

/**
 * The radius of the curved legs, metres. The server sends ±Infinity as `null` (JSON has no
 * infinity): then the legs were straight.
 */
export function legRadius(radius: number | null | undefined): string {
  if (radius === null || radius === undefined || !Number.isFinite(radius)) return 'straight legs (β = 0)';
  const abs = Math.abs(radius);
  const digits = abs >= 1000 ? 0 : abs >= 10 ? 1 : 2;
  return `${fixed(radius, digits)} m`;
}

const SUPERSCRIPT: Record<string, string> = {
  '-': '\u207b',
  '0': '\u2070',
  '1': '\u00b9',
  '2': '\u00b2',
  '3': '\u00b3',
  '4': '\u2074',
  '5': '\u2075',
  '6': '\u2076',
  '7': '\u2077',
  '8': '\u2078',
  '9': '\u2079',
};

/**
 * A small non-negative number in scientific notation, `2.41 × 10⁻³`; zero is `0`, numbers
 * between 0.01 and 1000 are written plainly.
 */
export function scientific(value: number, significant = 3): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  if (abs >= 0.01 && abs < 1000) return fixed(value, Math.max(0, significant - 1 - Math.floor(Math.log10(abs))));
  const [mantissa, exponent] = value.toExponential(significant - 1).split('e');
  const power = String(Number(exponent))
    .split('')
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join('');
  return `${mantissa.replace('-', MINUS)} × 10${power}`;
}

/** Units of the alphas in their variance form (Thrun, Burgard & Fox 2005, Table 5.6). */
export const ALPHA_UNITS = ['rad²/rad²', 'rad²/m²', 'm²/m²', 'm²/rad²'] as const;

/** What each alpha scales, in words. */
export const ALPHA_MEANINGS = [
  'rotation noise from turning',
  'rotation noise from driving',
  'distance noise from driving',
  'distance noise from turning',
] as const;

/** `a1`…`a4`. */
export const ALPHA_NAMES = ['a1', 'a2', 'a3', 'a4'] as const;

/** The four alphas in one line, for a list: `a1 2.0 × 10⁻³ · a2 …`. */
export function alphasLine(alphas: readonly number[]): string {
  return alphas.map((a, i) => `${ALPHA_NAMES[i]} ${scientific(a, 2)}`).join(' · ');
}

/** A file size: `512 B`, `3.4 kB`, `1.2 MB`. */
export function fileSize(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1_000_000) return `${(bytes / 1000).toFixed(1)} kB`;
  return `${(bytes / 1_000_000).toFixed(1)} MB`;
}
