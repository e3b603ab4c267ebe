import { readFile } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { Command } from 'commander';
import { TERMINAL_STATES, type ScanView } from '../../shared/api/scans.ts';
import { InvalidInputError } from '../../shared/errors.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';

interface RunOptions {
  dataDir: string;
  workers?: string;
  json?: boolean;
}

/** Computes a plan on this machine with no server: embedded database, local worker threads. */
async function runPlan(file: string, options: RunOptions): Promise<void> {
  const planText = await readFile(file, 'utf8').catch(() => {
    throw new InvalidInputError(`PLAN: cannot read "${file}"`, 'PLAN');
  });
  const workers = options.workers === undefined ? availableParallelism() : Number(options.workers);
  if (!Number.isInteger(workers) || workers < 1) throw new InvalidInputError(`--workers: "${options.workers}" must be a whole number >= 1`, '--workers');
  // Loaded here, not at the top: the server's dependencies would slow down every other command.
  const [{ pino }, { openEmbedded }] = await Promise.all([import('pino'), import('../../server/embedded.ts')]);
  const core = await openEmbedded({ dataDir: options.dataDir, workers, batchSize: 500, logger: pino({ level: 'warn' }) });
  try {
    const scan = await core.scans.submit({ planText, ...(/\.json$/i.test(file) ? { format: 'json' as const } : {}) });
    const done = await new Promise<ScanView>((resolve) => {
      const onView = (view: ScanView) => {
        if (!options.json && process.stderr.isTTY) process.stderr.write(`\r${view.pointsDone}/${view.pointCount} points`);
        if (TERMINAL_STATES.has(view.state)) {
          unsubscribe();
          resolve(view);
        }
      };
      const unsubscribe = core.events.subscribe(scan.id, onView);
      // A tiny plan may finish before the subscription: look once after subscribing.
      void core.scans.view(scan.id).then(onView);
    });
    if (!options.json && process.stderr.isTTY) process.stderr.write('\n');
    if (options.json) printJson(done);
    else process.stdout.write(`scan ${done.id} "${done.title}": ${done.state}, ${done.pointsDone} points (${done.pointsFailed} not ok) in ${done.computeSeconds.toFixed(1)} s of compute; stored in ${options.dataDir}\n`);
    if (done.state !== 'completed') process.exitCode = 1;
  } finally {
    await core.close();
  }
}

export const run = new Command('run')
  .description('compute a scan plan on this machine without a server (embedded database)')
  .argument('<PLAN>', 'scan plan file (YAML or JSON)')
  .option('--data-dir <dir>', 'folder of the embedded database', './rollway-data')
  .option('--workers <n>', 'worker threads (default: all cores)')
  .option('--json', 'print the finished scan as JSON')
  .addHelpText('after', examples('rollway run examples/quick-check.yaml --data-dir ./my-scans', 'rollway run plan.yaml --workers 2 --json'))
  .action(runPlan);
