import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request, { type Agent } from 'supertest';
import type { AttemptReport, Call } from '../../shared/schemas';
import { hashPassword } from '../../server/auth/passwords';
import { Attempt, User } from '../../server/db/models';
import { startWorkers } from '../../server/jobs/workers';
import { computeScore } from '../../server/services/scores';
import { createTestApp, mailContaining, signedInAgent, type TestApp } from '../support/api';
import { shippedContent } from '../support/content';
import { apiPort, startDrive } from '../support/drive-api';
import { driveTrial } from '../support/scripted-operator';

let seedCounter = 0;
const t: TestApp = createTestApp({}, { newSeed: () => `review-seed-${seedCounter++}` });
beforeAll(() => startWorkers(t.ctx));
afterAll(() => t.close());

const content = shippedContent();

async function submittedDrive(agent: Agent, trialId: string, mode: 'practice' | 'exam', policy: () => Call): Promise<string> {
  const start = await startDrive(agent, trialId, mode);
  const trial = content.trials.get(trialId)!;
  await driveTrial(trial, content.robots.get(trial.robotId)!, apiPort(agent, start.attempt.id), start.state, { chooseCall: policy, batch: 5 });
  await agent.post(`/api/attempts/${start.attempt.id}/submit`).expect(200);
  return start.attempt.id;
}

/** The report once the scoring job has run. */
async function reportOf(agent: Agent, attemptId: string): Promise<AttemptReport> {
  for (let i = 0; i < 100; i++) {
    const res = await agent.get(`/api/attempts/${attemptId}/report`);
    if (res.status === 200) return res.body;
    expect(res.body.error.code).toBe('scoring');
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error('The attempt was never scored');
}

async function secondAssessor(): Promise<Agent> {
  const email = 'second.assessor@demo.driftproof.test';
  if (!(await User.findOne({ where: { email } }))) {
    await User.create({ email, name: 'Second Assessor', role: 'assessor', organizationId: null, passwordHash: await hashPassword('second-assessor-pw', 4), lastSignInAt: null });
  }
  const agent = request.agent(t.app);
  await agent.post('/api/auth/sign-in').send({ email, password: 'second-assessor-pw' }).expect(200);
  return agent;
}

describe('scoring after submission', () => {
  it('a practice drive is scored by the job, final at once, and the operator is e-mailed', async () => {
    const operator = await signedInAgent(t.app, 'operator2');
    const attemptId = await submittedDrive(operator, 'long-aisle-run', 'practice', () => 'reanchor');
    const report = await reportOf(operator, attemptId);
    expect(report.score.version).toBe('scoring-1');
    expect(report.review.status).toBe('not_required');
    expect(report.finalScore).toEqual(report.score);
    expect(report.score.calls[0]).toMatchObject({ callPointId: 'gap-pallet-stacks', call: 'reanchor' });
    expect(report.trace.length).toBeGreaterThan(100);
    const mail = await mailContaining('operator2@demo.driftproof.test', `/attempts/${attemptId}/report`);
    expect(mail.subject).toBe('Your Driftproof result: Long aisle run');

    // Rescoring the stored log reproduces the stored score exactly.
    const attempt = await Attempt.findByPk(attemptId);
    expect(JSON.parse(JSON.stringify(await computeScore(t.ctx, attempt!)))).toEqual(report.score);
  });
});

describe("the assessor's review", () => {
  let attemptId: string;
  beforeAll(async () => {
    const operator = await signedInAgent(t.app, 'operator1');
    attemptId = await submittedDrive(operator, 'wash-bay-crossing', 'exam', () => 'proceed');
  });

  it('an exam drive of a trial that always needs review waits for an assessor; others see only what they may', async () => {
    const operator = await signedInAgent(t.app, 'operator1');
    const report = await reportOf(operator, attemptId);
    expect(report.review.status).toBe('awaiting');
    expect(report.finalScore).toBeNull();
    expect(report.score.calls.map((c) => c.grade)).toContain('unsafe');
    await (await signedInAgent(t.app, 'employer')).get(`/api/attempts/${attemptId}/report`).expect(200);
    await (await signedInAgent(t.app, 'operator2')).get(`/api/attempts/${attemptId}/report`).expect(404);
    await (await signedInAgent(t.app, 'hr')).get(`/api/attempts/${attemptId}/report`).expect(403);
    await (await signedInAgent(t.app, 'operator1')).get('/api/reviews').expect(403);
    await (await signedInAgent(t.app, 'employer')).post(`/api/reviews/${attemptId}/claim`).expect(403);
  });

  it('appears in the queue with its filters, is claimed by one assessor only, and needs reasons to amend', async () => {
    const assessor = await signedInAgent(t.app, 'assessor');
    const queue = await assessor.get('/api/reviews').query({ levelId: 'floor-and-dock', flagged: 'no', status: 'open' }).expect(200);
    expect(queue.body.items.map((i: { attemptId: string }) => i.attemptId)).toContain(attemptId);
    const otherLevel = await assessor.get('/api/reviews').query({ levelId: 'aisle-operator' }).expect(200);
    expect(otherLevel.body.items.map((i: { attemptId: string }) => i.attemptId)).not.toContain(attemptId);
    const tooFresh = await assessor.get('/api/reviews').query({ minAgeHours: 5 }).expect(200);
    expect(tooFresh.body.items.map((i: { attemptId: string }) => i.attemptId)).not.toContain(attemptId);

    await assessor.post(`/api/reviews/${attemptId}/claim`).expect(200);
    const other = await secondAssessor();
    const refused = await other.post(`/api/reviews/${attemptId}/claim`).expect(409);
    expect(refused.body.error.code).toBe('claimed_by_other');
    await other.post(`/api/reviews/${attemptId}/verdict`).send({ verdict: 'confirm' }).expect(409);

    const noReason = await assessor
      .post(`/api/reviews/${attemptId}/verdict`)
      .send({ verdict: 'amend', amendments: [{ target: 'call', callPointId: 'wash-bay-south-door', grade: 'risky' }] })
      .expect(400);
    expect(noReason.body.error.fields['amendments.0.reason']).toBe('Write the reason.');
    const wrongCall = await assessor
      .post(`/api/reviews/${attemptId}/verdict`)
      .send({ verdict: 'amend', amendments: [{ target: 'call', callPointId: 'gap-pallet-stacks', grade: 'risky', reason: 'No such call in this drive at all.' }] })
      .expect(400);
    expect(wrongCall.body.error.fields['amendments.0.callPointId']).toBeDefined();
  });

  it('an amend with reasons is signed, audited, e-mailed, and can be overwritten by no one', async () => {
    const assessor = await signedInAgent(t.app, 'assessor');
    const signed = await assessor
      .post(`/api/reviews/${attemptId}/verdict`)
      .send({
        verdict: 'amend',
        reason: 'Replay shows the door sensor reported late; grading adjusted.',
        amendments: [
          { target: 'call', callPointId: 'wash-bay-south-door', grade: 'risky', reason: 'Marker glare made the marker unreadable at the door.' },
          { target: 'docking', dockScore: 0.5, reason: 'Dock plate was mis-surveyed by 10 cm on this site.' },
        ],
      })
      .expect(200);
    expect(signed.body.review).toMatchObject({ status: 'amended', verdict: 'amend', assessorName: 'Priya Castellane' });

    const report = await reportOf(await signedInAgent(t.app, 'operator1'), attemptId);
    expect(report.finalScore!.calls.find((c) => c.callPointId === 'wash-bay-south-door')!.grade).toBe('risky');
    expect(report.finalScore!.parts.docking).toBe(0.5);
    expect(report.score.calls.find((c) => c.callPointId === 'wash-bay-south-door')!.grade).toBe('unsafe');

    const audit = await assessor.get(`/api/reviews/${attemptId}/audit`).expect(200);
    expect(audit.body.items.map((e: { action: string }) => e.action)).toEqual(['scored', 'claimed', 'amended call', 'amended docking', 'amended']);
    expect(audit.body.items[2]).toMatchObject({ actorName: 'Priya Castellane', reason: 'Marker glare made the marker unreadable at the door.' });

    const mail = await mailContaining('operator1@demo.driftproof.test', `/attempts/${attemptId}/report`);
    expect(mail.subject).toBe('Your Driftproof result: Wash bay crossing');
    expect(mail.textBody).toContain('final: not passed');

    const again = await assessor.post(`/api/reviews/${attemptId}/verdict`).send({ verdict: 'confirm' }).expect(409);
    expect(again.body.error.code).toBe('review_signed');
    await (await secondAssessor()).post(`/api/reviews/${attemptId}/claim`).expect(409);
    await expect(t.ctx.sequelize.query(`UPDATE review_audit SET reason = 'rewritten' WHERE attempt_id = :attemptId`, { replacements: { attemptId } })).rejects.toThrow(/append-only/);
  });

  it('a void returns the exam seat', async () => {
    const operator = await signedInAgent(t.app, 'operator1');
    const seatsBefore = (await operator.get('/api/exam-seats')).body.available as number;
    const voidId = await submittedDrive(operator, 'dock-door-three', 'exam', () => 'creep');
    expect((await operator.get('/api/exam-seats')).body.available).toBe(seatsBefore - 1);
    await reportOf(operator, voidId);
    const assessor = await secondAssessor();
    await assessor.post(`/api/reviews/${voidId}/claim`).expect(200);
    await assessor.post(`/api/reviews/${voidId}/verdict`).send({ verdict: 'void' }).expect(400);
    await assessor.post(`/api/reviews/${voidId}/verdict`).send({ verdict: 'void', reason: 'The drive froze for 40 s on our side.' }).expect(200);
    expect((await operator.get('/api/exam-seats')).body.available).toBe(seatsBefore);
    const report = await reportOf(operator, voidId);
    expect(report.review.status).toBe('voided');
    expect(report.finalPassed).toBeNull();
  });

  it('an assessor cannot review an attempt of their own', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const email = 'switching.role@demo.driftproof.test';
    await admin.post('/api/users').send({ email, name: 'Switching Role', role: 'operator', organizationId: 1 }).expect(201);
    const user = (await User.findOne({ where: { email } }))!;
    await user.update({ passwordHash: await hashPassword('switching-role-pw', 4) });
    await admin.post('/api/organizations/1/seat-grants').send({ count: 1 }).expect(201);
    const operator = request.agent(t.app);
    await operator.post('/api/auth/sign-in').send({ email, password: 'switching-role-pw' }).expect(200);
    const own = await submittedDrive(operator, 'dock-door-three', 'exam', () => 'creep');
    await reportOf(operator, own);
    await admin.patch(`/api/users/${user.id}`).send({ role: 'assessor', organizationId: null }).expect(200);
    const asAssessor = request.agent(t.app);
    await asAssessor.post('/api/auth/sign-in').send({ email, password: 'switching-role-pw' }).expect(200);
    const res = await asAssessor.post(`/api/reviews/${own}/claim`).expect(403);
    expect(res.body.error.code).toBe('own_attempt');
  });
});
