import type pg from 'pg';
import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import { openPool } from '../db/pgPool.ts';
import { MAX_ATTEMPTS } from './batchRunner.ts';

/** One job per batch; the `batches` table holds its state, the job only says which batch to compute. */
export const BATCH_QUEUE = 'rollway-batches';
/** pg-boss moves a batch job here when it is out of retries (errors or timeouts); the server marks the batch failed. */
export const FAILED_QUEUE = 'rollway-batches-failed';

export interface BatchJob {
  batchId: number;
  scanId: number;
}

export interface BossHandle {
  boss: PgBoss;
  /** The pool pg-boss runs on; the publisher borrows a client from it to insert jobs in its own transaction. */
  pool: pg.Pool;
  close(): Promise<void>;
}

export interface OpenBossOptions {
  logger: Logger;
  /** Only the server supervises: expires jobs of dead workers (retry or dead letter) and archives old ones. */
  supervise?: { batchTimeoutSeconds: number };
}

/**
 * pg-boss on its own small pool (its polls must not wait behind result writes). An 'error'
 * listener on the pool and on pg-boss is required: a database restart otherwise kills the process
 * through an unhandled 'error' event, instead of the next query reconnecting.
 */
export async function openBoss(databaseUrl: string, { logger, supervise }: OpenBossOptions): Promise<BossHandle> {
  const pool = openPool(databaseUrl, { name: 'rollway-queue', max: 4 }, (error) => logger.warn({ reason: error.message }, 'queue connection lost'));
  const boss = new PgBoss({
    db: { executeSql: (text, values) => pool.query(text, values) },
    schedule: false,
    supervise: supervise !== undefined,
    // An expired job is found at the next maintenance run: a fifth of the timeout keeps the delay small.
    maintenanceIntervalSeconds: supervise ? Math.max(1, Math.min(60, Math.floor(supervise.batchTimeoutSeconds / 5))) : 60,
    archiveCompletedAfterSeconds: 3600,
    deleteAfterDays: 1,
  });
  boss.on('error', (error) => logger.warn({ err: error }, 'queue error'));
  try {
    await boss.start();
    await boss.createQueue(FAILED_QUEUE);
    const batchQueue = { name: BATCH_QUEUE, retryLimit: MAX_ATTEMPTS - 1, retryDelay: 1, deadLetter: FAILED_QUEUE };
    await boss.createQueue(BATCH_QUEUE, batchQueue);
    await boss.updateQueue(BATCH_QUEUE, batchQueue); // a queue made by an older release keeps its settings otherwise
  } catch (error) {
    await boss.stop({ graceful: false, close: false }).catch(() => undefined);
    await pool.end();
    throw error;
  }
  return {
    boss,
    pool,
    async close() {
      await boss.stop({ graceful: false, close: false, wait: true });
      await pool.end();
    },
  };
}

/** Message of a job's failure as pg-boss stored it (an Error serialized by the worker, or the expiry note). */
export function failureMessage(output: unknown): string {
  const o = output as { message?: unknown; value?: { message?: unknown } } | null | undefined;
  const message = o?.message ?? o?.value?.message;
  return typeof message === 'string' ? message : 'failed in every try';
}
