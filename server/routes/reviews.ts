import { Router } from 'express';
import { attemptParamsSchema, reviewQueueQuerySchema, verdictSchema } from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { parseBody, parseParams, parseQuery } from '../http/validate';
import { attemptReport } from '../services/reports';
import { auditLog, claimReview, reviewQueue, signVerdict } from '../services/reviews';

export function reviewRoutes(ctx: AppContext) {
  const router = Router();
  const assessor = guard(['assessor']);
  const assessorOrAdmin = guard(['assessor', 'admin']);
  const viewers = guard(['operator', 'employer', 'assessor', 'admin']);
  const id = (req: Parameters<typeof parseParams>[1]) => parseParams(attemptParamsSchema, req).id;

  router.get('/attempts/:id/report', viewers, async (req, res) => {
    res.json(await attemptReport(ctx, currentUser(req), id(req)));
  });

  router.get('/reviews', assessorOrAdmin, async (req, res) => {
    res.json(await reviewQueue(ctx, parseQuery(reviewQueueQuerySchema, req)));
  });

  router.post('/reviews/:id/claim', assessor, async (req, res) => {
    res.json({ review: await claimReview(ctx, currentUser(req), id(req)) });
  });

  router.post('/reviews/:id/verdict', assessor, async (req, res) => {
    const attemptId = id(req);
    res.json({ review: await signVerdict(ctx, currentUser(req), attemptId, parseBody(verdictSchema, req)) });
  });

  router.get('/reviews/:id/audit', assessorOrAdmin, async (req, res) => {
    res.json({ items: await auditLog(id(req)) });
  });

  return router;
}
