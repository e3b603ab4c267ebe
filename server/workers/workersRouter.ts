import { Router } from 'express';
import type { Database } from '../db/client.ts';
import { createWorkersService } from './workersService.ts';

/** The compute processes of the pool, for admins (mounted at /api/v1/admin/workers behind the admin rule). */
export function workersRouter(db: Database): Router {
  const service = createWorkersService(db);
  const router = Router();
  router.get('/', async (_req, res) => {
    res.json({ workers: await service.list() });
  });
  return router;
}
