/** What goes in each column of the two calibration files (shared/calibration/README.md has the full rules). */
import { PAIRED_POSE_CSV_COLUMNS, UMBMARK_CSV_COLUMNS } from '@shared/calibration';
import type { FleetFileKind } from '@shared/schemas';

export interface CsvColumn {
  name: string;
  required: boolean;
  meaning: string;
}

const MEANINGS: Record<string, string> = {
  direction: 'cw (clockwise, right turns) or ccw (counter-clockwise, left turns).',
  x_error: 'Where the robot really stopped minus where its odometry says it stopped, metres, forward along the first leg.',
  y_error: 'The same, metres, to the left of the first leg.',
  heading_error: 'Real minus odometry heading, radians, counter-clockwise positive; leave empty if not measured.',
  odom_x: 'Odometry position, metres.',
  odom_y: 'Odometry position, metres.',
  odom_theta: 'Odometry heading, radians.',
  ref_x: 'Reference position at the same moment (e.g. a tracking system), metres.',
  ref_y: 'Reference position, metres.',
  ref_theta: 'Reference heading, radians.',
  time: 'Seconds, increasing from row to row.',
};

function columns(spec: { required: readonly string[]; optional: readonly string[] }): CsvColumn[] {
  return [
    ...spec.required.map((name) => ({ name, required: true, meaning: MEANINGS[name] ?? '' })),
    ...spec.optional.map((name) => ({ name, required: false, meaning: MEANINGS[name] ?? '' })),
  ];
}

export const CSV_COLUMNS: Record<FleetFileKind, CsvColumn[]> = {
  umbmark: columns(UMBMARK_CSV_COLUMNS),
  poses: columns(PAIRED_POSE_CSV_COLUMNS),
};
