import { spawn, type ChildProcess } from 'node:child_process';
import { sql } from 'drizzle-orm';
import pg from 'pg';
import { pino } from 'pino';
import { TERMINAL_STATES, type ScanView } from '../../shared/api/scans.ts';
import type { Database } from '../../server/db/client.ts';
import { openEmbedded, type Embedded } from '../../server/embedded.ts';

const BIN = new URL('../../cli/bin.mjs', import.meta.url).pathname;

/** A fresh database on the test server, so each test starts with empty tables and an empty queue. */
export async function createDatabase(serverUrl: string, name: string): Promise<string> {
  const client = new pg.Client({ connectionString: serverUrl });
  await client.connect();
  try {
    await client.query(`create database ${name}`);
  } finally {
    await client.end();
  }
  return serverUrl.replace(/\/[^/]*$/, `/${name}`);
}

/** The server's core (database, pg-boss dispatcher, scans service) without HTTP; `workers: 0` computes nothing itself. */
export function openServer(databaseUrl: string, options: { workers?: number; batchSize?: number; batchTimeoutSeconds?: number } = {}): Promise<Embedded> {
  return openEmbedded({
    databaseUrl, workers: options.workers ?? 0, batchSize: options.batchSize ?? 250,
    batchTimeoutSeconds: options.batchTimeoutSeconds ?? 8, logger: pino({ level: 'silent' }),
  });
}

export interface WorkerProcess {
  child: ChildProcess;
  id: string;
  /** Everything the process printed, for failure messages. */
  output(): string;
  /** Resolves with the exit code (or the signal's name). */
  exited: Promise<number | string>;
}

/** `rollway worker` as a real child process; resolves once it has joined the pool. */
export function startWorker(databaseUrl: string, concurrency = 1): Promise<WorkerProcess> {
  const child = spawn(process.execPath, [BIN, 'worker', '--database-url', databaseUrl, '--concurrency', String(concurrency)], {
    env: { ...process.env, LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout!.on('data', (chunk: Buffer) => (out += chunk.toString()));
  child.stderr!.on('data', (chunk: Buffer) => (out += chunk.toString()));
  const exited = new Promise<number | string>((resolve) => child.once('exit', (code, signal) => resolve(code ?? signal ?? 'unknown')));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`worker did not join within 60 s: ${out}`)), 60_000);
    const onData = () => {
      const match = /rollway worker (\S+) joined the pool/.exec(out);
      if (!match) return;
      clearTimeout(timer);
      child.stdout!.off('data', onData);
      resolve({ child, id: match[1]!, output: () => out, exited });
    };
    child.stdout!.on('data', onData);
    void exited.then((code) => {
      clearTimeout(timer);
      reject(new Error(`worker exited with ${code} before joining: ${out}`));
    });
  });
}

export const STAROBINSKY = (title: string, count: number) =>
  `title: ${title}\npotential: { family: starobinsky }\naxes:\n  - { name: pivotEfolds, range: { from: 45, to: 65, count: ${count} } }\n`;

/** Polls the scan until `until` holds or the time runs out (bounded, as every test loop). */
export async function waitForScan(core: Embedded, id: number, timeoutMs: number, until: (s: ScanView) => boolean = (s) => TERMINAL_STATES.has(s.state)): Promise<ScanView> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const view = await core.scans.view(id);
    if (until(view)) return view;
    if (Date.now() > deadline) throw new Error(`scan ${id} still ${view.state} after ${timeoutMs} ms (${view.pointsDone}/${view.pointCount})`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** How many rows the scan has, how many distinct point indices, and their range. */
export async function pointCensus(db: Database, scanId: number): Promise<{ rows: number; distinct: number; first: number; last: number }> {
  const result = (await db.execute(sql`select count(*)::int as rows, count(distinct point_index)::int as distinct,
    min(point_index) as first, max(point_index) as last from point_results where scan_id = ${scanId}`)) as unknown as { rows: Array<{ rows: number; distinct: number; first: number; last: number }> };
  return result.rows[0]!;
}
