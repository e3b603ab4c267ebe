import type { Logger } from 'pino';
import type { Database } from '../db/client.ts';
import type { Batch } from '../db/schema/batches.ts';
import type { ScanEvents } from '../scans/scanEvents.ts';
import { claimBatches, failBatch, releaseAllBatches, releaseBatch, updateScan } from '../scans/scansRepository.ts';
import { toScanView } from '../scans/scanView.ts';
import { startHeartbeat } from '../workers/heartbeat.ts';
import { createBatchRunner, MAX_ATTEMPTS, storeBatch } from './batchRunner.ts';
import { pointsIn, type BatchOutput } from './computeBatch.ts';
import type { Dispatcher } from './dispatcher.ts';

export interface LocalDispatcherOptions {
  db: Database;
  events: ScanEvents;
  logger: Logger;
  workers: number;
}

const POLL_MS = 500;
const LEASE_SECONDS = 600;

/**
 * Keeps every worker thread busy: claims pending batches from the database (twice as many as
 * there are threads, so a thread never waits on a write), computes them in the pool and writes
 * each batch's results in one transaction.
 */
export async function createLocalDispatcher({ db, events, logger, workers }: LocalDispatcherOptions): Promise<Dispatcher> {
  const runner = await createBatchRunner(db, workers);
  // The server's own pool is a worker too: admins see it beside any others.
  const heartbeat = await startHeartbeat(db, { concurrency: workers, logger });
  const workerId = heartbeat.id;
  const inFlight = new Set<Promise<void>>();
  const aborters = new Map<number, Set<AbortController>>();
  let running = false;
  let pumping = false;
  let timer: NodeJS.Timeout | undefined;

  const finish = async (batch: Batch, output: BatchOutput): Promise<void> => {
    const stored = await storeBatch(db, batch, output);
    heartbeat.add(pointsIn(output));
    if (stored?.scan) events.publish(toScanView(stored.scan));
    if (stored?.scan?.state !== 'running') runner.forget(batch.scanId);
  };

  const fail = async (batch: Batch, error: unknown): Promise<void> => {
    const message = error instanceof Error ? error.message : String(error);
    logger.error({ err: error, batchId: batch.id, scanId: batch.scanId }, 'batch failed');
    if ((await failBatch(db, batch, message, MAX_ATTEMPTS)) === 'failed') {
      const scan = await updateScan(db, batch.scanId, { state: 'failed', error: `batch at point ${batch.firstIndex}: ${message}`, finishedAt: new Date() });
      if (scan) events.publish(toScanView(scan));
    }
  };

  const run = async (batch: Batch): Promise<void> => {
    const aborter = new AbortController();
    const mine = aborters.get(batch.scanId) ?? new Set<AbortController>();
    aborters.set(batch.scanId, mine.add(aborter));
    let output: BatchOutput | undefined;
    try {
      output = await runner.compute(batch, aborter.signal);
    } catch (error) {
      if (aborter.signal.aborted) await releaseBatch(db, batch.id);
      else await fail(batch, error);
      return;
    } finally {
      mine.delete(aborter);
    }
    if (output) await finish(batch, output);
  };

  const pump = async (): Promise<void> => {
    if (!running || pumping) return;
    pumping = true;
    try {
      while (running && inFlight.size < 2 * workers) {
        const claimed = await claimBatches(db, 2 * workers - inFlight.size, workerId, LEASE_SECONDS);
        if (claimed.length === 0) break;
        for (const batch of claimed) {
          const job = run(batch)
            .catch((error: unknown) => logger.error({ err: error }, 'writing a batch failed'))
            .finally(() => {
              inFlight.delete(job);
              void pump();
            });
          inFlight.add(job);
        }
      }
    } finally {
      pumping = false;
    }
  };

  return {
    async start() {
      const released = await releaseAllBatches(db);
      if (released > 0) logger.info({ released }, 'resuming batches left unfinished by the last run');
      running = true;
      timer = setInterval(() => void pump(), POLL_MS);
      await pump();
    },
    notify() {
      void pump();
    },
    cancel(scanId) {
      for (const aborter of aborters.get(scanId) ?? []) aborter.abort();
      aborters.delete(scanId);
    },
    async stop() {
      running = false;
      clearInterval(timer);
      await Promise.allSettled([...inFlight]);
      await heartbeat.stop();
      await runner.close();
    },
  };
}
