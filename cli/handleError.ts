import { CommanderError } from 'commander';
import { RollwayError } from '../shared/errors.ts';

/** Exit codes of every command: 0 success, 1 operation failed, 2 usage or validation error. */
export const EXIT = { ok: 0, failed: 1, usage: 2 } as const;

/** Prints one clear line for an error and sets the exit code; no stack trace unless asked. */
export function handleError(error: unknown, verbose = false): void {
  if (error instanceof CommanderError) {
    // Commander has already printed its message.
    process.exitCode = error.exitCode === 0 ? EXIT.ok : EXIT.usage;
    return;
  }
  if (error instanceof RollwayError) {
    process.stderr.write(`rollway: ${error.message}\n`);
    process.exitCode = error.status < 500 ? EXIT.usage : EXIT.failed;
  } else {
    const message = error instanceof Error ? error.message : String(error);
    process.stderr.write(`rollway: ${message}\n`);
    process.exitCode = EXIT.failed;
  }
  if (verbose && error instanceof Error && error.stack) process.stderr.write(`${error.stack}\n`);
}
