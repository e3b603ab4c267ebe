import type { Logger } from 'pino';
import type { QuotaDefaults } from './accounts/quota.ts';
import { createLocalDispatcher } from './compute/localDispatcher.ts';
import { DEFAULT_BATCH_TIMEOUT_SECONDS } from './config.ts';
import { openDatabase, type DatabaseHandle } from './db/client.ts';
import { ScanEvents } from './scans/scanEvents.ts';
import { createScansService, type ScansService } from './scans/scansService.ts';
import type { Dispatcher } from './compute/dispatcher.ts';

export interface Embedded {
  handle: DatabaseHandle;
  events: ScanEvents;
  scans: ScansService;
  dispatcher: Dispatcher;
  close(): Promise<void>;
}

/** The service without HTTP: database, local workers and the scans service, for `rollway run` and the server alike. */
export async function openEmbedded(options: { dataDir?: string; databaseUrl?: string; workers: number; batchSize: number; batchTimeoutSeconds?: number; logger: Logger; quotaDefaults?: QuotaDefaults }): Promise<Embedded> {
  const handle = await openDatabase(options.databaseUrl ? { databaseUrl: options.databaseUrl } : { dataDir: options.dataDir ?? 'memory://' });
  const events = new ScanEvents();
  // PGlite: piscina threads in this process. PostgreSQL: pg-boss hands batches to `rollway worker`
  // processes, and to `workers` threads here too (0: this server computes nothing).
  const dispatcher = options.databaseUrl
    ? await (await import('./compute/pgBossDispatcher.ts')).createPgBossDispatcher({
      db: handle.db, databaseUrl: options.databaseUrl, events, logger: options.logger, workers: options.workers,
      batchTimeoutSeconds: options.batchTimeoutSeconds ?? DEFAULT_BATCH_TIMEOUT_SECONDS,
    })
    : await createLocalDispatcher({ db: handle.db, events, logger: options.logger, workers: options.workers });
  const scans = createScansService({ db: handle.db, events, batchSize: options.batchSize, onSubmitted: () => dispatcher.notify(), onCancelled: (id) => dispatcher.cancel(id), ...(options.quotaDefaults ? { quotaDefaults: options.quotaDefaults } : {}) });
  await dispatcher.start();
  return {
    handle, events, scans, dispatcher,
    async close() {
      await dispatcher.stop();
      await handle.close();
    },
  };
}
