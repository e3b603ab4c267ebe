import { once } from 'node:events';
import type { AddressInfo } from 'node:net';
import type { PGlite } from '@electric-sql/pglite';
import { getTableColumns } from 'drizzle-orm';
import { toSnakeCase } from 'drizzle-orm/casing';
import { pino } from 'pino';
import { openAccounts } from '../../../server/accounts/openAccounts.ts';
import { createApp } from '../../../server/app.ts';
import { loadConfig } from '../../../server/config.ts';
import { createMailer } from '../../../server/mail/mailer.ts';
import { attachCredential, signIn, TEST_ADMIN, TEST_ADMIN_ENV } from '../../helpers/auth.ts';
import { openDatabase, type Database } from '../../../server/db/client.ts';
import { pointResults, type NewPointResultRow } from '../../../server/db/schema/pointResults.ts';
import { resultsRouter } from '../../../server/results/resultsRouter.ts';
import { ScanEvents } from '../../../server/scans/scanEvents.ts';
import { createScansService } from '../../../server/scans/scansService.ts';
import { createPointSource } from '../../../shared/plan/expandPlan.ts';
import type { ScanPlanInput } from '../../../shared/plan/scanPlan.ts';
import { validatePlan } from '../../../shared/plan/validatePlan.ts';

/**
 * The real app on an ephemeral port over a real in-memory PGlite, with no compute: scans are
 * submitted through the API and their point_results rows are SYNTHETIC, inserted directly. These
 * tests check the API's plumbing (paging, filters, formats), not physics.
 */
export interface ResultsApp {
  db: Database;
  pglite: PGlite;
  /** Base URL of the API, ending in /api/v1. */
  api: string;
  submit(plan: ScanPlanInput): Promise<number>;
  close(): Promise<void>;
}

export async function startResultsApp(): Promise<ResultsApp> {
  const handle = await openDatabase({});
  const events = new ScanEvents();
  const scans = createScansService({ db: handle.db, events, batchSize: 1000, onSubmitted: () => {} });
  const logger = pino({ level: 'silent' });
  const config = loadConfig({ DATA_DIR: 'memory://', ROLLWAY_MAIL: 'off', ...TEST_ADMIN_ENV });
  const accounts = await openAccounts(handle.db, config, await createMailer(config.mail, logger), logger);
  const app = createApp({ db: handle.db, logger, scans, events, accounts, scanFeatures: [resultsRouter(handle.db)] });
  const server = app.listen(0, '127.0.0.1');
  // Longer than any test here. The test's fetch and this server share one event loop, and
  // inserting 200,000 rows keeps it busy for about a minute: past startServer's 65 s, the
  // server's keep-alive timer and the client's idle timer (a second or two earlier) both expire
  // while it is blocked, and the next request can go out on the socket the server closes next
  // (ECONNRESET, seen once after a 65.5 s insert). Across processes the client closes first.
  server.keepAliveTimeout = 600_000;
  await once(server, 'listening');
  const origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const api = `${origin}/api/v1`;
  // The plumbing under test is paging and formats; requests go signed in as the admin.
  attachCredential(origin, await signIn(origin, TEST_ADMIN.email, TEST_ADMIN.password));
  return {
    db: handle.db,
    pglite: handle.pglite!,
    api,
    async submit(plan) {
      const res = await fetch(`${api}/scans`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ plan }) });
      if (res.status !== 201) throw new Error(`submit failed: ${res.status} ${await res.text()}`);
      return ((await res.json()) as { id: number }).id;
    },
    async close() {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await handle.close();
    },
  };
}

/** A small e-model grid: 8 alpha × 6 N_* = 48 points, V0 fixed. */
export const smallPlan: ScanPlanInput = {
  title: 'Results API test, "quoted", with commas',
  potential: { family: 'e-model' },
  fixed: { V0: 1 },
  axes: [
    { name: 'alpha', values: [0.5, 1, 2, 4, 8, 16, 32, 64] },
    { name: 'pivotEfolds', range: { from: 50, to: 60, count: 6 } },
  ],
};

/** A grid of `nAlpha` × `nEfolds` points, for the scale tests. */
export const gridPlan = (nAlpha: number, nEfolds: number): ScanPlanInput => ({
  title: `Results API scale test, ${nAlpha * nEfolds} points`,
  potential: { family: 'e-model' },
  axes: [
    { name: 'alpha', logRange: { from: 0.01, to: 100, count: nAlpha } },
    { name: 'pivotEfolds', range: { from: 50, to: 61, count: nEfolds } },
  ],
});

const REGIONS = ['inside68', 'inside95', 'outside'] as const;

/**
 * Synthetic row i: every 7th point fails (NULL observables, a reason with a comma and quotes);
 * ns and r take few values so sorts and filters meet many ties; chi2 is distinct per point; the
 * rest are full-precision doubles, so a download is as long as a real one.
 */
export function syntheticRow(scanId: number, pointIndex: number, params: Record<string, number>): NewPointResultRow {
  const failed = pointIndex % 7 === 3;
  const jitter = Math.sin(pointIndex + 1);
  const chi2 = failed ? null : ((pointIndex * 37) % 101) + pointIndex / 1e6;
  const v = (x: number) => (failed ? null : x);
  return {
    scanId, pointIndex, params,
    status: failed ? 'too_few_efolds' : 'ok',
    reason: failed ? 'only 41.5 e-folds, need "55", then some' : '',
    nTotal: v(60 + pointIndex + jitter), nPivot: params.pivotEfolds ?? 55, phiStart: v(6 + jitter), phiEnd: v(0.9 + jitter / 10),
    phiPivot: v(5.4 + jitter), deltaPhi: v(4.5 + jitter),
    eps1: v(1e-4 * (1 + (pointIndex % 11))), eps2: v(0.03 * (1 + jitter / 7)), eps3: v(0.03 * (1 - jitter / 9)),
    ns: v(0.95 + 0.005 * (pointIndex % 5)), r: v(0.001 * (pointIndex % 13)), nt: v(-0.0002 * (1 + jitter / 3)), alphaS: v(-0.0006 * (1 + jitter / 5)),
    As: v(2.1e-9 * (1 + jitter / 11)), amplitude: v(1e-10 * (2 + jitter)), energyScaleGeV: v(1e16 * (2 + jitter)), hubbleGeV: v(1e13 * (2 + jitter)),
    chi2, region: chi2 === null ? null : REGIONS[Math.min(2, Math.floor(chi2 / 34))]!,
    computeMs: 0.25 + (pointIndex % 3) + Math.abs(jitter), evaluations: 3000 + pointIndex,
  };
}

const COLUMNS = Object.entries(getTableColumns(pointResults)).map(([key, c]) => ({ key, name: c.keyAsName ? toSnakeCase(c.name) : c.name }));

/**
 * Inserts synthetic rows for every point of the plan in parameterised multi-row INSERTs of
 * `chunk` rows (1000 × 32 columns: PGlite refused 2000 × 32, past 32767 bound parameters);
 * returns them unless `keep` is false (200k rows need not sit in the test's memory).
 * Plain SQL rather than drizzle's insert builder: building the statement was measured at about
 * 0.35 ms per row here, two thirds of the time, and the 200k-row test has a time budget.
 */
export async function insertSynthetic(app: ResultsApp, scanId: number, plan: ScanPlanInput, keep = true, chunk = 1000): Promise<NewPointResultRow[]> {
  const source = createPointSource(validatePlan(plan));
  const all: NewPointResultRow[] = [];
  const statement = (n: number) => `insert into point_results (${COLUMNS.map((c) => c.name).join(', ')}) values ` +
    Array.from({ length: n }, (_, r) => `(${COLUMNS.map((_, c) => `$${r * COLUMNS.length + c + 1}`).join(', ')})`).join(', ');
  const full = statement(chunk);
  for (let first = 0; first < source.count; first += chunk) {
    const n = Math.min(chunk, source.count - first);
    const values: unknown[] = [];
    for (let i = first; i < first + n; i++) {
      const row = syntheticRow(scanId, i, { ...source.requestAt(i).params, ...source.valuesAt(i) });
      for (const { key } of COLUMNS) {
        const v = (row as Record<string, unknown>)[key];
        values.push(key === 'params' ? JSON.stringify(v) : v ?? null);
      }
      if (keep) all.push(row);
    }
    await app.pglite.query(n === chunk ? full : statement(n), values);
  }
  return all;
}

/** A minimal RFC 4180 reader (quoted fields, doubled quotes, CRLF), for reading downloads back. */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let field = '';
  let row: string[] = [];
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i]!;
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') (field += '"'), i++;
      else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') row.push(field), (field = '');
    else if (ch === '\n') row.push(field.replace(/\r$/, '')), rows.push(row), (row = []), (field = '');
    else field += ch;
  }
  if (field !== '' || row.length > 0) row.push(field), rows.push(row);
  return rows;
}
