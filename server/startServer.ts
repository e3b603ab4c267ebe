import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Logger } from 'pino';
import { openAccounts } from './accounts/openAccounts.ts';
import { createApp } from './app.ts';
import type { Config } from './config.ts';
import type { Database } from './db/client.ts';
import { seedDemoAccounts } from './demo/demoAccounts.ts';
import { seedDemo } from './demo/seedDemo.ts';
import { openEmbedded } from './embedded.ts';
import { createMailer } from './mail/mailer.ts';
import { notifyScanOwners } from './scans/notifyOwners.ts';
import { resultsRouter } from './results/resultsRouter.ts';
import type { ScansService } from './scans/scansService.ts';
import { workersRouter } from './workers/workersRouter.ts';

export interface RunningServer {
  url: string;
  port: number;
  /** The open database (tests read and adjust rows through it). */
  db: Database;
  scans: ScansService;
  /** The one-time admin set-up link when no admin can sign in yet. */
  setupUrl?: string;
  /** With `demo`: the example plans queued at this start (those not stored yet). */
  demoSubmitted: string[];
  stop(): Promise<void>;
}

/** Opens the database (migrating it), starts the compute pool and listens; used by `rollway serve` and tests. */
export async function startServer(config: Config, logger: Logger, options: { demo?: boolean } = {}): Promise<RunningServer> {
  // Listen first: with PORT=0 the links in mails need the port the system picked.
  const server = createServer();
  // Longer than clients keep idle connections (undici: 4 s), so a client never reuses a
  // connection the server is closing at that moment (an ECONNRESET seen under load).
  server.keepAliveTimeout = 65_000;
  server.headersTimeout = 66_000;
  server.listen(config.port, config.host);
  await new Promise<void>((resolve, reject) => server.once('listening', resolve).once('error', reject));
  const port = (server.address() as AddressInfo).port;
  const publicUrl = config.port === 0 ? config.mail.publicUrl.replace(/:0$/, `:${port}`) : config.mail.publicUrl;
  const settings: Config = { ...config, mail: { ...config.mail, publicUrl } };

  const quotaDefaults = { defaultMonthlyPoints: config.accounts.defaultMonthlyPoints, defaultMaxRunning: config.accounts.defaultMaxRunning };
  const core = await openEmbedded({ ...config, logger, quotaDefaults });
  const mailer = await createMailer(settings.mail, logger);
  // Demo accounts first, so their admin counts and no set-up link is made.
  const demoOwner = options.demo ? await seedDemoAccounts(core.handle.db) : undefined;
  const accounts = await openAccounts(core.handle.db, settings, mailer, logger);
  const demoSubmitted = demoOwner ? await seedDemo(core.scans, demoOwner) : [];
  const stopNotifying = notifyScanOwners({ db: core.handle.db, events: core.events, mailer, publicUrl, logger });
  const app = createApp({ db: core.handle.db, logger, scans: core.scans, events: core.events, accounts, scanFeatures: [resultsRouter(core.handle.db)],
    adminFeatures: [{ path: 'workers', router: workersRouter(core.handle.db) }] });
  server.on('request', app);
  return {
    url: `http://${config.host}:${port}`,
    port,
    db: core.handle.db,
    scans: core.scans,
    ...(accounts.setupUrl ? { setupUrl: accounts.setupUrl } : {}),
    demoSubmitted,
    async stop() {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      stopNotifying();
      await core.close();
      await mailer.close();
    },
  };
}
