import { stringify } from 'yaml';
import type { ScanDetail, ScanView, SubmitScan } from '../../shared/api/scans.ts';
import { ConflictError, InvalidInputError, NotFoundError } from '../../shared/errors.ts';
import { planPointCount } from '../../shared/plan/expandPlan.ts';
import { planHash } from '../../shared/plan/planHash.ts';
import { parsePlanText, validatePlan } from '../../shared/plan/validatePlan.ts';
import { PHYSICS_VERSION } from '../../shared/physics/version.ts';
import type { Database } from '../db/client.ts';
import type { ScanEvents } from './scanEvents.ts';
import { deleteScan, findScan, insertScan, listScans, updateScan, type Scan } from './scansRepository.ts';
import { toScanDetail, toScanView } from './scanView.ts';

export interface ScansServiceDeps {
  db: Database;
  events: ScanEvents;
  batchSize: number;
  /** Called after a scan is stored, so the dispatcher looks for work at once. */
  onSubmitted: () => void;
  /** Called after a scan is cancelled, so work in flight stops at once. */
  onCancelled?: (id: number) => void;
}

export type ScansService = ReturnType<typeof createScansService>;

export function createScansService({ db, events, batchSize, onSubmitted, onCancelled }: ScansServiceDeps) {
  const load = async (id: number): Promise<Scan> => {
    const scan = await findScan(db, id);
    if (!scan) throw new NotFoundError(`scan ${id} does not exist`);
    return scan;
  };

  /** Validates first: an invalid plan stores nothing. */
  const submit = async (input: SubmitScan): Promise<ScanDetail> => {
    const plan = 'planText' in input ? parsePlanText(input.planText, input.format) : validatePlan(input.plan);
    const planText = 'planText' in input ? input.planText : stringify(input.plan);
    if (input.basedOn !== undefined && !(await findScan(db, input.basedOn))) {
      throw new InvalidInputError(`basedOn: scan ${input.basedOn} does not exist`, 'basedOn');
    }
    const scan = await insertScan(db, {
      title: plan.title,
      notes: plan.notes ?? '',
      plan,
      planText,
      planHash: await planHash(plan),
      physicsVersion: PHYSICS_VERSION,
      pointCount: planPointCount(plan),
      basedOnScanId: input.basedOn ?? null,
    }, batchSize);
    onSubmitted();
    return toScanDetail(scan);
  };

  const cancel = async (id: number): Promise<ScanView> => {
    const scan = await load(id);
    if (scan.state !== 'queued' && scan.state !== 'running') {
      throw new ConflictError(`scan ${id} is ${scan.state}; only queued or running scans can be cancelled`, 'not_cancellable');
    }
    // No new batch is claimed; batches computing now are abandoned, stored ones are kept.
    const updated = await updateScan(db, id, { state: 'cancelled', finishedAt: new Date() });
    onCancelled?.(id);
    const view = toScanView(updated!);
    events.publish(view);
    return view;
  };

  return {
    submit,
    cancel,
    list: async (): Promise<ScanView[]> => (await listScans(db)).map((s) => toScanView(s)),
    get: async (id: number): Promise<ScanDetail> => toScanDetail(await load(id)),
    view: async (id: number): Promise<ScanView> => toScanView(await load(id)),
    clone: async (id: number): Promise<ScanDetail> => {
      const scan = await load(id);
      return submit({ planText: scan.planText });
    },
    remove: async (id: number): Promise<void> => {
      const scan = await load(id);
      await deleteScan(db, scan.id);
    },
  };
}
