import { eq, inArray, or, type SQL } from 'drizzle-orm';
import { ForbiddenError, NotFoundError } from '../../shared/errors.ts';
import type { Database } from '../db/client.ts';
import { scans } from '../db/schema/scans.ts';
import type { Actor } from './actor.ts';

/** Scans the actor may see: all for admins, else their own and their groups'. Undefined = no filter. */
export function visibleScans(actor: Actor): SQL | undefined {
  if (actor.role === 'admin') return undefined;
  const own = eq(scans.ownerId, actor.userId);
  return actor.groupIds.length ? or(own, inArray(scans.groupId, actor.groupIds)) : own;
}

export const canSee = (actor: Actor, scan: { ownerId: number | null; groupId: number | null }): boolean =>
  actor.role === 'admin' || scan.ownerId === actor.userId || (scan.groupId !== null && actor.groupIds.includes(scan.groupId));

/**
 * Checks the scan a route names: a scan the actor cannot see answers exactly like one that does
 * not exist (404), so ids do not leak; one they can see but not manage is a 403.
 */
export async function checkScanAccess(db: Database, actor: Actor, id: number, need: 'read' | 'manage'): Promise<void> {
  const [scan] = await db.select({ ownerId: scans.ownerId, groupId: scans.groupId }).from(scans).where(eq(scans.id, id));
  if (!scan || !canSee(actor, scan)) throw new NotFoundError(`scan ${id} does not exist`);
  if (need === 'manage' && actor.role !== 'admin' && scan.ownerId !== actor.userId) {
    throw new ForbiddenError(`scan ${id} belongs to someone else; only its owner or an admin can change it`);
  }
}
