import { Router } from 'express';
import {
  attemptCreateSchema,
  attemptListQuerySchema,
  attemptParamsSchema,
  callAnswerSchema,
  stepBatchSchema,
} from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { parseBody, parseParams, parseQuery } from '../http/validate';
import { answerCall, applySteps, finishAttempt, listAttempts, startAttempt, viewAttempt } from '../services/attempts';
import { availableExamSeats } from '../services/seats';

export function attemptRoutes(ctx: AppContext) {
  const router = Router();
  const operator = guard(['operator']);
  const viewers = guard(['operator', 'employer', 'assessor', 'admin']);
  const id = (req: Parameters<typeof parseParams>[1]) => parseParams(attemptParamsSchema, req).id;

  router.post('/attempts', operator, async (req, res) => {
    res.status(201).json(await startAttempt(ctx, currentUser(req), parseBody(attemptCreateSchema, req)));
  });

  router.get('/attempts', viewers, async (req, res) => {
    res.json(await listAttempts(ctx, currentUser(req), parseQuery(attemptListQuerySchema, req)));
  });

  router.get('/attempts/:id', viewers, async (req, res) => {
    res.json(await viewAttempt(ctx, currentUser(req), id(req)));
  });

  router.post('/attempts/:id/steps', operator, async (req, res) => {
    const attemptId = id(req);
    res.json(await applySteps(ctx, currentUser(req), attemptId, parseBody(stepBatchSchema, req)));
  });

  router.post('/attempts/:id/calls', operator, async (req, res) => {
    const attemptId = id(req);
    res.json(await answerCall(ctx, currentUser(req), attemptId, parseBody(callAnswerSchema, req)));
  });

  router.post('/attempts/:id/submit', operator, async (req, res) => {
    res.json(await finishAttempt(ctx, currentUser(req), id(req), 'submit'));
  });

  router.post('/attempts/:id/abandon', operator, async (req, res) => {
    res.json(await finishAttempt(ctx, currentUser(req), id(req), 'abandon'));
  });

  router.get('/exam-seats', operator, async (req, res) => {
    res.json({ available: await availableExamSeats(currentUser(req).id) });
  });

  return router;
}
