import { and, asc, eq, inArray, or, sql } from 'drizzle-orm';
import type { Database } from '../db/client.ts';
import { batches, type Batch } from '../db/schema/batches.ts';
import { scans, type Scan } from '../db/schema/scans.ts';

/**
 * Batch state changes of the pg-boss path. The `batches` table stays the source of truth:
 * 'running' means "handed to the queue" (workerId null) or "computing on workerId"; a batch
 * goes back to 'pending' only when a worker returns it, and the publisher sends it again.
 */

const WANTED = ['queued', 'running'] as const;

/**
 * Marks up to `limit` pending batches of wanted scans as handed to the queue, oldest scan
 * first. Runs inside the caller's transaction, which inserts the jobs: both or neither.
 */
export async function takePendingBatches(db: Database, limit: number): Promise<Array<Pick<Batch, 'id' | 'scanId'>>> {
  const candidates = await db.select({ id: batches.id }).from(batches)
    .innerJoin(scans, eq(scans.id, batches.scanId))
    .where(and(eq(batches.state, 'pending'), inArray(scans.state, WANTED)))
    .orderBy(asc(batches.scanId), asc(batches.firstIndex))
    .limit(limit)
    .for('update', { of: batches, skipLocked: true });
  if (candidates.length === 0) return [];
  return db.update(batches).set({ state: 'running', workerId: null, leasedUntil: null })
    .where(inArray(batches.id, candidates.map((c) => c.id)))
    .returning({ id: batches.id, scanId: batches.scanId });
}

/**
 * A worker takes a batch it got from the queue: undefined when there is nothing to do (already
 * done or failed, or its scan was cancelled or deleted). Moves a queued scan to running.
 */
export async function startBatch(db: Database, batchId: number, workerId: string, leaseSeconds: number): Promise<Batch | undefined> {
  return db.transaction(async (tx) => {
    const [batch] = await tx.update(batches)
      .set({ state: 'running', workerId, attempts: sql`${batches.attempts} + 1`, startedAt: new Date(), leasedUntil: sql`now() + make_interval(secs => ${leaseSeconds})` })
      .where(and(eq(batches.id, batchId), inArray(batches.state, ['pending', 'running']),
        sql`exists (select 1 from ${scans} where ${scans.id} = ${batches.scanId} and ${inArray(scans.state, WANTED)})`))
      .returning();
    if (!batch) return undefined;
    await tx.update(scans).set({ state: 'running', startedAt: sql`coalesce(${scans.startedAt}, now())`, updatedAt: new Date() })
      .where(and(eq(scans.id, batch.scanId), eq(scans.state, 'queued')));
    return batch;
  });
}

/** Gives a batch back (its scan was cancelled, or the worker is stopping) unless it got done meanwhile. */
export async function returnBatch(db: Database, batchId: number): Promise<void> {
  await db.update(batches).set({ state: 'pending', workerId: null, leasedUntil: null })
    .where(and(eq(batches.id, batchId), eq(batches.state, 'running')));
}

/** Writes the error of a failed try on the batch (it stays running: the queue retries it). */
export async function noteBatchError(db: Database, batchId: number, error: string): Promise<void> {
  await db.update(batches).set({ error }).where(eq(batches.id, batchId));
}

/** Out of retries: the batch is failed with its error, and so is its scan if it was still wanted. */
export async function failBatchForGood(db: Database, batchId: number, error: string): Promise<Scan | undefined> {
  return db.transaction(async (tx) => {
    const [batch] = await tx.update(batches).set({ state: 'failed', error, workerId: null, leasedUntil: null })
      .where(and(eq(batches.id, batchId), inArray(batches.state, ['pending', 'running'])))
      .returning();
    if (!batch) return undefined;
    const [scan] = await tx.update(scans).set({ state: 'failed', error: `batch at point ${batch.firstIndex}: ${error}`, finishedAt: new Date(), updatedAt: new Date() })
      .where(and(eq(scans.id, batch.scanId), inArray(scans.state, WANTED)))
      .returning();
    return scan;
  });
}

/** Of these scans, the ones whose batches are still wanted. */
export async function wantedScanIds(db: Database, ids: readonly number[]): Promise<Set<number>> {
  if (ids.length === 0) return new Set();
  const rows = await db.select({ id: scans.id }).from(scans).where(and(inArray(scans.id, [...ids]), inArray(scans.state, WANTED)));
  return new Set(rows.map((r) => r.id));
}

/**
 * Scans still wanted, plus those changed in the last minute (a scan may start and end between
 * two polls). Compared with the transaction start time the writer stamps, the minute also
 * covers writes that took long to commit.
 */
export async function scansToWatch(db: Database): Promise<Scan[]> {
  return db.select().from(scans).where(or(inArray(scans.state, WANTED), sql`${scans.updatedAt} > now() - interval '1 minute'`));
}
