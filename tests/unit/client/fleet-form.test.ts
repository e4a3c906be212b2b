import { describe, expect, it } from 'vitest';
import { fleetRobotFieldsSchema, FLEET_POSES_MAX_BYTES, FLEET_UMBMARK_MAX_BYTES, type FleetPracticeTrial } from '@shared/schemas';
import { ApiError, type TrialSummary } from '@/api';
import {
  EMPTY_ROBOT_CHOICE,
  checkCalibrationFile,
  effectiveGeometry,
  profileNameError,
  robotChoiceErrors,
  robotFormFields,
  rowProblemsOf,
  robotsByName,
  uploadFailure,
  uploadsError,
  type RobotChoice,
  type RobotGeometry,
} from '@/components/fleet/fleet-form';
import { groupByProfile, sameTrialIds, trialsForRobot } from '@/components/fleet/practice-trials';
import { CSV_COLUMNS } from '@/components/fleet/csv-columns';

const TUGGER: RobotGeometry = { id: 'aisle-tugger', name: 'Aisle tugger (demo)', wheelRadius: 0.1, wheelbase: 0.55, ticksPerRevolution: 4096 };
const choice = (over: Partial<RobotChoice>): RobotChoice => ({ ...EMPTY_ROBOT_CHOICE, robotId: 'aisle-tugger', ...over });

describe('the robot part of a new fleet profile', () => {
  it('sends only the content robot when no custom geometry is asked for', () => {
    const fields = robotFormFields(choice({ wheelRadiusMm: 80 }));
    expect(fields).toEqual({ robotId: 'aisle-tugger', wheelRadius: '', wheelbase: '', ticksPerRevolution: '' });
    expect(robotChoiceErrors(choice({}))).toEqual({});
  });

  it('sends custom millimetres as metres without floating-point dust, and the server schema reads them back', () => {
    const fields = robotFormFields(choice({ custom: true, wheelRadiusMm: 75.2, wheelbaseMm: 512, ticksPerRevolution: 2048 }));
    expect(fields).toEqual({ robotId: 'aisle-tugger', wheelRadius: '0.0752', wheelbase: '0.512', ticksPerRevolution: '2048' });
    expect(fleetRobotFieldsSchema.parse(fields)).toEqual({ robotId: 'aisle-tugger', wheelRadius: 0.0752, wheelbase: 0.512, ticksPerRevolution: 2048 });
    // An empty custom field keeps the content robot's value.
    expect(robotFormFields(choice({ custom: true, wheelbaseMm: 600 })).wheelRadius).toBe('');
  });

  it('checks the choice with the server rule and names the form field at fault', () => {
    expect(robotChoiceErrors(EMPTY_ROBOT_CHOICE).robotId).toBe('Choose a robot.');
    const errors = robotChoiceErrors(choice({ custom: true, wheelRadiusMm: 1500, wheelbaseMm: 0, ticksPerRevolution: 8.5 }));
    expect(errors.wheelRadiusMm).toBe('The wheel radius is at most 1 m.');
    expect(errors.wheelbaseMm).toBe('The wheelbase must be above zero.');
    expect(errors.ticksPerRevolution).toBe('Write the encoder ticks per wheel revolution as a whole number.');
    expect(robotChoiceErrors(choice({ custom: true, ticksPerRevolution: 8 })).ticksPerRevolution).toBe('At least 16 ticks per revolution.');
  });

  it('works out the geometry the calibration will use', () => {
    expect(effectiveGeometry(TUGGER, choice({}))).toEqual({ wheelRadius: 0.1, wheelbase: 0.55, ticksPerRevolution: 4096 });
    expect(effectiveGeometry(TUGGER, choice({ custom: true, wheelbaseMm: 540 }))).toEqual({ wheelRadius: 0.1, wheelbase: 0.54, ticksPerRevolution: 4096 });
    expect(effectiveGeometry(undefined, choice({}))).toBeNull();
  });

  it('lists the content robots by name', () => {
    const rover: RobotGeometry = { ...TUGGER, id: 'inspection-rover', name: 'Inspection rover (demo)' };
    expect(robotsByName([rover, TUGGER]).map((r) => r.id)).toEqual(['aisle-tugger', 'inspection-rover']);
  });
});

describe('the rest of the form', () => {
  it('needs a name, checked by the server rule', () => {
    expect(profileNameError('  ')).toBe('Name the profile.');
    expect(profileNameError('x'.repeat(81))).toBe('A profile name has at most 80 characters.');
    expect(profileNameError('Tuggers, cold store')).toBeNull();
  });

  it('lets either upload be skipped, not both', () => {
    expect(uploadsError(true, false)).toBeNull();
    expect(uploadsError(false, true)).toBeNull();
    expect(uploadsError(false, false)).toMatch(/at least one/);
  });

  it('refuses empty, too large and non-CSV files before sending them', () => {
    expect(checkCalibrationFile({ name: 'runs.csv', size: 0 }, 'umbmark')).toBe('runs.csv is empty.');
    expect(checkCalibrationFile({ name: 'runs.csv', size: FLEET_UMBMARK_MAX_BYTES + 1 }, 'umbmark')).toMatch(/larger than 1 MB/);
    expect(checkCalibrationFile({ name: 'poses.csv', size: FLEET_UMBMARK_MAX_BYTES + 1 }, 'poses')).toBeNull();
    expect(checkCalibrationFile({ name: 'poses.csv', size: FLEET_POSES_MAX_BYTES + 1 }, 'poses')).toMatch(/larger than 5 MB/);
    expect(checkCalibrationFile({ name: 'runs.xlsx', size: 100 }, 'umbmark')).toMatch(/not a CSV/);
  });

  it('reads the row problems of a refused upload, whole-file problems first', () => {
    const error = new ApiError(400, 'calibration_rows', 'Fix these rows.', {}, {
      code: 'calibration_rows',
      message: 'Fix these rows.',
      details: {
        problems: [
          { row: 4, column: 'x_error', message: 'x_error (metres) "0,12" uses a decimal comma.' },
          { row: null, message: 'Only 4 usable clockwise (cw) runs.' },
          { row: 2, message: 'The direction "north" is neither cw nor ccw.' },
        ],
      },
    });
    expect(rowProblemsOf(error)).toEqual([
      { row: null, message: 'Only 4 usable clockwise (cw) runs.' },
      { row: 2, message: 'The direction "north" is neither cw nor ccw.' },
      { row: 4, column: 'x_error', message: 'x_error (metres) "0,12" uses a decimal comma.' },
    ]);
    expect(uploadFailure('runs.csv', error, 'fallback')).toMatchObject({ step: 'problems', fileName: 'runs.csv', message: 'Fix these rows.' });
    const other = new ApiError(413, 'file_too_large', 'The file is too large.');
    expect(rowProblemsOf(other)).toBeNull();
    expect(uploadFailure('runs.csv', other, 'fallback')).toEqual({ step: 'failed', fileName: 'runs.csv', message: 'The file is too large.' });
    expect(uploadFailure('runs.csv', new Error('boom'), 'The runs could not be read.')).toMatchObject({ message: 'The runs could not be read.' });
    const refused = new ApiError(400, 'drift_out_of_range', 'The runs give Ed = 1.2000.', { runs: 'The runs give Ed = 1.2000.' });
    expect(uploadFailure('runs.csv', refused, 'fallback')).toMatchObject({ message: 'The runs give Ed = 1.2000.' });
    const field = new ApiError(400, 'validation_failed', 'Some fields need attention.', { robotId: 'No robot "x".' });
    expect(uploadFailure('runs.csv', field, 'fallback')).toMatchObject({ message: 'No robot "x".' });
  });

  it('describes every column the server reads, required ones first', () => {
    expect(CSV_COLUMNS.umbmark.map((c) => c.name)).toEqual(['direction', 'x_error', 'y_error', 'heading_error']);
    expect(CSV_COLUMNS.poses.filter((c) => !c.required).map((c) => c.name)).toEqual(['time']);
    for (const c of [...CSV_COLUMNS.umbmark, ...CSV_COLUMNS.poses]) expect(c.meaning.length).toBeGreaterThan(5);
  });
});

describe('practice trials on a fleet profile', () => {
  const trial = (id: string, title: string, robotId: string): TrialSummary => ({ id, title, summary: '', robotId, robotName: robotId, timeLimit: 60, levelIds: [] });

  it("offers only the trials of the profile's robot model, by title", () => {
    const list = [trial('a', 'Zebra', 'rover'), trial('b', 'Beta', 'tugger'), trial('c', 'Alpha', 'rover'), trial('d', 'Alpha', 'tugger')];
    expect(trialsForRobot(list, 'tugger').map((t) => t.id)).toEqual(['d', 'b']);
  });

  it('compares choices in any order', () => {
    expect(sameTrialIds(['a', 'b'], ['b', 'a'])).toBe(true);
    expect(sameTrialIds(['a'], ['a', 'b'])).toBe(false);
    expect(sameTrialIds(['a', 'c'], ['a', 'b'])).toBe(false);
  });

  it("groups the operator's list by profile", () => {
    const item = (trialId: string, title: string, profile: string): FleetPracticeTrial => ({
      trialId,
      trialTitle: title,
      robotName: 'Tugger',
      fleetProfileId: `id-${profile}`,
      fleetProfileName: profile,
    });
    const groups = groupByProfile([item('t2', 'Wash bay', 'Cold store'), item('t1', 'Long aisle', 'Ambient'), item('t3', 'Dock', 'Cold store')]);
    expect(groups.map((g) => g.profileName)).toEqual(['Ambient', 'Cold store']);
    expect(groups[1].trials.map((t) => t.trialTitle)).toEqual(['Dock', 'Wash bay']);
  });
});
