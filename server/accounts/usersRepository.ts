import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { Role } from '../../shared/api/accounts.ts';
import type { Database } from '../db/client.ts';
import { groupMembers, groups, users } from '../db/schema/accounts.ts';

export type UserRow = typeof users.$inferSelect;

export async function findUserByEmail(db: Database, email: string): Promise<UserRow | undefined> {
  const [row] = await db.select().from(users).where(eq(users.email, email.toLowerCase()));
  return row;
}

export async function findUser(db: Database, id: number): Promise<UserRow | undefined> {
  const [row] = await db.select().from(users).where(eq(users.id, id));
  return row;
}

export async function listUsers(db: Database): Promise<UserRow[]> {
  return db.select().from(users).orderBy(asc(users.id));
}

export async function insertUser(db: Database, values: { email: string; name?: string; role: Role; passwordHash?: string | null }): Promise<UserRow> {
  const [row] = await db.insert(users).values({ ...values, email: values.email.toLowerCase() }).returning();
  return row!;
}

export async function updateUser(db: Database, id: number, values: Partial<Pick<UserRow, 'email' | 'name' | 'role' | 'passwordHash' | 'disabled' | 'monthlyPointQuota' | 'maxRunningScans'>>): Promise<UserRow | undefined> {
  const [row] = await db.update(users).set({ ...values, updatedAt: new Date() }).where(eq(users.id, id)).returning();
  return row;
}

export async function countActiveAdmins(db: Database): Promise<number> {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(users).where(and(eq(users.role, 'admin'), eq(users.disabled, false)));
  return row?.n ?? 0;
}

/** Admins that can sign in (have a password): none means the server still needs its set-up link. */
export async function countUsableAdmins(db: Database): Promise<number> {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(users)
    .where(and(eq(users.role, 'admin'), eq(users.disabled, false), sql`${users.passwordHash} is not null`));
  return row?.n ?? 0;
}

export async function groupIdsOf(db: Database, userId: number): Promise<number[]> {
  const rows = await db.select({ id: groupMembers.groupId }).from(groupMembers).where(eq(groupMembers.userId, userId));
  return rows.map((r) => r.id);
}

export async function listGroups(db: Database, onlyIds?: number[]) {
  const memberCount = sql<number>`(select count(*)::int from ${groupMembers} where ${groupMembers.groupId} = ${groups.id})`;
  const query = db.select({ id: groups.id, name: groups.name, memberCount }).from(groups);
  if (onlyIds === undefined) return query.orderBy(asc(groups.name));
  if (onlyIds.length === 0) return [];
  return query.where(inArray(groups.id, onlyIds)).orderBy(asc(groups.name));
}

export async function findGroup(db: Database, id: number) {
  const [row] = await db.select().from(groups).where(eq(groups.id, id));
  return row;
}

export async function findGroupByName(db: Database, name: string) {
  const [row] = await db.select().from(groups).where(eq(groups.name, name));
  return row;
}

export async function insertGroup(db: Database, name: string) {
  const [row] = await db.insert(groups).values({ name }).returning();
  return row!;
}

export async function addMember(db: Database, groupId: number, userId: number): Promise<void> {
  await db.insert(groupMembers).values({ groupId, userId }).onConflictDoNothing();
}

export async function removeMember(db: Database, groupId: number, userId: number): Promise<boolean> {
  const rows = await db.delete(groupMembers).where(and(eq(groupMembers.groupId, groupId), eq(groupMembers.userId, userId))).returning();
  return rows.length > 0;
}

/** Every user's groups by id and name, for the admin's list. */
export async function membershipsByUser(db: Database): Promise<Map<number, { id: number; name: string }[]>> {
  const rows = await db.select({ userId: groupMembers.userId, id: groups.id, name: groups.name }).from(groupMembers)
    .innerJoin(groups, eq(groups.id, groupMembers.groupId)).orderBy(asc(groups.name));
  const map = new Map<number, { id: number; name: string }[]>();
  for (const r of rows) map.set(r.userId, [...(map.get(r.userId) ?? []), { id: r.id, name: r.name }]);
  return map;
}
