import { stringify } from 'yaml';
import type { ScanDetail, ScanView, SubmitScan } from '../../shared/api/scans.ts';
import { ConflictError, InvalidInputError, NotFoundError } from '../../shared/errors.ts';
import { planPointCount } from '../../shared/plan/expandPlan.ts';
import { planHash } from '../../shared/plan/planHash.ts';
import { parsePlanText, validatePlan } from '../../shared/plan/validatePlan.ts';
import { PHYSICS_VERSION } from '../../shared/physics/version.ts';
import { sql } from 'drizzle-orm';
import type { Database } from '../db/client.ts';
import { scanUsage } from '../db/schema/accounts.ts';
import type { Actor } from '../auth/actor.ts';
import { canSee, visibleScans } from '../auth/scanAccess.ts';
import { assertWithinQuota, quotaOf, type QuotaDefaults } from '../accounts/quota.ts';
import { keepUsageOf, monthOf } from '../accounts/usageRepository.ts';
import { findGroup, findUser } from '../accounts/usersRepository.ts';
import type { ScanEvents } from './scanEvents.ts';
import { deleteScan, findScan, insertScan, listScansWithNames, updateScan, type InsertHooks, type Scan } from './scansRepository.ts';
import { toScanDetail, toScanView } from './scanView.ts';

export interface ScansServiceDeps {
  db: Database;
  events: ScanEvents;
  batchSize: number;
  /** Called after a scan is stored, so the dispatcher looks for work at once. */
  onSubmitted: () => void;
  /** Called after a scan is cancelled, so work in flight stops at once. */
  onCancelled?: (id: number) => void;
  /** Default quotas for users without their own (submissions by an actor are charged). */
  quotaDefaults?: QuotaDefaults;
}

export type ScansService = ReturnType<typeof createScansService>;

export function createScansService({ db, events, batchSize, onSubmitted, onCancelled, quotaDefaults = { defaultMonthlyPoints: 5_000_000, defaultMaxRunning: 3 } }: ScansServiceDeps) {
  const load = async (id: number): Promise<Scan> => {
    const scan = await findScan(db, id);
    if (!scan) throw new NotFoundError(`scan ${id} does not exist`);
    return scan;
  };

  const withNames = async (id: number) => {
    const [scan] = await listScansWithNames(db, undefined, id);
    if (!scan) throw new NotFoundError(`scan ${id} does not exist`);
    return scan;
  };

  /**
   * Quota and usage happen in the scan's own transaction, under a per-user lock, so two
   * submissions at once cannot both spend the last points.
   */
  const charging = (actor: Actor, points: number): InsertHooks => ({
    before: async (tx) => {
      await tx.execute(sql`select pg_advisory_xact_lock(${actor.userId})`);
      const user = await findUser(tx as unknown as Database, actor.userId);
      if (!user) throw new NotFoundError(`user ${actor.userId} does not exist`);
      assertWithinQuota(await quotaOf(tx as unknown as Database, user, quotaDefaults), points);
    },
    after: async (tx, scan) => {
      await tx.insert(scanUsage).values({ scanId: scan.id, userId: actor.userId, month: monthOf(scan.createdAt), pointsCharged: points });
    },
  });

  const checkGroup = async (groupId: number | undefined, actor: Actor | undefined): Promise<void> => {
    if (groupId === undefined) return;
    if (!(await findGroup(db, groupId)) || (actor && actor.role !== 'admin' && !actor.groupIds.includes(groupId))) {
      throw new InvalidInputError(`groupId: you are not a member of a group with id ${groupId}; share with one of your own groups`, 'groupId');
    }
  };

  /** Validates first: an invalid plan, a passed quota or a foreign group stores nothing. */
  const submit = async (input: SubmitScan, actor?: Actor): Promise<ScanDetail> => {
    const plan = 'planText' in input ? parsePlanText(input.planText, input.format) : validatePlan(input.plan);
    const planText = 'planText' in input ? input.planText : stringify(input.plan);
    if (input.basedOn !== undefined) {
      const base = await findScan(db, input.basedOn);
      if (!base || (actor && !canSee(actor, base))) throw new InvalidInputError(`basedOn: scan ${input.basedOn} does not exist`, 'basedOn');
    }
    await checkGroup(input.groupId, actor);
    const pointCount = planPointCount(plan);
    const scan = await insertScan(db, {
      title: plan.title,
      notes: plan.notes ?? '',
      plan,
      planText,
      planHash: await planHash(plan),
      physicsVersion: PHYSICS_VERSION,
      pointCount,
      basedOnScanId: input.basedOn ?? null,
      ownerId: actor?.userId ?? null,
      groupId: input.groupId ?? null,
    }, batchSize, actor ? charging(actor, pointCount) : {});
    onSubmitted();
    return toScanDetail(await withNames(scan.id));
  };

  const cancel = async (id: number): Promise<ScanView> => {
    const scan = await load(id);
    if (scan.state !== 'queued' && scan.state !== 'running') {
      throw new ConflictError(`scan ${id} is ${scan.state}; only queued or running scans can be cancelled`, 'not_cancellable');
    }
    // No new batch is claimed; batches computing now are abandoned, stored ones are kept.
    await updateScan(db, id, { state: 'cancelled', finishedAt: new Date() });
    onCancelled?.(id);
    const view = toScanView(await withNames(id));
    events.publish(view);
    return view;
  };

  return {
    submit,
    cancel,
    /** Every scan, or those the actor may see. */
    list: async (actor?: Actor): Promise<ScanView[]> => (await listScansWithNames(db, actor ? visibleScans(actor) : undefined)).map((s) => toScanView(s)),
    get: async (id: number): Promise<ScanDetail> => toScanDetail(await withNames(id)),
    view: async (id: number): Promise<ScanView> => toScanView(await withNames(id)),
    /** A new scan of the same plan for the actor; it stays in the group when the actor belongs to it. */
    clone: async (id: number, actor?: Actor): Promise<ScanDetail> => {
      const scan = await load(id);
      const keepGroup = scan.groupId !== null && (!actor || actor.role === 'admin' || actor.groupIds.includes(scan.groupId));
      return submit({ planText: scan.planText, ...(keepGroup ? { groupId: scan.groupId! } : {}) }, actor);
    },
    remove: async (id: number): Promise<void> => {
      const scan = await load(id);
      await keepUsageOf(db, scan.id);
      await deleteScan(db, scan.id);
    },
  };
}
