/** Numbers as the console shows them. */

/** 83.4 → "1:23". */
export function clockTime(seconds: number): string {
  const s = Math.max(0, Math.floor(seconds + 1e-6));
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
}

/** 0.456 → "0.46 m". */
export function metres(value: number, digits = 2): string {
  return `${value.toFixed(digits)} m`;
}

/** m/s with a sign only when reversing. */
export function speed(value: number): string {
  const v = Math.abs(value) < 0.005 ? 0 : value;
  return `${v.toFixed(2)} m/s`;
}

/** rad/s shown as degrees per second, left or right. */
export function turnRate(value: number): string {
  const deg = (value * 180) / Math.PI;
  if (Math.abs(deg) < 0.5) return '0°/s';
  return `${Math.abs(deg).toFixed(0)}°/s ${deg > 0 ? 'left' : 'right'}`;
}

/** Heading in degrees, 0 = east, counter-clockwise, as a compass-like word too. */
export function heading(theta: number): string {
  const deg = (((Math.round((theta * 180) / Math.PI) % 360) + 360) % 360);
  const names = ['east', 'north-east', 'north', 'north-west', 'west', 'south-west', 'south', 'south-east'];
  return `${deg}° (${names[Math.round(deg / 45) % 8]})`;
}

export const CALL_LABELS = {
  proceed: 'Proceed',
  creep: 'Creep',
  reanchor: 'Re-anchor',
  halt: 'Halt',
} as const;

export const MODE_LABELS = { practice: 'Practice drive', exam: 'Exam drive' } as const;

export const STATUS_LABELS = {
  driving: 'In progress',
  awaiting_call: 'Call due',
  time_up: 'Time is up',
  submitted: 'Submitted',
  abandoned: 'Abandoned',
} as const;
