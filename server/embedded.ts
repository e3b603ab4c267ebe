import type { Logger } from 'pino';
import { createLocalDispatcher } from './compute/localDispatcher.ts';
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
export async function openEmbedded(options: { dataDir?: string; databaseUrl?: string; workers: number; batchSize: number; logger: Logger }): Promise<Embedded> {
  const handle = await openDatabase(options.databaseUrl ? { databaseUrl: options.databaseUrl } : { dataDir: options.dataDir ?? 'memory://' });
  const events = new ScanEvents();
  const dispatcher = await createLocalDispatcher({ db: handle.db, events, logger: options.logger, workers: options.workers });
  const scans = createScansService({ db: handle.db, events, batchSize: options.batchSize, onSubmitted: () => dispatcher.notify(), onCancelled: (id) => dispatcher.cancel(id) });
  await dispatcher.start();
  return {
    handle, events, scans, dispatcher,
    async close() {
      await dispatcher.stop();
      await handle.close();
    },
  };
}
