/**
 * Fleet calibration through the API: previews equal the shared calibration code, bad files are
 * refused row by row with nothing stored, saved profiles keep their files byte for byte, other
 * organizations see nothing, and practice drives on a profile run (and score, and report) with
 * the profile's robot and drift.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request, { type Agent } from 'supertest';
import { parse } from 'csv-parse/sync';
import { calibrateUmbmarkCsv, fitDriftAlphas, pairedPosesFromCsvRecords, type RowProblem } from '../../shared/calibration';
import {
  FLEET_MAX_PROBLEMS,
  FLEET_RESIDUALS_MAX,
  type AttemptReport,
  type AttemptStart,
  type AttemptView,
  type FleetPracticeTrial,
  type FleetProfileDetail,
  type FleetProfileSummary,
} from '../../shared/schemas';
import { DriveSim } from '../../shared/sim';
import { hashPassword } from '../../server/auth/passwords';
import { Attempt, FleetPracticeTrial as FleetPracticeTrialRow, Organization, User } from '../../server/db/models';
import { startWorkers } from '../../server/jobs/workers';
import { createTestApp, signedInAgent } from '../support/api';
import { shippedContent } from '../support/content';
import { apiPort } from '../support/drive-api';
import { driveTrial } from '../support/scripted-operator';

let seedCounter = 0;
const t = createTestApp({}, { newSeed: () => `fleet-seed-${seedCounter++}` });
afterAll(() => t.close());

const content = shippedContent();
const SAMPLES = path.join(import.meta.dirname, '../../content/calibration-samples');
const runsCsv = readFileSync(path.join(SAMPLES, 'umbmark-runs.csv'));
const posesCsv = readFileSync(path.join(SAMPLES, 'paired-poses.csv'));
const ORG = '/api/organizations/1';

let employer: Agent;
let operator: Agent;
let otherEmployer: Agent;
let otherOrgId = 0;

beforeAll(async () => {
  await startWorkers(t.ctx);
  employer = await signedInAgent(t.app, 'employer');
  operator = await signedInAgent(t.app, 'operator1');
  const [other] = await Organization.findOrCreate({ where: { name: 'Fleet Test Other Org' }, defaults: { name: 'Fleet Test Other Org' } });
  otherOrgId = other.id;
  const email = 'fleet.other@other.example.test';
  await User.findOrCreate({ where: { email }, defaults: { email, name: 'Other Fleet Employer', role: 'employer', organizationId: other.id, passwordHash: await hashPassword('other-employer-pw', 4), lastSignInAt: null } });
  otherEmployer = request.agent(t.app);
  await otherEmployer.post('/api/auth/sign-in').send({ email, password: 'other-employer-pw' }).expect(200);
});

/** Records as the documented reader gives them (shared/calibration/README.md: lower-cased, trimmed headers). */
const recordsOf = (csv: Buffer) => parse(csv, { columns: (h: string[]) => h.map((c) => c.trim().toLowerCase()), trim: true, skip_empty_lines: true }) as Record<string, string>[];

async function counts() {
  const out: Record<string, number> = {};
  for (const table of ['fleet_profiles', 'fleet_profile_files', 'fleet_practice_trials']) {
    const [rows] = (await t.ctx.sequelize.query(`SELECT count(*)::int AS n FROM ${table}`)) as [{ n: number }[], unknown];
    out[table] = rows[0].n;
  }
  return out;
}

const previewRuns = (csv: Buffer | string, fields: Record<string, string> = { robotId: 'aisle-tugger' }, name = 'runs.csv') => {
  const req = employer.post(`${ORG}/fleet-calibration/umbmark`);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  return req.attach('runs', Buffer.from(csv), name);
};

const saveProfile = (files: { runs?: [Buffer | string, string]; poses?: [Buffer | string, string] }, fields: Record<string, string> = { name: 'Tugger 3, hall A', robotId: 'aisle-tugger' }, agent = employer, org = ORG) => {
  const req = agent.post(`${org}/fleet-profiles`);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  if (files.runs) req.attach('runs', Buffer.from(files.runs[0]), files.runs[1]);
  if (files.poses) req.attach('poses', Buffer.from(files.poses[0]), files.poses[1]);
  return req;
};

/** Five clockwise and five counter-clockwise runs with a small scatter, as CSV lines. */
function runLines(cw: [number, number], ccw: [number, number]): string[] {
  const jitter = [0, 0.004, -0.003, 0.002, -0.005];
  return [
    ...jitter.map((j) => `cw,${(cw[0] + j).toFixed(3)},${(cw[1] - j).toFixed(3)}`),
    ...jitter.map((j) => `ccw,${(ccw[0] - j).toFixed(3)},${(ccw[1] + j).toFixed(3)}`),
  ];
}
const goodRuns = ['direction,x_error,y_error', ...runLines([-0.3, -0.35], [0.01, -0.02])];

function problemsOf(res: request.Response): RowProblem[] {
  expect(res.status, res.text).toBe(400);
  expect(res.body.error.code).toBe('calibration_rows');
  expect(res.body.error.message).toBeTruthy();
  return res.body.error.details.problems;
}

describe('fleet calibration previews', () => {
  it('serves the simulated sample files to anyone, byte for byte', async () => {
    for (const [kind, bytes] of [['umbmark', runsCsv], ['poses', posesCsv]] as const) {
      const res = await request(t.app).get(`/api/fleet-calibration/samples/${kind}`).buffer(true).parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toMatch(/^text\/csv/);
      expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?driftproof-sample-/);
      expect((res.body as Buffer).equals(bytes)).toBe(true);
    }
    await request(t.app).get('/api/fleet-calibration/samples/secrets').expect(400);
  });

  it('UMBmark preview: the same Ed, Eb and corrected geometry as the shared calibration code, for custom geometry too', async () => {
    const res = await previewRuns(runsCsv, { robotId: 'aisle-tugger', wheelRadius: '0.102', wheelbase: ' 0.51 ', ticksPerRevolution: '' }).expect(200);
    const direct = calibrateUmbmarkCsv(recordsOf(runsCsv), { wheelRadius: 0.102, wheelbase: 0.51 });
    expect(direct.ok).toBe(true);
    if (!direct.ok) return;
    expect(res.body.umbmark.robot).toEqual({ baseRobotId: 'aisle-tugger', name: 'Aisle tugger (demo)', wheelRadius: 0.102, wheelbase: 0.51, ticksPerRevolution: 1024 });
    expect(res.body.umbmark.report.ed).toBe(direct.report.ed);
    expect(res.body.umbmark.report.eb).toBe(direct.report.eb);
    expect(res.body.umbmark.report.corrected).toEqual(direct.report.corrected);
    expect(res.body.umbmark.report.eMaxSyst).toBe(direct.report.eMaxSyst);
    // The invented truth of the simulated sample (content/calibration-samples/README.md): Ed 1.0025, Eb 1.012.
    const nominal = await previewRuns(runsCsv).expect(200);
    expect(Math.abs(nominal.body.umbmark.report.ed - 1.0025)).toBeLessThan(0.01 * 1.0025);
    expect(Math.abs(nominal.body.umbmark.report.eb - 1.012)).toBeLessThan(0.01 * 1.012);
  });

  it('refuses bad robot fields with field messages', async () => {
    const unknown = await previewRuns(runsCsv, { robotId: 'forklift-9000' }).expect(400);
    expect(unknown.body.error.fields.robotId).toMatch(/No robot/);
    const words = await previewRuns(runsCsv, { robotId: 'aisle-tugger', wheelRadius: '10cm', ticksPerRevolution: '12.5' }).expect(400);
    expect(Object.keys(words.body.error.fields).sort()).toEqual(['ticksPerRevolution', 'wheelRadius']);
    const extra = await previewRuns(runsCsv, { robotId: 'aisle-tugger', ed: '1.5' }).expect(400);
    expect(extra.body.error.fields.ed).toBeTruthy();
    const noFile = await employer.post(`${ORG}/fleet-calibration/umbmark`).field('robotId', 'aisle-tugger').expect(400);
    expect(noFile.body.error.code).toBe('no_file');
  });

  it('refuses bad UMBmark files row by row (line numbers of the file), and stores nothing', async () => {
    const before = await counts();
    // A missing column: the header row.
    expect(problemsOf(await previewRuns('direction,x_error\ncw,0.1\n'))).toEqual([expect.objectContaining({ row: 1 })]);
    // A decimal comma (quoted, so it stays one cell) and an unknown direction, after a blank line.
    const bad = [...goodRuns];
    bad[2] = 'cw,"-0,296",-0.354';
    bad[4] = 'sideways,-0.3,-0.35';
    const problems = problemsOf(await previewRuns(`${bad.slice(0, 3).join('\n')}\n\n${bad.slice(3).join('\n')}\n`));
    expect(problems).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ row: 3, column: 'x_error', message: expect.stringMatching(/decimal comma/) }),
        expect.objectContaining({ row: 6, column: 'direction', message: expect.stringMatching(/neither cw nor ccw/) }),
      ]),
    );
    // An unquoted decimal comma splits the row into too many cells.
    const split = problemsOf(await previewRuns(['direction,x_error,y_error', 'cw,-0,3,-0.35', ...goodRuns.slice(2)].join('\n')));
    expect(split[0]).toMatchObject({ row: 2, message: expect.stringMatching(/4 cells.*decimal point/) });
    // Only four runs in one direction: a whole-file problem.
    const four = problemsOf(await previewRuns(goodRuns.slice(0, 5).concat(goodRuns.slice(6)).join('\n')));
    expect(four.some((p) => p.row === null && /clockwise/.test(p.message))).toBe(true);
    // An outlier: one run 30 cm away from its direction's others (row 4 of the file).
    const outlier = [...goodRuns];
    outlier[3] = 'cw,0.000,-0.050';
    expect(problemsOf(await previewRuns(outlier.join('\n')))).toEqual([expect.objectContaining({ row: 4 })]);
    // Binary junk, an empty file, semicolons.
    expect(problemsOf(await previewRuns(Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex'), undefined, 'photo.png'))[0].row).toBeNull();
    expect(problemsOf(await previewRuns(Buffer.from([0xff, 0xfe, 0x41, 0x00])))[0].message).toMatch(/not a text CSV/);
    expect(problemsOf(await previewRuns(' \n'))[0].message).toMatch(/empty/);
    expect(problemsOf(await previewRuns('direction;x_error;y_error\ncw;0,1;0,2\n'))[0]).toMatchObject({ row: 1, message: expect.stringMatching(/semicolons/) });
    // An unclosed quote.
    expect(problemsOf(await previewRuns(`${goodRuns.slice(0, 3).join('\n')}\ncw,"-0.3,-0.35\n`))[0].row).toBeGreaterThanOrEqual(4);
    // Too large: the upload's own limit.
    const huge = await previewRuns(Buffer.alloc(1024 * 1024 + 1, 'a'));
    expect(huge.status).toBe(413);
    expect(huge.body.error.code).toBe('file_too_large');
    // A path-traversal name is only a name.
    await previewRuns(runsCsv, undefined, '../../../etc/passwd').expect(200);
    // And saving any of these stores nothing.
    const saved = await saveProfile({ runs: [outlier.join('\n'), 'runs.csv'] });
    expect(problemsOf(saved)).toEqual([expect.objectContaining({ row: 4 })]);
    expect(await counts()).toEqual(before);
  });

  it('lists at most FLEET_MAX_PROBLEMS problems of a long bad file', async () => {
    const lines = ['direction,x_error,y_error', ...Array.from({ length: 400 }, () => 'cw,x,y')];
    const problems = problemsOf(await previewRuns(lines.join('\n')));
    expect(problems).toHaveLength(FLEET_MAX_PROBLEMS);
  });

  it('alpha-fit preview: the shared estimator seeded by the file, residuals thinned, the same file the same intervals', async () => {
    const first = await employer.post(`${ORG}/fleet-calibration/alpha-fit`).attach('poses', posesCsv, 'poses.csv').expect(200);
    const fit = first.body.alphaFit;
    const read = pairedPosesFromCsvRecords(recordsOf(posesCsv));
    const direct = fitDriftAlphas(read.odometry, read.reference, { resamples: 500, seed: createHash('sha256').update(posesCsv).digest('hex') });
    expect(fit.alphas).toEqual(direct.alphas);
    expect(fit.bootstrap.intervals).toEqual(direct.bootstrap.intervals);
    expect(fit.residualsTotal).toBe(direct.residuals.length);
    expect(fit.residuals.length).toBeLessThanOrEqual(FLEET_RESIDUALS_MAX);
    expect(fit.residuals[0]).toEqual(direct.residuals[0]);
    // Every noise term keeps its share of the plot, over all the steps.
    for (const component of ['rot1', 'trans', 'rot2'] as const) {
      const shown = fit.residuals.filter((r: { component: string }) => r.component === component);
      const all = direct.residuals.filter((r) => r.component === component);
      expect(shown.length, component).toBe(Math.min(all.length, FLEET_RESIDUALS_MAX / 3));
      expect(shown.at(-1).step, component).toBeGreaterThan(all.at(-1)!.step * 0.99);
    }
    // The invented truth of the simulated sample lies inside every 95 % interval.
    const truth = [0.014, 4e-5, 0.0032, 1.3e-4];
    truth.forEach((a, i) => {
      expect(fit.bootstrap.intervals[i].lower).toBeLessThanOrEqual(a);
      expect(fit.bootstrap.intervals[i].upper).toBeGreaterThanOrEqual(a);
    });
    const again = await employer.post(`${ORG}/fleet-calibration/alpha-fit`).attach('poses', posesCsv, 'other-name.csv').expect(200);
    expect(again.body.alphaFit.bootstrap).toEqual(fit.bootstrap);
  }, 60_000);

  it('refuses bad pose files row by row, and too many rows', async () => {
    const lines = posesCsv.toString('utf8').trim().split('\n');
    const broken = [...lines];
    broken[10] = broken[10].replace(/^[^,]+/, '1.5m');
    broken[20] = broken[20].replace(/,[^,]+$/, ',0.1');
    const problems = problemsOf(await employer.post(`${ORG}/fleet-calibration/alpha-fit`).attach('poses', Buffer.from(broken.join('\n')), 'p.csv'));
    expect(problems).toEqual([
      expect.objectContaining({ row: 11, column: 'odom_x' }),
      expect.objectContaining({ row: 21, column: 'time' }),
    ]);
    const few = problemsOf(await employer.post(`${ORG}/fleet-calibration/alpha-fit`).attach('poses', Buffer.from(lines.slice(0, 10).join('\n')), 'p.csv'));
    expect(few[0].row).toBeNull();
    const long = [lines[0], ...Array.from({ length: 20_001 }, (_, i) => `0,0,0,0,0,0,${i}`)].join('\n');
    const tooLong = problemsOf(await employer.post(`${ORG}/fleet-calibration/alpha-fit`).attach('poses', Buffer.from(long), 'p.csv'));
    expect(tooLong[0]).toMatchObject({ row: null, message: expect.stringMatching(/20,001 rows.*20,000/) });
    const extraField = await employer.post(`${ORG}/fleet-calibration/alpha-fit`).field('robotId', 'aisle-tugger').attach('poses', posesCsv, 'p.csv').expect(400);
    expect(extraField.body.error.fields.robotId).toBeTruthy();
  });
});

describe('fleet profiles', () => {
  let profile: FleetProfileDetail;

  it('saves a profile from both files: recomputed on the server, files kept byte for byte under safe names', async () => {
    const res = await saveProfile({ runs: [runsCsv, '../../etc/runs<1>.csv'], poses: [posesCsv, 'C:\\logs\\poses'] }, { name: '  Tugger 3, hall A  ', robotId: 'aisle-tugger', ticksPerRevolution: '4096' });
    expect(res.status, res.text).toBe(201);
    profile = res.body.profile;
    expect(profile.name).toBe('Tugger 3, hall A');
    expect(profile.status).toBe('active');
    expect(profile.robot).toEqual({ baseRobotId: 'aisle-tugger', name: 'Aisle tugger (demo)', wheelRadius: 0.1, wheelbase: 0.5, ticksPerRevolution: 4096 });
    expect(profile.sources).toEqual({ umbmark: true, alphaFit: true });
    expect(profile.driftProfile).toEqual({ alphas: profile.alphaFit!.alphas, ed: profile.umbmark!.report.ed, eb: profile.umbmark!.report.eb });
    expect(profile.createdByName).toBe('Mira Okafor-Hale');
    expect(profile.files).toEqual([
      { kind: 'umbmark', fileName: 'runs_1_.csv', bytes: runsCsv.length },
      { kind: 'poses', fileName: 'poses.csv', bytes: posesCsv.length },
    ]);
    for (const [kind, bytes, name] of [['umbmark', runsCsv, 'runs_1_.csv'], ['poses', posesCsv, 'poses.csv']] as const) {
      const file = await employer
        .get(`${ORG}/fleet-profiles/${profile.id}/files/${kind}`)
        .buffer(true)
        .parse((r, cb) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => cb(null, Buffer.concat(chunks)));
        })
        .expect(200);
      expect(file.headers['content-type']).toMatch(/^text\/csv/);
      expect(file.headers['content-disposition'].replace(/"/g, '')).toBe(`attachment; filename=${name}`);
      expect((file.body as Buffer).equals(bytes)).toBe(true);
    }
    const detail = await employer.get(`${ORG}/fleet-profiles/${profile.id}`).expect(200);
    expect(detail.body.profile).toEqual(profile);
    const list = (await employer.get(`${ORG}/fleet-profiles`).expect(200)).body.items as FleetProfileSummary[];
    expect(list[0].id).toBe(profile.id);
    expect(list[0]).not.toHaveProperty('umbmark');
    expect(list[0].sources).toEqual({ umbmark: true, alphaFit: true });
    // The demo organization's seeded profile (simulated sample files) is there too.
    expect(list.some((p) => p.name === 'Tugger T-07, hall B (simulated runs)' && p.practiceTrialIds.length === 1)).toBe(true);
    // Admins read.
    const admin = await signedInAgent(t.app, 'admin');
    await admin.get(`${ORG}/fleet-profiles/${profile.id}`).expect(200);
  }, 60_000);

  it('saves from one file, using the base robot for the rest; refuses no file, no name, and Ed/Eb out of range', async () => {
    const runsOnly = await saveProfile({ runs: [goodRuns.join('\n'), 'r.csv'] }, { name: 'Runs only', robotId: 'pallet-mover' }).expect(201);
    expect(runsOnly.body.profile.driftProfile.alphas).toEqual(content.robots.get('pallet-mover')!.assumedProfile.alphas);
    expect(runsOnly.body.profile.sources).toEqual({ umbmark: true, alphaFit: false });
    const before = await counts();
    expect((await saveProfile({}, { name: 'Nothing', robotId: 'aisle-tugger' }).expect(400)).body.error.code).toBe('no_file');
    expect((await saveProfile({ runs: [runsCsv, 'r.csv'] }, { robotId: 'aisle-tugger' }).expect(400)).body.error.fields.name).toBeTruthy();
    expect((await saveProfile({ runs: [runsCsv, 'r.csv'] }, { name: 'x'.repeat(81), robotId: 'aisle-tugger' }).expect(400)).body.error.fields.name).toBeTruthy();
    // Runs 2.5 m short on both directions: alpha ≈ 0.31 rad, Eb ≈ 1.25 (Borenstein & Feng 1996: Eb = (pi/2)/(pi/2 - alpha)).
    const wild = await saveProfile({ runs: [['direction,x_error,y_error', ...runLines([-2.5, 0], [-2.5, 0])].join('\n'), 'r.csv'] }).expect(400);
    expect(wild.body.error.code).toBe('drift_out_of_range');
    expect(wild.body.error.message).toMatch(/Eb = 1\.2\d+.*between 0\.8 and 1\.2/);
    // A reference track in other units (centimetres against metres): the fitted drift dwarfs the motion.
    const header = 'odom_x,odom_y,odom_theta,ref_x,ref_y,ref_theta';
    const rows = Array.from({ length: 60 }, (_, i) => {
      const x = 0.2 * i;
      const y = 0.05 * Math.sin(i);
      return [x, y, 0.1 * Math.sin(i / 3), 100 * x, 100 * y, 0.1 * Math.sin(i / 3)].map((v) => v.toFixed(4)).join(',');
    });
    const preview = await employer.post(`${ORG}/fleet-calibration/alpha-fit`).attach('poses', Buffer.from([header, ...rows].join('\n')), 'p.csv').expect(200);
    expect(preview.body.alphaFit.warnings[0]).toMatch(/at most 1,.*cannot be saved as a fleet profile/);
    const units = await saveProfile({ poses: [[header, ...rows].join('\n'), 'p.csv'] }).expect(400);
    expect(units.body.error.code).toBe('drift_out_of_range');
    expect(units.body.error.fields.poses).toMatch(/at most 1,/);
    expect(await counts()).toEqual(before);
  });

  it("keeps each organization's profiles to itself", async () => {
    const theirs = await saveProfile({ runs: [runsCsv, 'r.csv'] }, { name: 'Their tugger', robotId: 'aisle-tugger' }, otherEmployer, `/api/organizations/${otherOrgId}`).expect(201);
    const theirId = theirs.body.profile.id;
    // Their employer on our organization: the guard refuses.
    await otherEmployer.get(`${ORG}/fleet-profiles`).expect(403);
    await otherEmployer.get(`${ORG}/fleet-profiles/${profile.id}`).expect(403);
    await otherEmployer.get(`${ORG}/fleet-profiles/${profile.id}/files/umbmark`).expect(403);
    await otherEmployer.post(`${ORG}/fleet-profiles/${profile.id}/archive`).expect(403);
    // Their profile under our organization's address: not found.
    await employer.get(`${ORG}/fleet-profiles/${theirId}`).expect(404);
    await employer.get(`${ORG}/fleet-profiles/${theirId}/files/umbmark`).expect(404);
    await employer.put(`${ORG}/fleet-profiles/${theirId}/practice-trials`).send({ trialIds: [] }).expect(404);
    await employer.post(`${ORG}/fleet-profiles/${theirId}/archive`).expect(404);
    expect(((await employer.get(`${ORG}/fleet-profiles`).expect(200)).body.items as FleetProfileSummary[]).some((p) => p.id === theirId)).toBe(false);
    // Our operator cannot drive on it.
    const res = await operator.post('/api/attempts').send({ trialId: 'long-aisle-run', mode: 'practice', fleetProfileId: theirId }).expect(404);
    expect(res.body.error.message).toMatch(/fleet profile/);
  });

  it('assigns practice trials of the profile\'s robot only', async () => {
    const wrongRobot = await employer.put(`${ORG}/fleet-profiles/${profile.id}/practice-trials`).send({ trialIds: ['long-aisle-run', 'dock-door-three'] }).expect(400);
    expect(wrongRobot.body.error.fields.trialIds).toMatch(/pallet mover/i);
    const unknown = await employer.put(`${ORG}/fleet-profiles/${profile.id}/practice-trials`).send({ trialIds: ['no-such-trial'] }).expect(400);
    expect(unknown.body.error.fields.trialIds).toMatch(/No trial/);
    await employer.put(`${ORG}/fleet-profiles/${profile.id}/practice-trials`).send({ trialIds: ['long-aisle-run', 'long-aisle-run'] }).expect(400);
    const ok = await employer.put(`${ORG}/fleet-profiles/${profile.id}/practice-trials`).send({ trialIds: ['rack-end-slalom', 'long-aisle-run'] }).expect(200);
    expect(ok.body.profile.practiceTrialIds).toEqual(['long-aisle-run', 'rack-end-slalom']);
    const items = (await operator.get('/api/fleet-practice').expect(200)).body.items as FleetPracticeTrial[];
    const mine = items.filter((i) => i.fleetProfileId === profile.id);
    expect(mine.map((i) => i.trialId)).toEqual(['long-aisle-run', 'rack-end-slalom']);
    expect(mine[0]).toEqual({ trialId: 'long-aisle-run', trialTitle: content.trials.get('long-aisle-run')!.title, robotName: 'Aisle tugger (demo)', fleetProfileId: profile.id, fleetProfileName: 'Tugger 3, hall A' });
  });

  let attemptId = '';

  it("a practice drive on the profile runs with its robot and drift: the same truth as a DriveSim built with them and the attempt's secret seed", async () => {
    const trialId = 'long-aisle-run';
    const res = await operator.post('/api/attempts').send({ trialId, mode: 'practice', fleetProfileId: profile.id });
    expect(res.status, res.text).toBe(201);
    const start = res.body as AttemptStart;
    attemptId = start.attempt.id;
    expect(start.attempt.fleetProfile).toEqual({ id: profile.id, name: 'Tugger 3, hall A' });
    expect(start.trial.robot.assumedProfile).toEqual({ alphas: profile.driftProfile.alphas, ed: 1, eb: 1 });
    expect(start.trial.robot.ticksPerRevolution).toBe(4096);
    expect(res.text).not.toContain('hiddenErrors');
    expect(res.text).not.toContain(String(profile.driftProfile.ed));

    const trial = content.trials.get(trialId)!;
    await driveTrial(trial, start.trial.robot, apiPort(operator, attemptId), start.state, { batch: 5, maxBatches: 60, chooseCall: () => 'halt' });
    const done = (await operator.post(`/api/attempts/${attemptId}/submit`).expect(200)).body as AttemptView;
    expect(done.trial.robot.assumedProfile.alphas).toEqual(profile.driftProfile.alphas);
    expect(done.attempt.fleetProfile?.name).toBe('Tugger 3, hall A');

    // The effective trial and robot, built here by hand from the profile (not by the server's code).
    const attempt = await Attempt.findByPk(attemptId);
    const hiddenErrors = { ed: profile.driftProfile.ed, eb: profile.driftProfile.eb };
    const base = content.robots.get(trial.robotId)!;
    const robot = { ...base, ticksPerRevolution: 4096, assumedProfile: { alphas: profile.driftProfile.alphas, ed: 1, eb: 1 }, hiddenErrors };
    const replay = (setup: ConstructorParameters<typeof DriveSim>[0]) => {
      const sim = new DriveSim(setup);
      for (const entry of done.result!.log) {
        const req = entry.request as { commands?: { v: number; w: number }[]; callPointId?: string; call?: 'halt'; estimate?: { x: number; y: number; radius: number } };
        if (entry.kind === 'steps') sim.applyBatch(req.commands!);
        if (entry.kind === 'call') sim.answerCall(req.callPointId!, req.call!, req.estimate ?? null);
      }
      return sim;
    };
    const surfaces = [...content.surfaces.values()];
    const fleetSim = replay({ trial: { ...trial, hiddenErrors }, robot, surfaces, secretSeed: attempt!.secretSeed });
    expect(done.result!.trace).toEqual(fleetSim.trace);
    expect(done.result!.truePose).toEqual(fleetSim.truePose());
    // … and not the truth of the standard robot.
    const standard = replay({ trial, robot: base, surfaces, secretSeed: attempt!.secretSeed });
    expect(done.result!.truePose).not.toEqual(standard.truePose());
  }, 120_000);

  it('the report and the attempt list name the profile and show its drift', async () => {
    let report: AttemptReport | null = null;
    for (let i = 0; i < 100 && !report; i++) {
      const res = await operator.get(`/api/attempts/${attemptId}/report`);
      if (res.status === 200) report = res.body;
      else await new Promise((r) => setTimeout(r, 200));
    }
    expect(report, 'scored within 20 s').not.toBeNull();
    expect(report!.attempt.fleetProfile).toEqual({ id: profile.id, name: 'Tugger 3, hall A' });
    expect(report!.trial.robot.assumedProfile.alphas).toEqual(profile.driftProfile.alphas);
    const list = await employer.get('/api/attempts').query({ trialId: 'long-aisle-run' }).expect(200);
    expect(list.body.items.find((a: { id: string }) => a.id === attemptId).fleetProfile.name).toBe('Tugger 3, hall A');
    const plain = await operator.post('/api/attempts').send({ trialId: 'rack-end-slalom', mode: 'practice' }).expect(201);
    expect(plain.body.attempt.fleetProfile).toBeNull();
    expect(plain.body.trial.robot.assumedProfile).toEqual(content.robots.get('aisle-tugger')!.assumedProfile);
  }, 60_000);

  it('exams never run on a fleet profile; unassigned trials and unknown profiles are refused', async () => {
    const exam = await operator.post('/api/attempts').send({ trialId: 'long-aisle-run', mode: 'exam', fleetProfileId: profile.id }).expect(400);
    expect(exam.body.error.fields.fleetProfileId).toBe('Exams always run on the standard drift profiles.');
    const unassigned = await operator.post('/api/attempts').send({ trialId: 'wash-bay-crossing', mode: 'practice', fleetProfileId: profile.id }).expect(409);
    expect(unassigned.body.error.message).toMatch(/not a practice trial of the fleet profile "Tugger 3, hall A"/);
    await operator.post('/api/attempts').send({ trialId: 'long-aisle-run', mode: 'practice', fleetProfileId: '00000000-0000-4000-8000-000000000000' }).expect(404);
    await operator.post('/api/attempts').send({ trialId: 'long-aisle-run', mode: 'practice', fleetProfileId: 'not-a-uuid' }).expect(400);
  });

  it("a practice trial whose robot is no longer the profile's (the content changed) is neither listed nor started", async () => {
    // As if the content had moved "Dock door 3" to the aisle tugger, the employer assigned it, and it moved back.
    const row = await FleetPracticeTrialRow.create({ profileId: profile.id, trialId: 'dock-door-three', assignedBy: (await User.findOne({ where: { email: 'employer@demo.driftproof.test' } }))!.id });
    try {
      const items = (await operator.get('/api/fleet-practice').expect(200)).body.items as FleetPracticeTrial[];
      expect(items.some((i) => i.trialId === 'dock-door-three')).toBe(false);
      const refused = await operator.post('/api/attempts').send({ trialId: 'dock-door-three', mode: 'practice', fleetProfileId: profile.id }).expect(409);
      expect(refused.body.error.code).toBe('not_a_fleet_practice_trial');
    } finally {
      await row.destroy();
    }
  });

  it('an archived profile keeps its drives but starts no new ones', async () => {
    const res = await employer.post(`${ORG}/fleet-profiles/${profile.id}/archive`).expect(200);
    expect(res.body.profile.status).toBe('archived');
    await employer.post(`${ORG}/fleet-profiles/${profile.id}/archive`).expect(200);
    const refused = await operator.post('/api/attempts').send({ trialId: 'long-aisle-run', mode: 'practice', fleetProfileId: profile.id }).expect(409);
    expect(refused.body.error.message).toMatch(/archived/);
    await employer.put(`${ORG}/fleet-profiles/${profile.id}/practice-trials`).send({ trialIds: [] }).expect(409);
    const items = (await operator.get('/api/fleet-practice').expect(200)).body.items as FleetPracticeTrial[];
    expect(items.some((i) => i.fleetProfileId === profile.id)).toBe(false);
    const view = (await operator.get(`/api/attempts/${attemptId}`).expect(200)).body as AttemptView;
    expect(view.attempt.fleetProfile?.name).toBe('Tugger 3, hall A');
    expect(view.trial.robot.assumedProfile.alphas).toEqual(profile.driftProfile.alphas);
  });
});
