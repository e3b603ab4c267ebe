/**
 * Telling a database that is away for a moment (restarting, failing over, a dropped connection)
 * from a real error, so a worker waits and tries the same step again instead of failing a batch.
 */

// SQLSTATE class 08 (connection exception), 57P01–03 (shut down, crashed, starting up),
// 40001 / 40P01 (serialization failure, deadlock: retrying is the documented remedy).
const TRANSIENT_STATES = /^(08...|57P0[123]|40001|40P01)$/;
const TRANSIENT_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', 'EAI_AGAIN', 'EHOSTUNREACH', 'ENETUNREACH']);
// node-postgres reports a socket closed under it by message only.
const TRANSIENT_MESSAGES = /Connection terminated|connection error and is not queryable|timeout exceeded when trying to connect|Client was closed/i;

/** Follows `cause` (drizzle wraps driver errors in "Failed query: …" with the driver's error as cause). */
function* causes(error: unknown): Generator<unknown> {
  for (let e = error, depth = 0; e !== undefined && e !== null && depth < 5; e = (e as { cause?: unknown }).cause, depth++) yield e;
}

export function isTransient(error: unknown): boolean {
  for (const e of causes(error)) {
    const { code, message } = e as { code?: unknown; message?: unknown };
    if (typeof code === 'string' && (TRANSIENT_STATES.test(code) || TRANSIENT_CODES.has(code))) return true;
    if (typeof message === 'string' && TRANSIENT_MESSAGES.test(message)) return true;
    if (e instanceof AggregateError && e.errors.some(isTransient)) return true;
  }
  return false;
}

/** The innermost message: a driver's own words, not drizzle's wrapper that quotes the whole query and its parameters. */
export function rootMessage(error: unknown): string {
  let last: unknown = error;
  for (const e of causes(error)) last = e;
  return last instanceof Error ? last.message : String(last);
}

/**
 * Runs `step` until it succeeds, waiting between tries (250 ms doubling to 2 s) while the error
 * is transient and `giveUpAt` (epoch ms) has not passed; any other error is thrown at once.
 */
export async function retryTransient<T>(step: () => Promise<T>, giveUpAt: number, onRetry?: (error: unknown) => void): Promise<T> {
  for (let wait = 250; ; wait = Math.min(2 * wait, 2000)) {
    try {
      return await step();
    } catch (error) {
      if (!isTransient(error) || Date.now() + wait > giveUpAt) throw error;
      onRetry?.(error);
      await new Promise((resolve) => setTimeout(resolve, wait));
    }
  }
}
