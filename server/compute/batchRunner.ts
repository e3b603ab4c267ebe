import { Piscina } from 'piscina';
import { createPointSource, type PointSource } from '../../shared/plan/expandPlan.ts';
import type { ScanPlan } from '../../shared/plan/scanPlan.ts';
import { portablePotential } from '../../shared/physics/point/preparePoint.ts';
import { PHYSICS_VERSION } from '../../shared/physics/version.ts';
import type { PortablePotential } from '../../shared/physics/potential/portable.ts';
import type { Database } from '../db/client.ts';
import { RESULT_COLUMNS } from '../db/resultColumns.ts';
import { insertEncodedResults, insertPointResults, type WriteOutcome } from '../db/resultsWriter.ts';
import type { Batch } from '../db/schema/batches.ts';
import { findScan, settleScan, type Scan } from '../scans/scansRepository.ts';
import type { BatchOutput, BatchTask } from './computeBatch.ts';
import { reuseResults } from './reuseResults.ts';
import { buildWorkerBundle } from './workerBundle.ts';

/** Tries a batch gets before it is marked failed with its error (local and pg-boss dispatchers alike). */
export const MAX_ATTEMPTS = 3;

interface ScanWork {
  plan: ScanPlan;
  potential: PortablePotential;
  planHash: string;
  basedOnScanId: number | null;
  points: PointSource;
}

/**
 * Computes batches in a piscina pool of `threads` worker threads; shared by the local dispatcher
 * (in the server) and `rollway worker` (pg-boss), so both compute a batch the same way.
 */
export interface BatchRunner {
  /** The batch's rows (a derived scan's copied ones included); undefined when the scan is gone. Rejects when aborted. */
  compute(batch: Batch, signal: AbortSignal): Promise<BatchOutput | undefined>;
  /** Drops the cached plan of a scan that stopped running. */
  forget(scanId: number): void;
  close(): Promise<void>;
}

export async function createBatchRunner(db: Database, threads: number): Promise<BatchRunner> {
  const bundle = await buildWorkerBundle();
  // Small heaps keep each thread's memory low: the integrator's short-lived arrays die young
  // either way (same points/s with 8 MB of young generation as with V8's default), and without a
  // cap the old generation grew by ~8 MB per 10,000 points of garbage before V8 collected it.
  // A thread holds ~12 MB (no expression compiler: tasks carry compiled code), so 32 MB is room.
  const pool = new Piscina({ filename: bundle.url, minThreads: threads, maxThreads: threads, resourceLimits: { maxYoungGenerationSizeMb: 8, maxOldGenerationSizeMb: 32 } });
  const plans = new Map<number, ScanWork>();

  const planOf = async (scanId: number) => {
    const cached = plans.get(scanId);
    if (cached) return cached;
    const scan = await findScan(db, scanId);
    if (!scan) return undefined;
    // Numbers of another release must not land in this scan (a scan resumed after an upgrade, or
    // a worker of another release on pg-boss): its batch fails, locally or as a failed try.
    if (scan.physicsVersion !== PHYSICS_VERSION) {
      throw new Error(`physics version ${scan.physicsVersion} stored this scan, but this process computes with ${PHYSICS_VERSION}: run the same Rollway release on every machine, or clone the scan to compute it again with this one`);
    }
    const plan = scan.plan as unknown as ScanPlan;
    const points = createPointSource(plan);
    // Compiled here, once per scan: the expression compiler (mathjs) stays out of the threads.
    const potential = portablePotential(points.potential, points.parameterNames);
    const entry: ScanWork = { plan, potential, planHash: scan.planHash, basedOnScanId: scan.basedOnScanId, points };
    plans.set(scanId, entry);
    return entry;
  };

  return {
    async compute(batch, signal) {
      const source = await planOf(batch.scanId);
      if (!source) return undefined; // deleted while queued
      // A derived scan copies what its source already computed and computes only the rest.
      const reuse = source.basedOnScanId !== null
        ? await reuseResults(db, source.points, batch, source.basedOnScanId)
        : { copied: [], remaining: undefined };
      const task: BatchTask = {
        scanId: batch.scanId, plan: source.plan, potential: source.potential, planHash: source.planHash, firstIndex: batch.firstIndex, pointCount: batch.pointCount,
        ...(reuse.remaining ? { indices: reuse.remaining } : {}),
        // Rows copied from another scan are objects here, so only a batch with none comes back encoded.
        ...(reuse.copied.length === 0 ? { encodeWith: RESULT_COLUMNS } : {}),
      };
      const output = task.indices?.length === 0
        ? { rows: [], computeSeconds: 0 }
        : ((await pool.run(task, { signal })) as BatchOutput);
      return reuse.copied.length === 0 ? output : { ...output, rows: [...reuse.copied, ...output.rows] };
    },
    forget(scanId) {
      plans.delete(scanId);
    },
    async close() {
      await pool.destroy();
      await bundle.remove();
    },
  };
}

/**
 * Stores a batch's rows and marks it done in one idempotent write, then completes the scan if
 * that was its last point. A scan deleted mid-batch takes its batches with it: then there is
 * nothing to write and the outcome is undefined.
 */
export async function storeBatch(db: Database, batch: Batch, output: BatchOutput): Promise<{ outcome: WriteOutcome; scan: Scan | undefined } | undefined> {
  let outcome: WriteOutcome;
  try {
    outcome = output.encoded ? await insertEncodedResults(db, batch, output.encoded) : await insertPointResults(db, batch, output.rows);
  } catch (error) {
    if (await findScan(db, batch.scanId)) throw error;
    return undefined;
  }
  return { outcome, scan: await settleScan(db, batch.scanId) };
}
