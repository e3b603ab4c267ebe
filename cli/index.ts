import { Command } from 'commander';
import { families } from './commands/families.ts';
import { run } from './commands/run.ts';
import { serveCommand } from './commands/serve.ts';
import { point } from './commands/point.ts';
import { handleError } from './handleError.ts';

const program = new Command('rollway')
  .description('Batch scans of single-field inflation potentials beyond slow roll')
  .option('--verbose', 'print stack traces of errors')
  .exitOverride()
  .addCommand(point)
  .addCommand(families)
  .addCommand(run)
  .addCommand(serveCommand);

for (const command of program.commands) command.exitOverride();

try {
  await program.parseAsync(process.argv);
} catch (error) {
  handleError(error, program.opts<{ verbose?: boolean }>().verbose === true);
}
