/**
 * The rules of the new fleet profile form that need no server: the robot choice (a content
 * robot, optionally with its own wheel radius, wheelbase and encoder resolution, typed in
 * millimetres), what the multipart fields say, which uploads are needed, and the row problems a
 * refused upload carries.
 */
import { FLEET_POSES_MAX_BYTES, FLEET_UMBMARK_MAX_BYTES, fleetProfileNameSchema, fleetRobotFieldsSchema, type FleetFileKind, type PublicRobot } from '@shared/schemas';
import type { RowProblem } from '@shared/calibration';
import { isApiError } from '@/api';
import { toMetres } from './fleet-format';

/** The parts of a content robot the form needs. */
export type RobotGeometry = Pick<PublicRobot, 'id' | 'name' | 'wheelRadius' | 'wheelbase' | 'ticksPerRevolution'>;

/** The robot part of the form. The custom numbers are only read when `custom` is on. */
export interface RobotChoice {
  robotId: string;
  custom: boolean;
  /** Millimetres. */
  wheelRadiusMm: number | null;
  /** Millimetres. */
  wheelbaseMm: number | null;
  ticksPerRevolution: number | null;
}

export const EMPTY_ROBOT_CHOICE: RobotChoice = { robotId: '', custom: false, wheelRadiusMm: null, wheelbaseMm: null, ticksPerRevolution: null };

export type RobotField = 'robotId' | 'wheelRadiusMm' | 'wheelbaseMm' | 'ticksPerRevolution';

/** The content robots by name. */
export function robotsByName(robots: readonly RobotGeometry[]): RobotGeometry[] {
  return [...robots].sort((a, b) => a.name.localeCompare(b.name));
}

const FIELD_OF_PATH: Record<string, RobotField> = {
  robotId: 'robotId',
  wheelRadius: 'wheelRadiusMm',
  wheelbase: 'wheelbaseMm',
  ticksPerRevolution: 'ticksPerRevolution',
};

/**
 * Field messages for the robot part (empty when it is fine), by the server's own rule
 * (fleetRobotFieldsSchema) applied to the fields the form would send. Custom numbers left
 * empty keep the content robot's own value.
 */
export function robotChoiceErrors(choice: RobotChoice): Partial<Record<RobotField, string>> {
  const errors: Partial<Record<RobotField, string>> = {};
  const parsed = fleetRobotFieldsSchema.safeParse(robotFormFields(choice));
  if (parsed.success) return errors;
  for (const issue of parsed.error.issues) {
    const field = FIELD_OF_PATH[String(issue.path[0])];
    if (field && !errors[field]) errors[field] = issue.message;
  }
  return errors;
}

/** Metres with no floating-point dust (0.075, not 0.07500000000000001). */
function metresText(millimetres: number): string {
  return String(Number(toMetres(millimetres).toPrecision(12)));
}

/**
 * The robot fields of the multipart body, as the server reads them: `robotId`, and the custom
 * `wheelRadius` and `wheelbase` in metres and `ticksPerRevolution`; an empty string keeps the
 * content robot's value.
 */
export function robotFormFields(choice: RobotChoice): Record<'robotId' | 'wheelRadius' | 'wheelbase' | 'ticksPerRevolution', string> {
  const use = <T>(value: T | null) => (choice.custom && value !== null && value !== undefined ? value : null);
  const radius = use(choice.wheelRadiusMm);
  const base = use(choice.wheelbaseMm);
  const ticks = use(choice.ticksPerRevolution);
  return {
    robotId: choice.robotId,
    wheelRadius: radius === null ? '' : metresText(radius),
    wheelbase: base === null ? '' : metresText(base),
    ticksPerRevolution: ticks === null ? '' : String(ticks),
  };
}

/** The geometry the calibration will use: the content robot's, with the custom numbers over it. */
export function effectiveGeometry(robot: RobotGeometry | undefined, choice: RobotChoice): Omit<RobotGeometry, 'id' | 'name'> | null {
  if (!robot) return null;
  const fields = robotFormFields(choice);
  return {
    wheelRadius: fields.wheelRadius ? Number(fields.wheelRadius) : robot.wheelRadius,
    wheelbase: fields.wheelbase ? Number(fields.wheelbase) : robot.wheelbase,
    ticksPerRevolution: fields.ticksPerRevolution ? Number(fields.ticksPerRevolution) : robot.ticksPerRevolution,
  };
}

/** The message for a profile name, by the server's rule (fleetProfileNameSchema), or null. */
export function profileNameError(name: string): string | null {
  const parsed = fleetProfileNameSchema.safeParse(name);
  return parsed.success ? null : (parsed.error.issues[0]?.message ?? 'Name the profile.');
}

/** Either upload may be skipped, not both. */
export function uploadsError(hasRuns: boolean, hasPoses: boolean): string | null {
  return hasRuns || hasPoses ? null : 'Upload the UMBmark runs, the paired poses, or both: a profile needs at least one.';
}

/** The row problems of a refused upload (400 `calibration_rows`), sorted; null for any other failure. */
export function rowProblemsOf(error: unknown): RowProblem[] | null {
  if (!isApiError(error) || error.code !== 'calibration_rows') return null;
  const details = (error.body as { details?: { problems?: unknown } } | null)?.details;
  const list = Array.isArray(details?.problems) ? (details.problems as unknown[]) : [];
  const problems: RowProblem[] = [];
  for (const item of list) {
    if (typeof item !== 'object' || item === null) continue;
    const p = item as Record<string, unknown>;
    if (typeof p.message !== 'string') continue;
    const problem: RowProblem = { row: typeof p.row === 'number' ? p.row : null, message: p.message };
    if (typeof p.column === 'string' && p.column) problem.column = p.column;
    problems.push(problem);
  }
  return problems
    .map((p, i) => ({ p, i }))
    .sort((a, b) => (a.p.row ?? 0) - (b.p.row ?? 0) || a.i - b.i)
    .map(({ p }) => p);
}

/** Largest file of each kind the server takes. */
export const CALIBRATION_MAX_BYTES: Record<FleetFileKind, number> = { umbmark: FLEET_UMBMARK_MAX_BYTES, poses: FLEET_POSES_MAX_BYTES };

/** A file size in words: `1 MB`, `5 MB`, `512 kB`. */
function sizeWords(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${+(bytes / (1024 * 1024)).toFixed(1)} MB` : `${Math.round(bytes / 1024)} kB`;
}

/** A message when the chosen file cannot be a calibration CSV of that kind, else null. */
export function checkCalibrationFile(file: Pick<File, 'name' | 'size'>, kind: FleetFileKind): string | null {
  if (file.size === 0) return `${file.name} is empty.`;
  if (file.size > CALIBRATION_MAX_BYTES[kind]) return `${file.name} is larger than ${sizeWords(CALIBRATION_MAX_BYTES[kind])}, the most this upload takes.`;
  if (!/\.(csv|txt)$/i.test(file.name)) return `${file.name} is not a CSV file (.csv).`;
  return null;
}

/** One upload of the form: nothing yet, being checked, refused with row problems, failed, or read. */
export type UploadStep<T> =
  | { step: 'idle' }
  | { step: 'checking'; fileName: string }
  | { step: 'problems'; fileName: string; message: string; problems: RowProblem[] }
  | { step: 'failed'; fileName: string | null; message: string }
  | { step: 'done'; fileName: string; result: T };

export function uploadFailure<T>(fileName: string | null, error: unknown, fallback: string): UploadStep<T> {
  const problems = rowProblemsOf(error);
  if (problems && fileName) {
    const message = isApiError(error) ? error.message : fallback;
    return { step: 'problems', fileName, message, problems };
  }
  if (!isApiError(error)) return { step: 'failed', fileName, message: fallback };
  // A refused field (e.g. an unknown robot, or drift outside what a profile may have) says more than the headline.
  const fieldMessages = Object.values(error.fields).filter((m) => m && m !== error.message);
  return { step: 'failed', fileName, message: fieldMessages.length ? fieldMessages.join(' ') : error.message };
}
