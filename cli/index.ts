import { Command } from 'commander';
import { demo } from './commands/demo.ts';
import { point } from './commands/point.ts';
import { handleError } from './handleError.ts';

const program = new Command('rollway')
  .description('Batch scans of single-field inflation potentials beyond slow roll')
  .option('--verbose', 'print stack traces of errors')
  .exitOverride()
  .addCommand(point)
  .addCommand(demo);

for (const command of program.commands) command.exitOverride();

try {
  await program.parseAsync(process.argv);
} catch (error) {
  handleError(error, program.opts<{ verbose?: boolean }>().verbose === true);
}
