/**
 * Fleet calibration: an organization's own drift profile, fitted on the server from the
 * employer's calibration runs (UMBmark square runs → Ed, Eb; paired odometry/reference poses →
 * a1..a4), and the practice trials its operators drive on it. The upload formats are described
 * in shared/calibration/README.md.
 */
import { z } from 'zod';
import type { AlphaFitReport, RowProblem, UmbmarkReport } from '../calibration';
import type { DriftProfile } from './content';

/** Largest UMBmark runs file (field `runs`), bytes. */
export const FLEET_UMBMARK_MAX_BYTES = 1024 * 1024;
/** Largest paired-pose file (field `poses`), bytes. */
export const FLEET_POSES_MAX_BYTES = 5 * 1024 * 1024;
/** Most pose rows a paired-pose file may have (below its header). */
export const FLEET_POSES_MAX_ROWS = 20_000;
/** Most standardised residuals an alpha-fit view carries (thinned evenly). */
/**
 * The largest alpha a fleet profile keeps: at a1 = 1 rad²/rad² the rotation noise's standard
 * deviation equals the rotation, at a3 = 1 m²/m² the distance noise equals the distance (likewise
 * a2, a4 per metre and radian). Beyond that the odometry says nothing and the file is wrong.
 */
export const FLEET_ALPHA_MAX = 1;
export const FLEET_RESIDUALS_MAX = 3_000;
/** Most row problems a `calibration_rows` error lists. */
export const FLEET_MAX_PROBLEMS = 200;
/** Most practice trials one profile can have. */
export const FLEET_MAX_PRACTICE_TRIALS = 50;
/** Bootstrap resamples of the alpha fit. */
export const FLEET_BOOTSTRAP_RESAMPLES = 500;

export const FLEET_FILE_KINDS = ['umbmark', 'poses'] as const;
export type FleetFileKind = (typeof FLEET_FILE_KINDS)[number];
/** The multipart field that carries each kind of file. */
export const FLEET_FILE_FIELDS: Record<FleetFileKind, 'runs' | 'poses'> = { umbmark: 'runs', poses: 'poses' };

export const FLEET_PROFILE_STATUSES = ['active', 'archived'] as const;
export type FleetProfileStatus = (typeof FLEET_PROFILE_STATUSES)[number];

/**
 * A number given as a multipart text field: a string is read as a plain decimal ('' or spaces
 * = not given); a number (a browser form) is taken as it is.
 */
function optionalNumberField<S extends z.ZodType<number>>(schema: S) {
  return z.preprocess((value) => {
    if (typeof value !== 'string') return value;
    const text = value.trim();
    if (text === '') return undefined;
    return /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text) ? Number(text) : Number.NaN;
  }, schema.optional());
}

const robotIdSchema = z.string({ error: 'Choose a robot.' }).trim().min(1, 'Choose a robot.').max(64, 'Choose a robot.');

/**
 * The robot of a calibration (multipart text fields): a content robot, and optionally the
 * geometry of the employer's own robot, which overrides the content robot's (the footprint and
 * the limits always come from the content robot). Same ranges as robotSchema in ./content.ts.
 */
export const fleetRobotFieldsSchema = z.strictObject({
  robotId: robotIdSchema,
  wheelRadius: optionalNumberField(
    z.number({ error: 'Write the wheel radius in metres, with a decimal point.' }).positive('The wheel radius must be above zero.').max(1, 'The wheel radius is at most 1 m.'),
  ),
  wheelbase: optionalNumberField(
    z.number({ error: 'Write the wheelbase in metres, with a decimal point.' }).positive('The wheelbase must be above zero.').max(3, 'The wheelbase is at most 3 m.'),
  ),
  ticksPerRevolution: optionalNumberField(
    z
      .number({ error: 'Write the encoder ticks per wheel revolution as a whole number.' })
      .int('Write the encoder ticks per wheel revolution as a whole number.')
      .min(16, 'At least 16 ticks per revolution.')
      .max(1_000_000, 'At most 1,000,000 ticks per revolution.'),
  ),
});
export type FleetRobotFields = z.infer<typeof fleetRobotFieldsSchema>;

export const fleetProfileNameSchema = z
  .string({ error: 'Name the profile.' })
  .trim()
  .min(1, 'Name the profile.')
  .max(80, 'A profile name has at most 80 characters.');

/** Fields of POST /api/organizations/:orgId/fleet-profiles (besides the files `runs` and `poses`). */
export const fleetProfileFieldsSchema = fleetRobotFieldsSchema.extend({ name: fleetProfileNameSchema });
export type FleetProfileFields = z.infer<typeof fleetProfileFieldsSchema>;

/** The practice trials of a profile (replaces the list). */
export const practiceTrialsSchema = z.strictObject({
  trialIds: z
    .array(z.string({ error: 'Not a trial id.' }).min(1, 'Not a trial id.').max(64, 'Not a trial id.'), { error: 'Send a list of trial ids.' })
    .max(FLEET_MAX_PRACTICE_TRIALS, `At most ${FLEET_MAX_PRACTICE_TRIALS} practice trials.`)
    .refine((ids) => new Set(ids).size === ids.length, 'Each trial at most once.'),
});
export type PracticeTrials = z.infer<typeof practiceTrialsSchema>;

export const fleetProfileParamsSchema = z.strictObject({
  orgId: z.coerce.number().int().positive(),
  profileId: z.uuid({ error: 'Not a fleet profile id.' }),
});
export const fleetFileParamsSchema = fleetProfileParamsSchema.extend({ kind: z.enum(FLEET_FILE_KINDS, { error: 'The file is umbmark or poses.' }) });
export const fleetSampleParamsSchema = z.strictObject({ kind: z.enum(FLEET_FILE_KINDS, { error: 'The sample is umbmark or poses.' }) });

/** The robot a fleet profile describes: a content robot, with the employer's geometry. */
export interface FleetRobot {
  baseRobotId: string;
  name: string;
  wheelRadius: number;
  wheelbase: number;
  ticksPerRevolution: number;
}

/** Answer of the UMBmark preview (and part of a profile). */
export interface UmbmarkView {
  robot: FleetRobot;
  report: UmbmarkReport;
}

/** The alpha-fit report with its residuals thinned evenly to at most FLEET_RESIDUALS_MAX. */
export type AlphaFitView = AlphaFitReport & { residualsTotal: number };

export interface FleetProfileSummary {
  id: string;
  name: string;
  robot: FleetRobot;
  status: FleetProfileStatus;
  /**
   * The effective profile: alphas from the alpha fit (else the base robot's assumed alphas);
   * Ed, Eb from UMBmark (else the base robot's hidden errors).
   */
  driftProfile: DriftProfile;
  sources: { umbmark: boolean; alphaFit: boolean };
  practiceTrialIds: string[];
  createdAt: string;
  createdByName: string;
}

export interface FleetProfileFile {
  kind: FleetFileKind;
  fileName: string;
  /** Size in bytes. */
  bytes: number;
}

export type FleetProfileDetail = FleetProfileSummary & {
  umbmark: UmbmarkView | null;
  alphaFit: AlphaFitView | null;
  files: FleetProfileFile[];
};

/** A practice trial an operator can drive on a fleet profile of their organization. */
export interface FleetPracticeTrial {
  trialId: string;
  trialTitle: string;
  robotName: string;
  fleetProfileId: string;
  fleetProfileName: string;
}

/** The `details` of a 400 `calibration_rows` error: the rows to fix (at most FLEET_MAX_PROBLEMS). */
export interface CalibrationRowsDetails {
  problems: RowProblem[];
}
