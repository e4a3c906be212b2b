import { Router } from 'express';
import { z } from 'zod';
import { guard } from '../auth/guard';
import type { AppContext } from '../context';
import { parseParams } from '../http/validate';
import { listLevels, listRobots, listTrials, publicTrial } from '../services/trials';

const trialParams = z.strictObject({ id: z.string().min(1).max(64) });

export function trialRoutes({ content }: AppContext) {
  const router = Router();
  const signedIn = guard('signed-in');

  // Public: the landing page describes the levels.
  router.get('/levels', (_req, res) => {
    res.json({ items: listLevels(content) });
  });

  router.get('/trials', signedIn, (_req, res) => {
    res.json({ items: listTrials(content) });
  });

  router.get('/robots', signedIn, (_req, res) => {
    res.json({ items: listRobots(content) });
  });

  router.get('/trials/:id', signedIn, (req, res) => {
    res.json({ trial: publicTrial(content, parseParams(trialParams, req).id) });
  });

  return router;
}
