import { and, desc, eq, gt, isNull, lt, or, sql } from 'drizzle-orm';
import type { TokenScope } from '../../shared/api/accounts.ts';
import type { Database } from '../db/client.ts';
import { apiTokens, linkTokens, LINK_PURPOSES, sessions, users } from '../db/schema/accounts.ts';

export type LinkPurpose = (typeof LINK_PURPOSES)[number];
export type ApiTokenRow = typeof apiTokens.$inferSelect;

export async function insertSession(db: Database, values: { id: string; userId: number; expiresAt: Date }): Promise<void> {
  await db.insert(sessions).values(values);
}

/** A session that is neither revoked nor expired, with its user (who must not be disabled). */
export async function findLiveSession(db: Database, id: string, now = new Date()) {
  const [row] = await db.select({ session: sessions, user: users }).from(sessions).innerJoin(users, eq(users.id, sessions.userId))
    .where(and(eq(sessions.id, id), isNull(sessions.revokedAt), gt(sessions.expiresAt, now), eq(users.disabled, false)));
  return row;
}

export async function revokeSession(db: Database, id: string): Promise<void> {
  await db.update(sessions).set({ revokedAt: new Date() }).where(and(eq(sessions.id, id), isNull(sessions.revokedAt)));
}

export async function revokeSessionsOf(db: Database, userId: number): Promise<void> {
  await db.update(sessions).set({ revokedAt: new Date() }).where(and(eq(sessions.userId, userId), isNull(sessions.revokedAt)));
}

/** Drops sessions and links long past their expiry, so the tables do not grow for ever. */
export async function pruneExpired(db: Database, before: Date): Promise<void> {
  await db.delete(sessions).where(lt(sessions.expiresAt, before));
  await db.delete(linkTokens).where(lt(linkTokens.expiresAt, before));
}

export async function insertApiToken(db: Database, values: { userId: number; name: string; scopes: TokenScope[]; secretHash: string; prefix: string; expiresAt: Date }): Promise<ApiTokenRow> {
  const [row] = await db.insert(apiTokens).values(values).returning();
  return row!;
}

/** A token that is neither revoked nor expired, with its owner (who must not be disabled). */
export async function findLiveToken(db: Database, secretHash: string, now = new Date()) {
  const [row] = await db.select({ token: apiTokens, user: users }).from(apiTokens).innerJoin(users, eq(users.id, apiTokens.userId))
    .where(and(eq(apiTokens.secretHash, secretHash), isNull(apiTokens.revokedAt), gt(apiTokens.expiresAt, now), eq(users.disabled, false)));
  return row;
}

/** Records use at most once a minute per token: a write per request would be wasted work. */
export async function touchToken(db: Database, id: number, now = new Date()): Promise<void> {
  const minuteAgo = new Date(now.getTime() - 60_000);
  await db.update(apiTokens).set({ lastUsedAt: now })
    .where(and(eq(apiTokens.id, id), or(isNull(apiTokens.lastUsedAt), lt(apiTokens.lastUsedAt, minuteAgo))));
}

export async function listApiTokens(db: Database, userId: number): Promise<ApiTokenRow[]> {
  return db.select().from(apiTokens).where(eq(apiTokens.userId, userId)).orderBy(desc(apiTokens.id));
}

export async function revokeApiToken(db: Database, userId: number, id: number): Promise<boolean> {
  const rows = await db.update(apiTokens).set({ revokedAt: new Date() })
    .where(and(eq(apiTokens.id, id), eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt))).returning({ id: apiTokens.id });
  return rows.length > 0;
}

export async function tokenExists(db: Database, userId: number, id: number): Promise<boolean> {
  const [row] = await db.select({ id: apiTokens.id }).from(apiTokens).where(and(eq(apiTokens.id, id), eq(apiTokens.userId, userId)));
  return row !== undefined;
}

/** A new single-use link; earlier unused links of the same purpose for the user stop working. */
export async function insertLink(db: Database, values: { userId: number; purpose: LinkPurpose; secretHash: string; expiresAt: Date }): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.update(linkTokens).set({ usedAt: new Date() })
      .where(and(eq(linkTokens.userId, values.userId), eq(linkTokens.purpose, values.purpose), isNull(linkTokens.usedAt)));
    await tx.insert(linkTokens).values(values);
  });
}

export async function findLiveLink(db: Database, secretHash: string, now = new Date()) {
  const [row] = await db.select({ link: linkTokens, user: users }).from(linkTokens).innerJoin(users, eq(users.id, linkTokens.userId))
    .where(and(eq(linkTokens.secretHash, secretHash), isNull(linkTokens.usedAt), gt(linkTokens.expiresAt, now)));
  return row;
}

/** Marks a link used; false when another request used it first (so it works exactly once). */
export async function consumeLink(db: Database, id: number): Promise<boolean> {
  const rows = await db.update(linkTokens).set({ usedAt: sql`now()` })
    .where(and(eq(linkTokens.id, id), isNull(linkTokens.usedAt))).returning({ id: linkTokens.id });
  return rows.length > 0;
}
