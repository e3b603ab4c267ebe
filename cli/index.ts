import { handleError } from './handleError.ts';
import { program } from './program.ts';

try {
  await program.parseAsync(process.argv);
} catch (error) {
  handleError(error, program.opts<{ verbose?: boolean }>().verbose === true);
}
