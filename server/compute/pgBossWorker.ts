import type PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Database } from '../db/client.ts';
import type { Batch } from '../db/schema/batches.ts';
import { startHeartbeat } from '../workers/heartbeat.ts';
import { createBatchRunner, storeBatch } from './batchRunner.ts';
import { pointsIn, type BatchOutput } from './computeBatch.ts';
import { noteBatchError, returnBatch, startBatch, wantedScanIds } from './pgBossBatches.ts';
import { BATCH_QUEUE, type BatchJob } from './pgBossQueue.ts';
import { retryTransient, rootMessage } from './transientErrors.ts';

export interface PgBossWorkerOptions {
  db: Database;
  boss: PgBoss;
  logger: Logger;
  /** Worker threads; twice as many batches are taken, so a thread never waits on a write. */
  concurrency: number;
}

export interface PgBossWorker {
  id: string;
  /** Abandons this scan's batches computing here (they go back to pending). */
  cancel(scanId: number): void;
  /** Takes no new batch, lets those in flight finish for up to `graceMs`, then returns the rest. */
  stop(graceMs?: number): Promise<void>;
}

interface InFlight {
  job: PgBoss.JobWithMetadata<BatchJob>;
  batch?: Batch;
  aborter: AbortController;
}

const POLL_MS = 500;
const WANTED_CHECK_MS = 1000;
/** A computed batch is worth waiting for: its write is retried through a database outage this long at least. */
const MIN_PERSIST_MS = 60_000;

/**
 * One member of the pool (`rollway worker`, or the server computing too): takes batch jobs from
 * pg-boss, computes them with the same runner as the local dispatcher and writes them with the
 * same idempotent writer. A job is completed only after its batch is stored (or found to need
 * nothing); a crash leaves it active until pg-boss expires it and hands it to another worker.
 */
export async function startPgBossWorker({ db, boss, logger, concurrency }: PgBossWorkerOptions): Promise<PgBossWorker> {
  const runner = await createBatchRunner(db, concurrency);
  const heartbeat = await startHeartbeat(db, { concurrency, logger });
  const log = logger.child({ worker: heartbeat.id });
  const inFlight = new Map<string, InFlight>();
  const settled = new Set<Promise<void>>();
  let running = true;
  let pumping = false;

  const run = async (entry: InFlight): Promise<void> => {
    const { job, aborter } = entry;
    const giveUpAt = Date.now() + Math.max(job.expireInSeconds * 1000, MIN_PERSIST_MS);
    const persist = <T>(step: () => Promise<T>) => retryTransient(step, giveUpAt, (error) => log.warn({ reason: rootMessage(error), batchId: job.data.batchId }, 'database away, trying again'));
    const complete = () => persist(() => boss.complete(BATCH_QUEUE, job.id));
    /** pg-boss retries the job (retryLimit), then moves it to the failed queue, where the server marks the batch. */
    const failTry = async (message: string) => {
      await persist(() => noteBatchError(db, job.data.batchId, message));
      await persist(() => boss.fail(BATCH_QUEUE, job.id, { message }));
    };

    const batch = await persist(() => startBatch(db, job.data.batchId, heartbeat.id, job.expireInSeconds));
    if (!batch) {
      // Done elsewhere or failed (then this changes nothing), or its scan was cancelled: its points stay pending.
      await persist(() => returnBatch(db, job.data.batchId));
      return void (await complete());
    }
    entry.batch = batch;
    let output: BatchOutput | undefined;
    try {
      output = await runner.compute(batch, aborter.signal);
    } catch (error) {
      if (aborter.signal.aborted) {
        // Cancelled or stopping: the batch goes back to pending and the server publishes it again.
        await persist(() => returnBatch(db, batch.id));
        return void (await complete());
      }
      log.error({ err: error, batchId: batch.id, scanId: batch.scanId, try: job.retryCount + 1 }, 'batch failed');
      return failTry(rootMessage(error));
    }
    if (output) {
      const stored = await persist(() => storeBatch(db, batch, output));
      heartbeat.add(pointsIn(output));
      if (stored?.scan?.state !== 'running') runner.forget(batch.scanId);
    }
    await complete();
  };

  const launch = (job: PgBoss.JobWithMetadata<BatchJob>) => {
    const entry: InFlight = { job, aborter: new AbortController() };
    inFlight.set(job.id, entry);
    const done = run(entry)
      .catch(async (error: unknown) => {
        // Not stored and not transient (or the database stayed away too long): a failed try.
        log.error({ err: error, batchId: job.data.batchId }, 'batch not stored');
        await boss.fail(BATCH_QUEUE, job.id, { message: rootMessage(error) }).catch(() => undefined);
      })
      .finally(() => {
        inFlight.delete(job.id);
        settled.delete(done);
        void pump();
      });
    settled.add(done);
  };

  const pump = async (): Promise<void> => {
    if (!running || pumping) return;
    pumping = true;
    try {
      while (running && inFlight.size < 2 * concurrency) {
        // fetch answers [] while the database is away; the next poll tries again.
        const jobs = await boss.fetch<BatchJob>(BATCH_QUEUE, { batchSize: 2 * concurrency - inFlight.size, includeMetadata: true });
        for (const job of jobs) launch(job); // even if stopping meanwhile: they finish or go back
        if (jobs.length === 0) break;
      }
    } finally {
      pumping = false;
    }
  };

  const abortWhere = (unwanted: (scanId: number | undefined) => boolean) => {
    for (const entry of inFlight.values()) if (unwanted(entry.batch?.scanId)) entry.aborter.abort();
  };

  /** Remote cancels: this process cannot be told directly, so it asks whether its scans are still wanted. */
  const checkWanted = async () => {
    const ids = [...new Set([...inFlight.values()].flatMap((e) => (e.batch ? [e.batch.scanId] : [])))];
    if (ids.length === 0) return;
    const wanted = await wantedScanIds(db, ids).catch(() => undefined);
    if (wanted) abortWhere((id) => id !== undefined && !wanted.has(id));
  };

  const pollTimer = setInterval(() => void pump(), POLL_MS);
  const wantedTimer = setInterval(() => void checkWanted(), WANTED_CHECK_MS);
  void pump();
  log.info({ concurrency }, 'worker joined the pool');

  return {
    id: heartbeat.id,
    cancel(scanId) {
      abortWhere((id) => id === scanId);
    },
    async stop(graceMs = 30_000) {
      running = false;
      clearInterval(pollTimer);
      while (pumping) await new Promise((r) => setTimeout(r, 20));
      const grace = new Promise<'late'>((resolve) => setTimeout(resolve, graceMs, 'late').unref());
      if ((await Promise.race([Promise.allSettled([...settled]), grace])) === 'late') {
        log.warn({ batches: inFlight.size }, 'returning the batches not finished in time');
        abortWhere(() => true);
      }
      await Promise.allSettled([...settled]);
      clearInterval(wantedTimer);
      await heartbeat.stop();
      await runner.close();
      log.info('worker left the pool');
    },
  };
}
