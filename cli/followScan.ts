import type { ApiClient } from '../shared/api/client.ts';
import type { ScanView } from '../shared/api/scans.ts';
import { progressLine, scanSummary } from './scanOutput.ts';
import { liveLine } from './terminal.ts';
import { printJson } from './output.ts';
import { EXIT } from './handleError.ts';

/**
 * Follows a scan through the server-sent events until it is done, with a live bar on stderr when
 * that is a terminal. Ctrl-C stops watching, not the scan. Returns the last state seen, or
 * undefined when interrupted.
 */
export async function followScan(client: ApiClient, id: number): Promise<ScanView | undefined> {
  const line = liveLine(process.stderr);
  const stop = new AbortController();
  const onInterrupt = () => stop.abort();
  process.once('SIGINT', onInterrupt);
  let last: ScanView | undefined;
  try {
    for await (const view of client.scans.events(id, stop.signal)) {
      last = view;
      line.draw(progressLine(view));
    }
    return last;
  } catch (error) {
    if (!stop.signal.aborted) throw error;
    line.done();
    process.stderr.write(`rollway: stopped watching; scan ${id} goes on on the server (rollway watch ${id} follows it again)\n`);
    process.exitCode = 130;
    return undefined;
  } finally {
    line.done();
    process.off('SIGINT', onInterrupt);
  }
}

/** Follows, then prints the finished scan (summary or JSON); exit 1 unless it completed. */
export async function followAndReport(client: ApiClient, id: number, json: boolean): Promise<void> {
  const done = await followScan(client, id);
  if (done === undefined) return;
  if (json) printJson(done);
  else process.stdout.write(`${scanSummary(done)}\n`);
  if (done.state !== 'completed') process.exitCode = EXIT.failed;
}
