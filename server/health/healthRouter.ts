import { sql } from 'drizzle-orm';
import { Router } from 'express';
import type { Database } from '../db/client.ts';
import { PHYSICS_VERSION } from '../../shared/physics/version.ts';

/** Liveness (the process answers) and readiness (the database answers). */
export function healthRouter(db: Database): Router {
  const router = Router();
  router.get('/health', (_req, res) => {
    res.json({ status: 'ok', physicsVersion: PHYSICS_VERSION });
  });
  router.get('/ready', async (_req, res) => {
    await db.execute(sql`select 1`);
    res.json({ status: 'ready' });
  });
  return router;
}
