import { sql } from 'drizzle-orm';
import { Router } from 'express';
import type { Database } from '../db/client.ts';
import { PHYSICS_VERSION } from '../../shared/physics/version.ts';

/** Liveness (the process answers) and readiness (the database answers). */
export function healthRouter(db: Database): Router {
  const router = Router();
  router.get('/health', (_req, res) => {
    const { rss, heapUsed, external, arrayBuffers } = process.memoryUsage();
    const mb = (x: number) => Math.round(x / 1e5) / 10;
    res.json({ status: 'ok', physicsVersion: PHYSICS_VERSION, memoryMB: { rss: mb(rss), heapUsed: mb(heapUsed), external: mb(external), arrayBuffers: mb(arrayBuffers) } });
  });
  router.get('/ready', async (_req, res) => {
    await db.execute(sql`select 1`);
    res.json({ status: 'ready' });
  });
  return router;
}
