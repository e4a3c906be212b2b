import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { AttemptView, Call, PublicTrial } from '../../shared/schemas';
import { DriveSim } from '../../shared/sim';
import { createApp } from '../../server/app';
import { createDriveCache } from '../../server/services/drive-cache';
import { Attempt } from '../../server/db/models';
import { createTestApp, signedInAgent, type TestApp } from '../support/api';
import { driveSetup, shippedContent } from '../support/content';
import { apiPort, startDrive, type ResponseLog } from '../support/drive-api';
import { driveTrial } from '../support/scripted-operator';

let seedCounter = 0;
const newSeed = () => `test-seed-${seedCounter++}`;
const t: TestApp = createTestApp({}, { newSeed });
afterAll(() => t.close());

const content = shippedContent();
const robotOf = (trialId: string) => content.robots.get(content.trials.get(trialId)!.robotId)!;

describe('trials and levels', () => {
  it('lists levels and trials, and gives a trial without its hidden errors', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const levels = await agent.get('/api/levels').expect(200);
    expect(levels.body.items.map((l: { id: string }) => l.id)).toEqual(['aisle-operator', 'floor-and-dock', 'drift-judgement']);
    const trials = await agent.get('/api/trials').expect(200);
    expect(trials.body.items).toHaveLength(6);
    const one = await agent.get('/api/trials/uncalibrated-rover').expect(200);
    const trial = one.body.trial as PublicTrial;
    expect(trial.robot.id).toBe('inspection-rover');
    expect(trial.map.obstacles.length).toBeGreaterThan(10);
    expect(one.text).not.toContain('hiddenErrors');
    await agent.get('/api/trials/no-such-trial').expect(404);
  });

  it("lists the robots with their nominal geometry only, and names each trial's robot", async () => {
    const agent = await signedInAgent(t.app, 'employer');
    const robots = await agent.get('/api/robots').expect(200);
    expect(robots.body.items.map((r: { id: string }) => r.id).sort()).toEqual([...content.robots.keys()].sort());
    const tugger = robots.body.items.find((r: { id: string }) => r.id === 'aisle-tugger');
    expect(tugger).toEqual({ id: 'aisle-tugger', name: 'Aisle tugger (demo)', description: expect.any(String), wheelRadius: 0.1, wheelbase: 0.5, ticksPerRevolution: 1024 });
    expect(robots.text).not.toContain('hiddenErrors');
    const trials = await agent.get('/api/trials').expect(200);
    for (const item of trials.body.items) expect(item.robotId).toBe(content.trials.get(item.id)!.robotId);
  });

  it('needs a signed-in user', async () => {
    await request(t.app).get('/api/trials').expect(401);
  });
});

describe('driving every shipped trial through the API', () => {
  for (const trialId of content.trials.keys()) {
    it(`a scripted operator drives ${trialId} from start to dock and submits`, async () => {
      const agent = await signedInAgent(t.app, 'operator1');
      const start = await startDrive(agent, trialId);
      const result = await driveTrial(content.trials.get(trialId)!, robotOf(trialId), apiPort(agent, start.attempt.id), start.state, {
        // Re-anchor where a marker can be read, else ask for assisted recovery.
        chooseCall: (_cp, state) => (state.markersInView.length ? 'reanchor' : 'halt'),
        batch: 4,
      });
      expect(result.state.docked).toBe(true);
      expect(result.state.contacts).toBe(0);
      const submitted = await agent.post(`/api/attempts/${start.attempt.id}/submit`).expect(200);
      expect(submitted.body.attempt.status).toBe('submitted');
      expect(submitted.body.result.trace.length).toBeGreaterThan(50);
    });
  }
});

describe('calls at a call point', () => {
  async function toCallPoint(trialId: string) {
    const agent = await signedInAgent(t.app, 'operator2');
    const start = await startDrive(agent, trialId);
    const port = apiPort(agent, start.attempt.id);
    // Drive with the scripted operator until the first call point stops the robot.
    let reached = start.state;
    await driveTrial(content.trials.get(trialId)!, robotOf(trialId), {
      step: async (fromSeq, commands) => {
        const r = await port.step(fromSeq, commands);
        reached = r.state;
        return r;
      },
      call: () => {
        throw new Error('stop here');
      },
    }, start.state, { batch: 4 }).catch((e: Error) => expect(e.message).toBe('stop here'));
    expect(reached.status).toBe('awaiting_call');
    return { agent, attemptId: start.attempt.id, state: reached };
  }

  it.each<[Call]>([['proceed'], ['creep'], ['reanchor'], ['halt']])('%s on the long aisle run answers the call and drives the pass', async (call) => {
    const { agent, attemptId, state } = await toCallPoint('long-aisle-run');
    expect(state.markersInView).toContain('marker-east-1');
    await agent.post(`/api/attempts/${attemptId}/steps`).send({ fromSeq: state.seq, commands: [{ v: 1, w: 0 }] }).expect(409);
    const res = await agent
      .post(`/api/attempts/${attemptId}/calls`)
      .send({ callPointId: 'gap-pallet-stacks', call, estimate: { x: state.odometry.x, y: state.odometry.y, radius: 0.6 } })
      .expect(200);
    const types = res.body.events.map((e: { type: string }) => e.type);
    expect(types).toContain('pass_done');
    expect(types.includes('reanchored')).toBe(call === 'reanchor' || call === 'halt');
    expect(res.body.odometry.length).toBeGreaterThan(5);
    expect(res.body.state.answeredCallPoints).toEqual(['gap-pallet-stacks']);
    const rubric = content.trials.get('long-aisle-run')!.rubric;
    const penalty = call === 'halt' ? rubric.haltSeconds : call === 'reanchor' ? rubric.reanchorSeconds : 0;
    expect(res.body.state.time).toBeGreaterThan(state.time + penalty);
  });

  it('refuses to re-anchor where no marker can be read (422), and keeps the drive waiting', async () => {
    const { agent, attemptId, state } = await toCallPoint('charging-bay-pass');
    expect(state.markersInView).toEqual([]);
    const estimate = { x: state.odometry.x, y: state.odometry.y, radius: 0.5 };
    const res = await agent.post(`/api/attempts/${attemptId}/calls`).send({ callPointId: 'charger-pass', call: 'reanchor', estimate }).expect(422);
    expect(res.body.error.code).toBe('no_marker_in_view');
    const after = await agent.get(`/api/attempts/${attemptId}`).expect(200);
    expect(after.body.state.status).toBe('awaiting_call');
    await agent.post(`/api/attempts/${attemptId}/calls`).send({ callPointId: 'charger-pass', call: 'creep', estimate }).expect(200);
  });

  it('asks for the estimate pin where the trial wants one, and refuses a call for another call point', async () => {
    const { agent, attemptId } = await toCallPoint('dock-door-three');
    const missing = await agent.post(`/api/attempts/${attemptId}/calls`).send({ callPointId: 'door-3-bay', call: 'proceed' }).expect(400);
    expect(missing.body.error.code).toBe('estimate_required');
    const wrong = await agent
      .post(`/api/attempts/${attemptId}/calls`)
      .send({ callPointId: 'gap-pallet-stacks', call: 'proceed', estimate: { x: 1, y: 1, radius: 1 } })
      .expect(409);
    expect(wrong.body.error.code).toBe('wrong_call_point');
    const ok = { callPointId: 'door-3-bay', call: 'creep', estimate: { x: 22.5, y: 3.2, radius: 0.4 } };
    const first = await agent.post(`/api/attempts/${attemptId}/calls`).send(ok).expect(200);
    const again = await agent.post(`/api/attempts/${attemptId}/calls`).send(ok).expect(200);
    expect(again.body).toEqual(first.body);
    const other = await agent.post(`/api/attempts/${attemptId}/calls`).send({ ...ok, call: 'halt' }).expect(409);
    expect(other.body.error.code).toBe('call_already_made');
  });
});

describe('batches', () => {
  it('answers a resent batch with the stored answer, and a conflicting resend or a gap with 409 and the expected seq', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const start = await startDrive(agent, 'long-aisle-run');
    const url = `/api/attempts/${start.attempt.id}/steps`;
    const batch = { fromSeq: 0, commands: [{ v: 0.5, w: 0 }, { v: 0.8, w: 0.1 }, { v: 1, w: 0 }] };
    const first = await agent.post(url).send(batch).expect(200);
    expect(first.body.seq).toBe(3);
    const resent = await agent.post(url).send(batch).expect(200);
    expect(resent.body).toEqual(first.body);
    const conflicting = await agent.post(url).send({ fromSeq: 0, commands: [{ v: 0.1, w: 0 }] }).expect(409);
    expect(conflicting.body.error).toMatchObject({ code: 'seq_conflict', expectedSeq: 3 });
    const gap = await agent.post(url).send({ fromSeq: 5, commands: [{ v: 1, w: 0 }] }).expect(409);
    expect(gap.body.error.expectedSeq).toBe(3);
    const next = await agent.post(url).send({ fromSeq: 3, commands: [{ v: 1, w: 0 }] }).expect(200);
    expect(next.body.seq).toBe(4);
  });

  it('clamps commands to the robot limits', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const start = await startDrive(agent, 'long-aisle-run');
    const res = await agent
      .post(`/api/attempts/${start.attempt.id}/steps`)
      .send({ fromSeq: 0, commands: Array.from({ length: 30 }, () => ({ v: 99, w: 0 })) })
      .expect(200);
    const robot = robotOf('long-aisle-run');
    expect(res.body.state.v).toBeCloseTo(robot.limits.maxSpeed, 9);
    // At most maxAcceleration·dt more speed per period: the first step moves at most a·dt·dt.
    expect(res.body.odometry[0].x - start.state.odometry.x).toBeLessThanOrEqual(robot.limits.maxAcceleration * robot.controlPeriod ** 2 + 1e-3);
  });

  it('reports a contact and stops the robot when it drives into a wall', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const start = await startDrive(agent, 'dock-door-three');
    // Turn to face the south wall, then drive into it.
    const port = apiPort(agent, start.attempt.id);
    let r = await port.step(0, Array.from({ length: 20 }, () => ({ v: 0, w: -0.8 })));
    for (let i = 0; i < 10 && r.state.contacts === 0; i++) r = await port.step(r.seq, Array.from({ length: 20 }, () => ({ v: 0.6, w: 0 })));
    const contact = r.events.find((e) => e.type === 'contact');
    expect(contact).toMatchObject({ type: 'contact', obstacleId: expect.stringMatching(/wall-south|dock-bollard/) });
    const still = await port.step(r.seq, [{ v: 0, w: 0 }]);
    expect(still.state.v).toBe(0);
  });

  it('validates batches', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const start = await startDrive(agent, 'long-aisle-run');
    const url = `/api/attempts/${start.attempt.id}/steps`;
    const bad = await agent.post(url).send({ fromSeq: 0, commands: [{ v: 'fast', w: 0 }] }).expect(400);
    expect(bad.body.error.fields['commands.0.v']).toBeDefined();
    await agent.post(url).send({ fromSeq: 0, commands: [] }).expect(400);
    await agent.post(url).send({ fromSeq: 0, commands: Array.from({ length: 51 }, () => ({ v: 0, w: 0 })) }).expect(400);
    await agent.post(url).send({ fromSeq: -1, commands: [{ v: 0, w: 0 }] }).expect(400);
    await agent.post('/api/attempts/not-a-uuid/steps').send({ fromSeq: 0, commands: [{ v: 0, w: 0 }] }).expect(400);
    await agent.post('/api/attempts').send({ trialId: 'long-aisle-run', mode: 'race' }).expect(400);
    await agent.post('/api/attempts').send({ trialId: 'no-such-trial', mode: 'practice' }).expect(404);
  });
});

describe('abandoning and submitting', () => {
  it('an abandoned attempt takes no more commands, and submitting twice is harmless', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const start = await startDrive(agent, 'wash-bay-crossing');
    const url = `/api/attempts/${start.attempt.id}`;
    await agent.post(`${url}/steps`).send({ fromSeq: 0, commands: [{ v: 0.5, w: 0 }] }).expect(200);
    const abandoned = await agent.post(`${url}/abandon`).expect(200);
    expect(abandoned.body.attempt.status).toBe('abandoned');
    const refused = await agent.post(`${url}/steps`).send({ fromSeq: 1, commands: [{ v: 0.5, w: 0 }] }).expect(409);
    expect(refused.body.error.code).toBe('not_driving');
    await agent.post(`${url}/abandon`).expect(200);
    await agent.post(`${url}/submit`).expect(409);

    const other = await startDrive(agent, 'wash-bay-crossing');
    await agent.post(`/api/attempts/${other.attempt.id}/submit`).expect(200);
    await agent.post(`/api/attempts/${other.attempt.id}/submit`).expect(200);
  });
});

describe('the truth stays on the server', () => {
  it('no response before submission carries the secret seed or a true pose', async () => {
    const agent = await signedInAgent(t.app, 'operator2');
    const log: ResponseLog = [];
    const start = await startDrive(agent, 'long-aisle-run', 'practice', log);
    await driveTrial(content.trials.get('long-aisle-run')!, robotOf('long-aisle-run'), apiPort(agent, start.attempt.id, log), start.state, {
      chooseCall: () => 'proceed',
      batch: 5,
      maxBatches: 150,
    });
    const during = await agent.get(`/api/attempts/${start.attempt.id}`).expect(200);
    log.push(during.text);
    expect(during.body.result).toBeUndefined();
    const submitted = await agent.post(`/api/attempts/${start.attempt.id}/submit`).expect(200);
    const view = submitted.body as AttemptView;
    const { secretSeed, trace } = view.result!;
    const all = log.join('\n');
    expect(all).not.toContain(secretSeed);
    // Every true coordinate that differs from the odometry must appear in no earlier response.
    const leaked = trace
      .flatMap((s) => [s.truth.x, s.truth.y, s.truth.theta].filter((v, i) => v !== [s.odometry.x, s.odometry.y, s.odometry.theta][i]))
      .filter((v) => all.includes(JSON.stringify(v)));
    expect(leaked).toEqual([]);
    expect(trace.some((s) => s.truth.x !== s.odometry.x)).toBe(true);
  });
});

describe('replay', () => {
  it('a restarted server continues a drive exactly as if it had never stopped', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const trialId = 'rack-end-slalom';
    const start = await startDrive(agent, trialId);
    const trial = content.trials.get(trialId)!;
    // First half on this app …
    await driveTrial(trial, robotOf(trialId), apiPort(agent, start.attempt.id), start.state, { batch: 3, maxBatches: 40 });
    // … then a new app takes over: nothing of the first app's memory, only the database.
    const restarted = createApp({ ...t.ctx, drives: createDriveCache() });
    {
      const agent2 = request.agent(restarted);
      agent2.jar.setCookies(agent.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false }).map((c) => c.toString()));
      const resumed = await agent2.get(`/api/attempts/${start.attempt.id}`).expect(200);
      expect(resumed.body.state.seq).toBeGreaterThan(50);
      const rest = await driveTrial(trial, robotOf(trialId), apiPort(agent2, start.attempt.id), resumed.body.state, { batch: 3, chooseCall: () => 'halt' });
      expect(rest.state.docked).toBe(true);
      const done = (await agent2.post(`/api/attempts/${start.attempt.id}/submit`).expect(200)).body as AttemptView;

      // The same seed and the same stored commands and calls, run uninterrupted by the shared simulation.
      const attempt = await Attempt.findByPk(start.attempt.id);
      const sim = new DriveSim(driveSetup(trialId, attempt!.secretSeed));
      for (const entry of done.result!.log) {
        const req = entry.request as { commands?: { v: number; w: number }[]; callPointId?: string; call?: Call; estimate?: { x: number; y: number; radius: number } };
        if (entry.kind === 'steps') sim.applyBatch(req.commands!);
        if (entry.kind === 'call') sim.answerCall(req.callPointId!, req.call!, req.estimate ?? null);
      }
      expect(done.result!.trace).toEqual(sim.trace);
      expect(done.result!.truePose).toEqual(sim.truePose());
    }
  });

  it('two web processes taking turns on one drive give exactly the drive of one', async () => {
    const agentA = await signedInAgent(t.app, 'operator1');
    const other = createApp({ ...t.ctx, drives: createDriveCache() });
    const agentB = request.agent(other);
    agentB.jar.setCookies(agentA.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false }).map((c) => c.toString()));
    const start = await startDrive(agentA, 'long-aisle-run');
    // A balancer without sticky sessions: the batches land on either process, in runs of 1–3.
    const turns = 'AABABBBAABABAAABBA'.split('');
    let seq = 0;
    for (const [i, who] of turns.entries()) {
      const agent = who === 'A' ? agentA : agentB;
      const res = await agent.post(`/api/attempts/${start.attempt.id}/steps`).send({ fromSeq: seq, commands: [0, 1, 2].map(() => ({ v: 0.6, w: i % 4 < 2 ? 0.05 : -0.05 })) });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      seq = res.body.seq;
    }
    // A batch answered by B whose answer was lost, resent to A (which still holds the drive as it was before).
    await agentA.post(`/api/attempts/${start.attempt.id}/steps`).send({ fromSeq: seq, commands: [{ v: 0.5, w: 0 }] }).expect(200);
    const lost = { fromSeq: seq + 1, commands: [{ v: 0.5, w: 0.1 }, { v: 0.5, w: 0.1 }] };
    const answeredByB = await agentB.post(`/api/attempts/${start.attempt.id}/steps`).send(lost).expect(200);
    const resentToA = await agentA.post(`/api/attempts/${start.attempt.id}/steps`).send(lost).expect(200);
    expect(resentToA.body).toEqual(answeredByB.body);
    seq = answeredByB.body.seq;
    const view = (await agentB.get(`/api/attempts/${start.attempt.id}`).expect(200)).body as AttemptView;
    expect(view.state.seq).toBe(seq);
    const attempt = await Attempt.findByPk(start.attempt.id);
    expect(attempt!.logLength).toBe(turns.length + 2);
    expect(attempt!.nextSeq).toBe(seq);
    const done = (await agentA.post(`/api/attempts/${start.attempt.id}/abandon`).expect(200)).body as AttemptView;
    const sim = new DriveSim(driveSetup('long-aisle-run', attempt!.secretSeed));
    for (const entry of done.result!.log) if (entry.kind === 'steps') sim.applyBatch((entry.request as { commands: { v: number; w: number }[] }).commands);
    expect(done.result!.trace).toEqual(sim.trace);
  });

  it('a refused batch (a gap) keeps the drive the process holds; no replay of the log', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const start = await startDrive(agent, 'long-aisle-run');
    await agent.post(`/api/attempts/${start.attempt.id}/steps`).send({ fromSeq: 0, commands: [{ v: 0.5, w: 0 }] }).expect(200);
    const held = t.ctx.drives.get(start.attempt.id)!.sim;
    const gap = await agent.post(`/api/attempts/${start.attempt.id}/steps`).send({ fromSeq: 5, commands: [{ v: 0.5, w: 0 }] }).expect(409);
    expect(gap.body.error.code).toBe('seq_conflict');
    expect(t.ctx.drives.get(start.attempt.id)!.sim).toBe(held);
    await agent.post(`/api/attempts/${start.attempt.id}/steps`).send({ fromSeq: 1, commands: [{ v: 0.5, w: 0 }] }).expect(200);
    expect(t.ctx.drives.get(start.attempt.id)!.sim).toBe(held);
  });

  it('the same batch sent five times at once is applied once, and all five get its answer', async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    const start = await startDrive(agent, 'long-aisle-run');
    await agent.post(`/api/attempts/${start.attempt.id}/steps`).send({ fromSeq: 0, commands: [{ v: 0.5, w: 0 }] }).expect(200);
    const batch = { fromSeq: 1, commands: [{ v: 0.6, w: 0.1 }, { v: 0.7, w: 0.1 }] };
    const answers = await Promise.all([0, 1, 2, 3, 4].map(() => agent.post(`/api/attempts/${start.attempt.id}/steps`).send(batch)));
    expect(answers.map((a) => a.status)).toEqual([200, 200, 200, 200, 200]);
    for (const a of answers) expect(a.body).toEqual(answers[0].body);
    const attempt = await Attempt.findByPk(start.attempt.id);
    expect(attempt!.logLength).toBe(2);
    expect(attempt!.nextSeq).toBe(3);
  });

  it('the same seeds and commands give the same true path twice', async () => {
    const commands = Array.from({ length: 40 }, (_, i) => ({ v: 1, w: i % 10 < 5 ? 0.2 : -0.2 }));
    const paths = [];
    for (let run = 0; run < 2; run++) {
      const sim = new DriveSim(driveSetup('long-aisle-run', 'fixed-secret'));
      sim.applyBatch(commands);
      paths.push(sim.trace.map((s) => s.truth));
    }
    expect(paths[0]).toEqual(paths[1]);
    expect(paths[0][39]).not.toEqual(paths[0][0]);
  });
});

describe('who sees an attempt, and exam seats', () => {
  let attemptId: string;
  beforeAll(async () => {
    const agent = await signedInAgent(t.app, 'operator1');
    attemptId = (await startDrive(agent, 'long-aisle-run')).attempt.id;
  });

  it('its operator, their employer, assessors and admins see it; others do not', async () => {
    for (const account of ['operator1', 'employer', 'assessor', 'admin'] as const) {
      const agent = await signedInAgent(t.app, account);
      const res = await agent.get(`/api/attempts/${attemptId}`).expect(200);
      expect(res.body.result).toBeUndefined();
    }
    await (await signedInAgent(t.app, 'operator2')).get(`/api/attempts/${attemptId}`).expect(404);
    await (await signedInAgent(t.app, 'hr')).get(`/api/attempts/${attemptId}`).expect(403);
    await request(t.app).get(`/api/attempts/${attemptId}`).expect(401);
    // Only the operator drives it.
    await (await signedInAgent(t.app, 'operator2')).post(`/api/attempts/${attemptId}/steps`).send({ fromSeq: 0, commands: [{ v: 1, w: 0 }] }).expect(404);
    await (await signedInAgent(t.app, 'employer')).post(`/api/attempts/${attemptId}/steps`).send({ fromSeq: 0, commands: [{ v: 1, w: 0 }] }).expect(403);
  });

  it("an exam drive takes a seat from the operator's organization; without a seat it is refused", async () => {
    const operator = await signedInAgent(t.app, 'operator2');
    const seats = (await operator.get('/api/exam-seats').expect(200)).body.available as number;
    expect(seats).toBeGreaterThan(0);
    await startDrive(operator, 'long-aisle-run', 'exam');
    expect((await operator.get('/api/exam-seats')).body.available).toBe(seats - 1);
    // Spend what is left, then one more is refused.
    for (let i = 1; i < seats; i++) await startDrive(operator, 'dock-door-three', 'exam');
    const refused = await operator.post('/api/attempts').send({ trialId: 'long-aisle-run', mode: 'exam' }).expect(402);
    expect(refused.body.error.code).toBe('no_exam_seat');
    // Practice is free.
    await startDrive(operator, 'long-aisle-run', 'practice');
    // Give the seats back for the other test files.
    const admin = await signedInAgent(t.app, 'admin');
    await admin.post('/api/organizations/1/seat-grants').send({ count: seats }).expect(201);
  });
});
