import { CommanderError } from 'commander';
import { ApiError } from '../shared/api/client.ts';
import { RollwayError } from '../shared/errors.ts';

/**
 * Exit codes of every command: 0 success, 1 operation failed (a scan failed, the server failed or
 * cannot be reached), 2 usage or validation error, 3 not signed in or not allowed.
 */
export const EXIT = { ok: 0, failed: 1, usage: 2, denied: 3 } as const;

/** By HTTP status: 401/403 denied, other 4xx the caller's input, except a missing or busy thing. */
export function exitCodeFor(status: number): number {
  if (status === 401 || status === 403) return EXIT.denied;
  if (status === 0 || status >= 500 || status === 404 || status === 409 || status === 429) return EXIT.failed;
  return status >= 400 ? EXIT.usage : EXIT.failed;
}

/** What to do next, after the server's own message. */
function hint(error: ApiError): string {
  if (error.status === 0) return '; is the server running? Check the URL (rollway login --url, or ROLLWAY_URL)';
  if (error.status === 401) {
    return process.env.ROLLWAY_TOKEN
      ? '; the server does not accept the credential in ROLLWAY_TOKEN: make a new token (rollway tokens create) or unset it'
      : '; sign in again with rollway login --url URL --email E';
  }
  if (error.status === 403) return '; ask an admin if you need this';
  if (error.status === 429) return '; wait a moment and try again';
  if (error.status >= 500) return '; try again later, or ask the server\'s admin to look at its log';
  return '';
}

/** Prints one clear line for an error and sets the exit code; no stack trace unless asked. */
export function handleError(error: unknown, verbose = false): void {
  if (error instanceof CommanderError) {
    // Commander has already printed its message.
    process.exitCode = error.exitCode === 0 ? EXIT.ok : EXIT.usage;
    return;
  }
  if (error instanceof ApiError) {
    const prefix = error.status === 401 ? 'not signed in: ' : error.status === 403 ? 'not allowed: ' : error.status >= 500 ? 'server error: ' : '';
    // An invalid plan: the server's first line, then every problem with its field path.
    const message = error.issues.length > 0
      ? [error.message.split('\n')[0], ...error.issues.map((i) => `  ${i.path === '' ? '' : `${i.path}: `}${i.message}`)].join('\n')
      : error.message;
    process.stderr.write(`rollway: ${prefix}${message}${hint(error)}\n`);
    process.exitCode = exitCodeFor(error.status);
  } else if (error instanceof RollwayError) {
    process.stderr.write(`rollway: ${error.message}\n`);
    // Ctrl-C at a prompt ends like any interrupted command (128 + SIGINT).
    process.exitCode = error.code === 'interrupted' ? 130 : exitCodeFor(error.status);
  } else {
    const message = error instanceof Error ? error.message : String(error);
    process.stderr.write(`rollway: ${message}\n`);
    process.exitCode = EXIT.failed;
  }
  if (verbose && error instanceof Error && error.stack) process.stderr.write(`${error.stack}\n`);
}
