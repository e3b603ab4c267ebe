import { and, asc, desc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import type { Database } from '../db/client.ts';
import { groups, users } from '../db/schema/accounts.ts';
import { batches, type Batch } from '../db/schema/batches.ts';
import { scans, type NewScan, type Scan, type ScanState } from '../db/schema/scans.ts';

const BATCH_INSERT_CHUNK = 1000;

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];
/** Checks and bookkeeping that must happen in the scan's own transaction (quota, usage). */
export interface InsertHooks {
  before?: (tx: Tx) => Promise<void>;
  after?: (tx: Tx, scan: Scan) => Promise<void>;
}

/** Stores a scan and cuts its points into batches, in one transaction: all or nothing. */
export async function insertScan(db: Database, scan: NewScan, batchSize: number, hooks: InsertHooks = {}): Promise<Scan> {
  return db.transaction(async (tx) => {
    await hooks.before?.(tx);
    const [row] = await tx.insert(scans).values(scan).returning();
    const stored = row!;
    const rows = [];
    for (let first = 0; first < stored.pointCount; first += batchSize) {
      rows.push({ scanId: stored.id, firstIndex: first, pointCount: Math.min(batchSize, stored.pointCount - first) });
    }
    for (let i = 0; i < rows.length; i += BATCH_INSERT_CHUNK) {
      await tx.insert(batches).values(rows.slice(i, i + BATCH_INSERT_CHUNK));
    }
    await hooks.after?.(tx, stored);
    return stored;
  });
}

export async function listScans(db: Database): Promise<Scan[]> {
  return db.select().from(scans).orderBy(desc(scans.id));
}

const owner = sql<{ id: number; name: string; email: string } | null>`case when ${users.id} is null then null else json_build_object('id', ${users.id}, 'name', ${users.name}, 'email', ${users.email}) end`;
const group = sql<{ id: number; name: string } | null>`case when ${groups.id} is null then null else json_build_object('id', ${groups.id}, 'name', ${groups.name}) end`;

/** Scans with their owner's and group's names, newest first, filtered by `where` (visibility). */
export async function listScansWithNames(db: Database, where?: SQL, id?: number) {
  const rows = await db.select({ scan: scans, owner, group }).from(scans)
    .leftJoin(users, eq(users.id, scans.ownerId)).leftJoin(groups, eq(groups.id, scans.groupId))
    .where(id === undefined ? where : and(where, eq(scans.id, id))).orderBy(desc(scans.id));
  return rows.map((r) => ({ ...r.scan, owner: r.owner, group: r.group }));
}

export async function findScan(db: Database, id: number): Promise<Scan | undefined> {
  const [row] = await db.select().from(scans).where(eq(scans.id, id));
  return row;
}

export async function updateScan(db: Database, id: number, values: Partial<Pick<Scan, 'state' | 'error' | 'startedAt' | 'finishedAt'>>): Promise<Scan | undefined> {
  const [row] = await db.update(scans).set({ ...values, updatedAt: new Date() }).where(eq(scans.id, id)).returning();
  return row;
}

export async function deleteScan(db: Database, id: number): Promise<boolean> {
  const deleted = await db.delete(scans).where(eq(scans.id, id)).returning({ id: scans.id });
  return deleted.length > 0;
}

/**
 * Leases up to `limit` pending batches of scans that are still wanted (queued or running),
 * oldest scan first, and moves those scans to running.
 */
export async function claimBatches(db: Database, limit: number, workerId: string, leaseSeconds: number): Promise<Batch[]> {
  return db.transaction(async (tx) => {
    const candidates = await tx
      .select({ id: batches.id })
      .from(batches)
      .innerJoin(scans, eq(scans.id, batches.scanId))
      .where(and(eq(batches.state, 'pending'), inArray(scans.state, ['queued', 'running'])))
      .orderBy(asc(batches.scanId), asc(batches.firstIndex))
      .limit(limit)
      .for('update', { of: batches, skipLocked: true });
    if (candidates.length === 0) return [];
    const claimed = await tx
      .update(batches)
      .set({ state: 'running', workerId, attempts: sql`${batches.attempts} + 1`, startedAt: new Date(), leasedUntil: sql`now() + make_interval(secs => ${leaseSeconds})` })
      .where(inArray(batches.id, candidates.map((c) => c.id)))
      .returning();
    const scanIds = [...new Set(claimed.map((b) => b.scanId))];
    await tx.update(scans).set({ state: 'running', startedAt: sql`coalesce(${scans.startedAt}, now())`, updatedAt: new Date() })
      .where(and(inArray(scans.id, scanIds), eq(scans.state, 'queued')));
    return claimed;
  });
}

/** After a restart nothing is computing: every leased batch of this process goes back to pending. */
export async function releaseAllBatches(db: Database): Promise<number> {
  const released = await db.update(batches).set({ state: 'pending', workerId: null, leasedUntil: null })
    .where(eq(batches.state, 'running')).returning({ id: batches.id });
  return released.length;
}

export async function releaseBatch(db: Database, id: number): Promise<void> {
  await db.update(batches).set({ state: 'pending', workerId: null, leasedUntil: null }).where(eq(batches.id, id));
}

/** Gives a batch back (worker error below the retry limit) or marks it failed for good. */
export async function failBatch(db: Database, batch: Batch, error: string, maxAttempts: number): Promise<'retry' | 'failed'> {
  const outcome = batch.attempts >= maxAttempts ? 'failed' : 'retry';
  await db.update(batches).set({ state: outcome === 'failed' ? 'failed' : 'pending', error, workerId: null, leasedUntil: null })
    .where(eq(batches.id, batch.id));
  return outcome;
}

/**
 * Completes the scan when every point has a result; returns the scan as it is now. A completed
 * scan refreshes the planner's statistics: PGlite has no autovacuum, and without them sorted
 * result pages sort every matching row (3–5× slower).
 */
export async function settleScan(db: Database, id: number): Promise<Scan | undefined> {
  const completed = await db.update(scans).set({ state: 'completed', finishedAt: new Date(), updatedAt: new Date() })
    .where(and(eq(scans.id, id), eq(scans.state, 'running'), sql`${scans.pointsDone} >= ${scans.pointCount}`))
    .returning({ id: scans.id });
  if (completed.length > 0) await db.execute(sql`analyze point_results`);
  return findScan(db, id);
}

export type { Scan, ScanState };
