import { Router } from 'express';
import { idParamsSchema, userCreateSchema, userListQuerySchema, userUpdateSchema } from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { parseBody, parseParams, parseQuery } from '../http/validate';
import { createUser, listOrganizations, listUsers, updateUser } from '../services/users';

export function userRoutes(ctx: AppContext) {
  const router = Router();
  const adminOnly = guard(['admin']);

  router.get('/users', adminOnly, async (req, res) => {
    res.json(await listUsers(parseQuery(userListQuerySchema, req)));
  });

  router.post('/users', adminOnly, async (req, res) => {
    const user = await createUser(ctx, parseBody(userCreateSchema, req));
    res.status(201).json({ user });
  });

  router.patch('/users/:id', adminOnly, async (req, res) => {
    const { id } = parseParams(idParamsSchema, req);
    const user = await updateUser(ctx, currentUser(req).id, id, parseBody(userUpdateSchema, req));
    res.json({ user });
  });

  router.get('/organizations', adminOnly, async (_req, res) => {
    res.json({ items: await listOrganizations() });
  });

  return router;
}
