import type { AddressInfo } from 'node:net';
import type { Logger } from 'pino';
import { createApp } from './app.ts';
import type { Config } from './config.ts';
import { openEmbedded } from './embedded.ts';
import { resultsRouter } from './results/resultsRouter.ts';
import type { ScansService } from './scans/scansService.ts';

export interface RunningServer {
  url: string;
  port: number;
  scans: ScansService;
  stop(): Promise<void>;
}

/** Opens the database (migrating it), starts the compute pool and listens; used by `rollway serve` and tests. */
export async function startServer(config: Config, logger: Logger): Promise<RunningServer> {
  const core = await openEmbedded({ ...config, logger });
  const app = createApp({ db: core.handle.db, logger, scans: core.scans, events: core.events, scanFeatures: [resultsRouter(core.handle.db)] });
  const server = app.listen(config.port, config.host);
  await new Promise<void>((resolve, reject) => server.once('listening', resolve).once('error', reject));
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://${config.host}:${port}`,
    port,
    scans: core.scans,
    async stop() {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await core.close();
    },
  };
}
