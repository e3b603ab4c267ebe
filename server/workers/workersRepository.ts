import { desc, eq, getTableColumns, sql } from 'drizzle-orm';
import type { Database } from '../db/client.ts';
import { workers, type WorkerRow } from '../db/schema/workers.ts';

export interface NewWorker {
  id: string;
  host: string;
  pid: number;
  concurrency: number;
}

/** A compute process joins the pool (its id is new for every start, so this is an insert). */
export async function registerWorker(db: Database, worker: NewWorker): Promise<void> {
  await db.insert(workers).values(worker);
}

/** Timestamps come from the database clock, so workers on machines with skewed clocks compare fairly. */
export async function recordHeartbeat(db: Database, id: string, pointsDone: number, pointsPerSecond: number): Promise<void> {
  await db.update(workers).set({ pointsDone, pointsPerSecond, lastHeartbeatAt: sql`now()` }).where(eq(workers.id, id));
}

export async function markWorkerStopped(db: Database, id: string, pointsDone: number): Promise<void> {
  await db.update(workers).set({ pointsDone, pointsPerSecond: 0, lastHeartbeatAt: sql`now()`, stoppedAt: sql`now()` }).where(eq(workers.id, id));
}

/** Workers heard from in the last week, the most recent first, with their heartbeat's age by the database clock. */
export async function listWorkers(db: Database): Promise<Array<WorkerRow & { heartbeatAgeSeconds: number }>> {
  return db.select({ ...getTableColumns(workers), heartbeatAgeSeconds: sql<number>`extract(epoch from now() - ${workers.lastHeartbeatAt})::float8` })
    .from(workers)
    .where(sql`${workers.lastHeartbeatAt} > now() - interval '7 days'`)
    .orderBy(desc(workers.lastHeartbeatAt));
}

