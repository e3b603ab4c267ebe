/**
 * Where batches get computed. The local implementation runs a piscina pool in this process; the
 * scale-out one hands batches to pg-boss workers on other machines. Routes and services only
 * see this interface.
 */
export interface Dispatcher {
  /** Starts taking work (after a restart this resumes every unfinished batch). */
  start(): Promise<void>;
  /** New work was stored: look for it now instead of at the next poll. */
  notify(): void;
  /** Abandons the batches of this scan that are computing now; their points stay pending. */
  cancel(scanId: number): void;
  /** Stops taking work and waits for batches in flight to be written. */
  stop(): Promise<void>;
}
