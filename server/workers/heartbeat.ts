import { randomBytes } from 'node:crypto';
import { hostname } from 'node:os';
import type { Logger } from 'pino';
import type { Database } from '../db/client.ts';
import { markWorkerStopped, recordHeartbeat, registerWorker } from './workersRepository.ts';

/** How often a compute process reports; admins see it as silent after three missed reports. */
export const HEARTBEAT_SECONDS = 5;
export const SILENT_AFTER_SECONDS = 3 * HEARTBEAT_SECONDS;

export interface Heartbeat {
  /** host:pid:nonce, also written on the batches this process computes. */
  id: string;
  /** Counts points this process computed, for its totals and its points/s. */
  add(points: number): void;
  stop(): Promise<void>;
}

/**
 * Registers this process in the `workers` table and reports its totals and speed (points of the
 * last interval per second) every HEARTBEAT_SECONDS. A failed report (the database restarting)
 * is logged and the next one tries again.
 */
export async function startHeartbeat(db: Database, { concurrency, logger }: { concurrency: number; logger: Logger }): Promise<Heartbeat> {
  const id = `${hostname()}:${process.pid}:${randomBytes(3).toString('hex')}`;
  await registerWorker(db, { id, host: hostname(), pid: process.pid, concurrency });
  let total = 0;
  let reported = 0;
  let reportedAt = performance.now();
  const beat = async () => {
    const now = performance.now();
    const rate = (total - reported) / ((now - reportedAt) / 1000);
    try {
      await recordHeartbeat(db, id, total, rate);
      reported = total;
      reportedAt = now;
    } catch (error) {
      logger.warn({ err: error }, 'heartbeat not recorded');
    }
  };
  let beating = Promise.resolve();
  const timer = setInterval(() => {
    beating = beating.then(beat);
  }, HEARTBEAT_SECONDS * 1000);
  timer.unref();
  return {
    id,
    add(points) {
      total += points;
    },
    async stop() {
      clearInterval(timer);
      await beating;
      await markWorkerStopped(db, id, total).catch((error: unknown) => logger.warn({ err: error }, 'could not record that this worker stopped'));
    },
  };
}
