import { Command } from 'commander';
import { admin } from './commands/admin/index.ts';
import { best } from './commands/best.ts';
import { cancel } from './commands/cancel.ts';
import { clone } from './commands/clone.ts';
import { families } from './commands/families.ts';
import { loginCommand } from './commands/login.ts';
import { logoutCommand } from './commands/logout.ts';
import { plan } from './commands/plan/index.ts';
import { point } from './commands/point.ts';
import { results } from './commands/results.ts';
import { run } from './commands/run.ts';
import { scans } from './commands/scans.ts';
import { serveCommand } from './commands/serve.ts';
import { show } from './commands/show.ts';
import { submit } from './commands/submit.ts';
import { tokens } from './commands/tokens/index.ts';
import { watch } from './commands/watch.ts';
import { whoami } from './commands/whoami.ts';
import { worker } from './commands/worker.ts';
import { examples } from './help.ts';

/** Every command of `rollway`, wired; cli/index.ts parses the arguments with it. */
export const program = new Command('rollway')
  .description('Batch scans of single-field inflation potentials beyond slow roll')
  .option('--verbose', 'print stack traces of errors')
  .exitOverride()
  .addCommand(loginCommand)
  .addCommand(logoutCommand)
  .addCommand(whoami)
  .addCommand(plan)
  .addCommand(submit)
  .addCommand(scans)
  .addCommand(show)
  .addCommand(watch)
  .addCommand(cancel)
  .addCommand(clone)
  .addCommand(results)
  .addCommand(best)
  .addCommand(tokens)
  .addCommand(admin)
  .addCommand(point)
  .addCommand(families)
  .addCommand(run)
  .addCommand(serveCommand)
  .addCommand(worker)
  .addHelpText('after', `${examples(
    'rollway login --url http://127.0.0.1:4600 --email you@example.org',
    'rollway submit plan.yaml --watch',
    "rollway results 12 --filter 'ns>0.96' --out scan-12.csv",
  )}
Exit codes: 0 ok, 1 operation failed (scan failed, server error or unreachable), 2 usage or
validation error, 3 not signed in or not allowed. Server: ROLLWAY_URL / ROLLWAY_TOKEN, else the
credential stored by rollway login.`);

/** Every command and subcommand throws instead of exiting, so handleError sets the exit code. */
const overrideExits = (command: Command): void => {
  command.exitOverride();
  command.commands.forEach(overrideExits);
};
overrideExits(program);
