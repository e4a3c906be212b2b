import { Router } from 'express';
import type { AppContext } from '../context';
import { databaseIsUp } from '../db';

/** For load balancers and people: 200 when the database answers, 503 when it does not. */
export function healthRoutes({ sequelize }: AppContext) {
  const router = Router();
  router.get('/health', async (_req, res) => {
    const up = await databaseIsUp(sequelize);
    res.status(up ? 200 : 503).json({ status: up ? 'ok' : 'degraded', database: up ? 'up' : 'down' });
  });
  return router;
}
