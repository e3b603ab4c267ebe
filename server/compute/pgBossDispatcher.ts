import { drizzle } from 'drizzle-orm/node-postgres';
import type { Logger } from 'pino';
import { TERMINAL_STATES } from '../../shared/api/scans.ts';
import type { Database } from '../db/client.ts';
import * as schema from '../db/schema/index.ts';
import type { ScanEvents } from '../scans/scanEvents.ts';
import { toScanView } from '../scans/scanView.ts';
import type { Dispatcher } from './dispatcher.ts';
import { failBatchForGood, scansToWatch, takePendingBatches } from './pgBossBatches.ts';
import { BATCH_QUEUE, FAILED_QUEUE, failureMessage, openBoss, type BatchJob } from './pgBossQueue.ts';
import { startPgBossWorker, type PgBossWorker } from './pgBossWorker.ts';
import { rootMessage } from './transientErrors.ts';

export interface PgBossDispatcherOptions {
  db: Database;
  databaseUrl: string;
  events: ScanEvents;
  logger: Logger;
  /** Worker threads computing in the server process too; 0 leaves all computing to `rollway worker`. */
  workers: number;
  /** A batch job active this long is taken to belong to a dead worker and is handed out again. */
  batchTimeoutSeconds: number;
}

const POLL_MS = 500;
const PUBLISH_CHUNK = 1000;

/**
 * The scale-out dispatcher. The server publishes pending batches as pg-boss jobs (marking them
 * running in the same transaction), marks batches that pg-boss gave up on as failed, and turns
 * the progress that workers on other machines write into scan events for this server's clients.
 */
export async function createPgBossDispatcher({ db, databaseUrl, events, logger, workers, batchTimeoutSeconds }: PgBossDispatcherOptions): Promise<Dispatcher> {
  const queue = await openBoss(databaseUrl, { logger, supervise: { batchTimeoutSeconds } });
  const { boss, pool } = queue;
  let worker: PgBossWorker | undefined;
  let timer: NodeJS.Timeout | undefined;
  let ticking = false;
  let publishing: Promise<void> | undefined;
  let away = false;
  const seen = new Map<number, string>();

  /** Batches marked running and their jobs inserted in one transaction: a batch is never running without a job. */
  const publishChunk = async (): Promise<number> => {
    const client = await pool.connect();
    try {
      return await drizzle({ client, schema, casing: 'snake_case' }).transaction(async (tx) => {
        const taken = await takePendingBatches(tx as unknown as Database, PUBLISH_CHUNK);
        if (taken.length === 0) return 0;
        const jobs = taken.map((b) => ({ name: BATCH_QUEUE, data: { batchId: b.id, scanId: b.scanId } satisfies BatchJob, expireInSeconds: batchTimeoutSeconds }));
        await boss.insert(jobs, { db: { executeSql: (text, values) => client.query(text, values) } });
        return taken.length;
      });
    } finally {
      client.release();
    }
  };

  const publish = (): Promise<void> => {
    publishing ??= (async () => {
      try {
        while ((await publishChunk()) === PUBLISH_CHUNK);
      } finally {
        publishing = undefined;
      }
    })();
    return publishing;
  };

  /** pg-boss moved these jobs to the failed queue: out of retries, by errors or by timeouts. */
  const markFailures = async () => {
    for (;;) {
      const jobs = await boss.fetch<BatchJob>(FAILED_QUEUE, { batchSize: 50, includeMetadata: true });
      if (jobs.length === 0) return;
      for (const job of jobs) {
        const message = failureMessage(job.output);
        logger.error({ batchId: job.data.batchId, scanId: job.data.scanId, reason: message }, 'batch failed in every try');
        const scan = await failBatchForGood(db, job.data.batchId, message);
        if (scan) events.publish(toScanView(scan));
        await boss.complete(FAILED_QUEUE, job.id);
      }
    }
  };

  /** Progress written by other processes reaches this server's event subscribers (SSE) here. */
  const watch = async () => {
    const scans = await scansToWatch(db);
    const current = new Set<number>();
    for (const scan of scans) {
      current.add(scan.id);
      const signature = `${scan.state}:${scan.pointsDone}:${scan.pointsFailed}`;
      if (seen.get(scan.id) === signature) continue;
      seen.set(scan.id, signature);
      events.publish(toScanView(scan));
      if (TERMINAL_STATES.has(scan.state)) worker?.cancel(scan.id);
    }
    for (const id of seen.keys()) if (!current.has(id)) seen.delete(id);
  };

  const tick = async () => {
    if (ticking) return;
    ticking = true;
    try {
      await publish();
      await markFailures();
      await watch();
      if (away) logger.info('database reachable again');
      away = false;
    } catch (error) {
      // Typically the database restarting; pg reconnects on the next query.
      if (!away) logger.warn({ reason: rootMessage(error) }, 'dispatcher cannot reach the database; retrying');
      away = true;
    } finally {
      ticking = false;
    }
  };

  return {
    async start() {
      await publish();
      timer = setInterval(() => void tick(), POLL_MS);
      if (workers > 0) worker = await startPgBossWorker({ db, boss, logger, concurrency: workers });
    },
    notify() {
      publish().catch((error: unknown) => logger.warn({ reason: rootMessage(error) }, 'publishing batches failed; the next poll retries'));
    },
    cancel(scanId) {
      // Workers elsewhere notice within a second (they check their scans); this process's at once.
      worker?.cancel(scanId);
    },
    async stop() {
      clearInterval(timer);
      while (ticking) await new Promise((r) => setTimeout(r, 20));
      await publishing?.catch(() => undefined);
      await worker?.stop();
      await queue.close();
    },
  };
}
