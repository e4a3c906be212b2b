/** Driving a trial through the HTTP API with supertest, for the API tests. */
import { expect } from 'vitest';
import type { Agent } from 'supertest';
import type { AttemptStart, Call } from '../../shared/schemas';
import type { BatchResult, Command, EstimatePin } from '../../shared/sim';
import type { DrivePort } from './scripted-operator';

/** Every response body a drive received, as text, for the leak scan. */
export type ResponseLog = string[];

export async function startDrive(agent: Agent, trialId: string, mode: 'practice' | 'exam' = 'practice', log?: ResponseLog): Promise<AttemptStart> {
  const res = await agent.post('/api/attempts').send({ trialId, mode });
  expect(res.status, res.text).toBe(201);
  log?.push(res.text);
  return res.body;
}

export function apiPort(agent: Agent, attemptId: string, log?: ResponseLog): DrivePort {
  return {
    async step(fromSeq: number, commands: Command[]): Promise<BatchResult> {
      const res = await agent.post(`/api/attempts/${attemptId}/steps`).send({ fromSeq, commands });
      expect(res.status, res.text).toBe(200);
      log?.push(res.text);
      return res.body;
    },
    async call(callPointId: string, call: Call, estimate: EstimatePin | null): Promise<BatchResult> {
      const res = await agent.post(`/api/attempts/${attemptId}/calls`).send({ callPointId, call, ...(estimate ? { estimate } : {}) });
      expect(res.status, res.text).toBe(200);
      log?.push(res.text);
      return res.body;
    },
  };
}
