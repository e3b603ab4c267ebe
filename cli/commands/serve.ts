import { Command } from 'commander';
import { examples } from '../help.ts';

/** Starts the API and local workers on the embedded database; runs until interrupted. */
async function serve(options: { demo?: boolean; port?: string; dataDir?: string }): Promise<void> {
  // Loaded here, not at the top: the server's dependencies would slow down every other command.
  const [{ pino }, { loadConfig }, { DEMO_ACCOUNTS }, { startServer }] = await Promise.all([
    import('pino'), import('../../server/config.ts'), import('../../server/demo/demoAccounts.ts'), import('../../server/startServer.ts'),
  ]);
  const config = loadConfig({
    ...process.env,
    ...(options.port === undefined ? {} : { PORT: options.port }),
    ...(options.dataDir === undefined ? {} : { DATA_DIR: options.dataDir }),
  });
  const logger = pino({ level: config.logLevel });
  const server = await startServer(config, logger, { demo: options.demo === true });
  if (options.demo) {
    logger.info({ submitted: server.demoSubmitted }, server.demoSubmitted.length ? 'demo scans queued' : 'demo scans already stored');
  }
  process.stdout.write(`Rollway is listening on ${server.url} (data in ${config.databaseUrl ? 'PostgreSQL' : config.dataDir})\n`);
  if (server.setupUrl) process.stdout.write(`No admin can sign in yet. Open this one-time link to set one up (valid 24 h):\n  ${server.setupUrl}\n`);
  if (options.demo) {
    process.stdout.write('Demo accounts (invented; for trying things out only):\n');
    for (const a of DEMO_ACCOUNTS) process.stdout.write(`  ${a.role.padEnd(12)} ${a.email.padEnd(28)} password: ${a.password}\n`);
  }
  await new Promise<void>((resolve) => {
    const stop = () => void server.stop().then(resolve);
    process.once('SIGINT', stop);
    process.once('SIGTERM', stop);
  });
}

export const serveCommand = new Command('serve')
  .description('run the API server with local workers on the embedded database (./data)')
  .option('--port <port>', 'port to listen on (env PORT, default 4600)')
  .option('--data-dir <dir>', 'embedded database folder (env DATA_DIR, default ./data)')
  .option('--demo', 'queue the example scans of the demo scenario that are not stored yet')
  .addHelpText('after', examples('rollway serve --demo', 'PORT=8080 rollway serve --data-dir /srv/rollway'))
  .action(serve);
