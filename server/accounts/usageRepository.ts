import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { Database } from '../db/client.ts';
import { scanUsage, users } from '../db/schema/accounts.ts';
import { scans } from '../db/schema/scans.ts';

/** Calendar month (UTC) as stored: `YYYY-MM`. */
export const monthOf = (d: Date): string => d.toISOString().slice(0, 7);
/** First instant of the month after `d` (UTC), when a monthly quota resets. */
export const nextMonthStart = (d: Date): Date => new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 1));

export async function pointsCharged(db: Database, userId: number, month: string): Promise<number> {
  const [row] = await db.select({ n: sql<number>`coalesce(sum(${scanUsage.pointsCharged}), 0)::int` }).from(scanUsage)
    .where(and(eq(scanUsage.userId, userId), eq(scanUsage.month, month)));
  return row?.n ?? 0;
}

export async function chargedByUser(db: Database, month: string): Promise<Map<number, number>> {
  const rows = await db.select({ userId: scanUsage.userId, n: sql<number>`sum(${scanUsage.pointsCharged})::int` }).from(scanUsage)
    .where(eq(scanUsage.month, month)).groupBy(scanUsage.userId);
  return new Map(rows.map((r) => [r.userId, r.n]));
}

export async function runningScans(db: Database, userId: number): Promise<number> {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(scans)
    .where(and(eq(scans.ownerId, userId), inArray(scans.state, ['queued', 'running'])));
  return row?.n ?? 0;
}

/**
 * Per user for one month: scans, points charged at submission, points computed and compute seconds.
 * Live figures come from the scan while it exists; a deleted scan's last figures were kept in
 * scan_usage when it was deleted (see keepUsageOf).
 */
export async function usageOfMonth(db: Database, month: string) {
  return db.select({
    userId: users.id, email: users.email, name: users.name,
    scans: sql<number>`count(*)::int`,
    pointsCharged: sql<number>`sum(${scanUsage.pointsCharged})::int`,
    pointsComputed: sql<number>`sum(coalesce(${scans.pointsDone}, ${scanUsage.pointsComputed}))::int`,
    computeSeconds: sql<number>`sum(coalesce(${scans.computeSeconds}, ${scanUsage.computeSeconds}))::float8`,
  }).from(scanUsage).innerJoin(users, eq(users.id, scanUsage.userId)).leftJoin(scans, eq(scans.id, scanUsage.scanId))
    .where(eq(scanUsage.month, month)).groupBy(users.id, users.email, users.name).orderBy(asc(users.email));
}

/** Before a scan is deleted: its usage row keeps what it computed, so the month's figures stand. */
export async function keepUsageOf(db: Database, scanId: number): Promise<void> {
  await db.update(scanUsage).set({
    pointsComputed: sql`(select ${scans.pointsDone} from ${scans} where ${scans.id} = ${scanId})`,
    computeSeconds: sql`(select ${scans.computeSeconds} from ${scans} where ${scans.id} = ${scanId})`,
  }).where(eq(scanUsage.scanId, scanId));
}
