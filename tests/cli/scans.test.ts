import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { RunningServer } from '../../server/startServer.ts';
import { TEST_ADMIN } from '../helpers/auth.ts';
import { api, startTestServer } from '../helpers/server.ts';
import { cliHome, closedPort, parseCsv, rollway, rollwayOnTty, type CliOptions } from './runCli.ts';

/** The researcher's loop against a real server on an ephemeral port: login → plan check → submit --watch → results → cancel. */

const SMALL_PLAN = `title: CLI loop, E-model
potential: { family: e-model }
axes:
  - name: alpha
    logRange: { from: 0.5, to: 20, count: 6 }
  - name: pivotEfolds
    values: [50, 60]
`;
// 200,000 points: still running (or queued) when the test cancels it a moment later.
const BIG_PLAN = `title: CLI cancel, hilltop
potential: { family: hilltop }
axes:
  - name: mu
    range: { from: 5, to: 50, count: 400 }
  - name: q
    range: { from: 2, to: 8, count: 500 }
pivot: { efolds: 55 }
`;
const BAD_PLAN = `title: ""
potential: { family: hilltop }
axes:
  - name: nu
    range: { from: 1, to: 2, count: 0 }
pivot: { efolds: 55 }
`;

// Each test starts several CLI processes (about a second of CPU each); on a loaded machine that is slow.
vi.setConfig({ testTimeout: 120_000 });

const NO_STACK = /\n\s+at /;
const ESCAPE = '\x1b[';

let server: RunningServer;
let home: Record<string, string>;
let env: CliOptions['env'];
let scanId: number;
const file = (name: string, text: string) => {
  const path = join(home.HOME!, name);
  writeFileSync(path, text);
  return path;
};

beforeAll(async () => {
  server = await startTestServer();
  home = cliHome();
  env = home;
}, 60_000);
afterAll(async () => {
  await server?.stop();
});

describe('rollway against a server: the loop', () => {
  it('signs in, checks a plan locally, submits it, watches it to the end and downloads CSV equal to the API', async () => {
    const login = await rollway(['login', '--url', server.url, '--email', TEST_ADMIN.email, '--password-stdin'], { env, input: `${TEST_ADMIN.password}\n` });
    expect(login.code, login.stderr).toBe(0);
    const plan = file('small.yaml', SMALL_PLAN);
    const check = await rollway(['plan', 'check', plan, '--json'], { env });
    expect(check.code).toBe(0);
    expect(JSON.parse(check.stdout)).toMatchObject({ valid: true, pointCount: 12, issues: [] });

    const submitted = await rollway(['submit', plan, '--watch', '--json'], { env });
    expect(submitted.code, submitted.stderr).toBe(0);
    const done = JSON.parse(submitted.stdout);
    expect(done).toMatchObject({ state: 'completed', pointCount: 12, pointsDone: 12, title: 'CLI loop, E-model' });
    scanId = done.id;
    // Piped: no progress bar and no colour on either stream.
    expect(submitted.stderr).toBe('');

    const csv = await rollway(['results', String(scanId), '--format', 'csv', '--sort', 'ns'], { env });
    expect(csv.code, csv.stderr).toBe(0);
    expect(csv.stdout).toMatch(new RegExp(`^# scanId: ${scanId}\\r\\n`));
    const rows = parseCsv(csv.stdout);
    const { body: page } = await api(server.url, `/scans/${scanId}/results?limit=100&sort=ns`);
    expect(rows.length).toBe(12);
    expect(rows.map((r) => Number(r.pointIndex))).toEqual(page.rows.map((r: any) => r.pointIndex));
    rows.forEach((row, i) => {
      const expected = page.rows[i];
      for (const key of ['ns', 'r', 'alphaS', 'chi2', 'nTotal']) expect(Number(row[key]), key).toBe(expected[key]);
      expect(Number(row['param.alpha'])).toBe(expected.params.alpha);
      expect(row.status).toBe(expected.status);
      expect(row.region).toBe(expected.region ?? '');
    });
  });

  it('filters as ns>X (the API\'s ns.gt=X), sorts descending, prints JSON and NDJSON', async () => {
    const { body: all } = await api(server.url, `/scans/${scanId}/results?limit=100&sort=ns`);
    const cut = all.rows[5].ns as number;
    const [json, ndjson, best] = await Promise.all([
      rollway(['results', String(scanId), '--format', 'json', '--filter', `ns>${cut}`, '--sort', 'r', '--desc'], { env }),
      rollway(['results', String(scanId), '--format', 'ndjson', '--filter', `ns>=${cut}`, '--filter', 'r<1'], { env }),
      rollway(['best', String(scanId), '--json'], { env }),
    ]);
    const { body: api6 } = await api(server.url, `/scans/${scanId}/results?limit=100&ns.gt=${cut}&sort=r&order=desc`);
    const rows = JSON.parse(json.stdout).rows;
    expect(rows.length).toBe(6);
    expect(rows.map((r: any) => r.pointIndex)).toEqual(api6.rows.map((r: any) => r.pointIndex));
    expect(rows.every((r: any) => r.ns > cut)).toBe(true);
    const lines = ndjson.stdout.trim().split('\n').map((l) => JSON.parse(l));
    expect(lines[0].provenance.query).toContain(`ns.gte=${cut}`);
    expect(lines.length - 1).toBe(7);
    const { body: summary } = await api(server.url, `/scans/${scanId}/summary`);
    expect(JSON.parse(best.stdout)).toEqual({ scanId, total: 12, byRegion: summary.byRegion, best: summary.best });
  });

  it('lists and shows scans, as tables and as JSON', async () => {
    const [table, list, show, plan] = await Promise.all([
      rollway(['scans'], { env }),
      rollway(['scans', '--json'], { env }),
      rollway(['show', String(scanId), '--json'], { env }),
      rollway(['show', String(scanId), '--plan'], { env }),
    ]);
    expect(table.stdout).toMatch(/^ID\s+TITLE\s+STATE\s+PROGRESS\s+OWNER\s+CREATED\n/);
    expect(table.stdout).toMatch(new RegExp(`\\n\\s*${scanId}\\s+CLI loop, E-model\\s+completed\\s+12/12 100%`));
    expect(table.stdout).not.toContain(ESCAPE);
    expect(JSON.parse(list.stdout).map((s: any) => s.id)).toContain(scanId);
    expect(JSON.parse(show.stdout)).toMatchObject({ id: scanId, state: 'completed', planText: SMALL_PLAN });
    expect(plan.stdout).toBe(SMALL_PLAN);
  });

  it('cancels a running scan and reports the stored points; a finished one cannot be cancelled (exit 1)', async () => {
    const submitted = await rollway(['submit', file('big.yaml', BIG_PLAN), '--json'], { env });
    const big = JSON.parse(submitted.stdout);
    expect(big.pointCount).toBe(200_000);
    expect(['queued', 'running']).toContain(big.state);
    const [cancelled, watched] = await Promise.all([
      rollway(['cancel', String(big.id)], { env }),
      rollway(['watch', String(big.id)], { env }),
    ]);
    expect(cancelled.code, cancelled.stderr).toBe(0);
    expect(cancelled.stdout).toMatch(new RegExp(`^scan ${big.id} cancelled; [\\d,]+/200,000 points are stored\\n$`));
    // watch follows it to its final state and exits 1, since it did not complete.
    expect(watched.stdout).toMatch(new RegExp(`^scan ${big.id} "CLI cancel, hilltop" cancelled: `));
    expect(watched.code).toBe(1);
    const again = await rollway(['cancel', String(scanId)], { env });
    expect(again.code).toBe(1);
    expect(again.stderr).toMatch(/only queued or running scans can be cancelled/);
  });

  it('clones a scan: same plan, new id', async () => {
    const out = await rollway(['clone', String(scanId), '--json'], { env });
    const copy = JSON.parse(out.stdout);
    expect(copy.id).not.toBe(scanId);
    expect(copy).toMatchObject({ planText: SMALL_PLAN, pointCount: 12 });
  });
});

describe('rollway against a server: errors and exit codes', () => {
  it('names every problem of an invalid plan with its field path, locally and from the server (exit 2)', async () => {
    const bad = file('bad.yaml', BAD_PLAN);
    const [local, remote] = await Promise.all([rollway(['plan', 'check', bad], { env }), rollway(['submit', bad], { env })]);
    for (const out of [local, remote]) {
      expect(out.code).toBe(2);
      expect(out.stderr).toMatch(/3 problems/);
      expect(out.stderr).toMatch(/\n {2}title: must not be blank/);
      expect(out.stderr).toMatch(/\n {2}axes\[0\]\.range\.count: must be a whole number from 1 to 100000/);
      expect(out.stderr).toMatch(/\n {2}axes\[0\]\.name: "nu" is not a parameter .*allowed: V0, mu, q, pivotEfolds/);
      expect(out.stderr).not.toMatch(NO_STACK);
    }
    const { body } = await api(server.url, '/scans');
    expect(body.scans.some((s: any) => s.title === '')).toBe(false);
  });

  it('exits 1 for an unknown scan, 2 for bad arguments and filters, each with one clear line', async () => {
    const cases: Array<[string[], number, RegExp]> = [
      [['show', '999999'], 1, /^rollway: scan 999999 does not exist\n$/],
      [['watch', '999999'], 1, /^rollway: scan 999999 does not exist\n$/],
      [['show', 'abc'], 2, /^rollway: ID: "abc" is not an id/],
      [['results', String(scanId), '--filter', 'ns~1'], 2, /--filter: "ns~1" is not of the form <column><op><number>/],
      [['results', String(scanId), '--filter', 'nss>1'], 2, /nss\.gt: unknown column "nss"/],
      [['results', String(scanId), '--format', 'xml'], 2, /argument 'xml' is invalid. Allowed choices are csv, json, ndjson/],
      [['submit', join(home.HOME!, 'missing.yaml')], 2, /FILE: cannot read ".*missing.yaml" \(no such file\)/],
    ];
    const runs = await Promise.all(cases.map(([args]) => rollway(args, { env })));
    runs.forEach((out, i) => {
      const [args, code, message] = cases[i]!;
      expect(out.code, args.join(' ')).toBe(code);
      expect(out.stderr, args.join(' ')).toMatch(message);
      expect(out.stderr).not.toMatch(NO_STACK);
    });
  });

  it('says in one line that the server is down (exit 1), and prints the stack only with --verbose', async () => {
    const down = { ...home, ROLLWAY_URL: `http://127.0.0.1:${await closedPort()}` };
    const [plain, verbose] = await Promise.all([rollway(['scans'], { env: down }), rollway(['--verbose', 'scans'], { env: down })]);
    expect(plain.code).toBe(1);
    expect(plain.stderr).toMatch(/^rollway: cannot reach the server at http:\/\/127\.0\.0\.1:\d+ \(connection refused\); is the server running\? Check the URL .*\n$/);
    expect(verbose.code).toBe(1);
    expect(verbose.stderr).toMatch(NO_STACK);
  });

  it('without any server configured, says how to sign in (exit 3)', async () => {
    const out = await rollway(['scans'], { env: cliHome() });
    expect(out.code).toBe(3);
    expect(out.stderr).toMatch(/^rollway: not signed in: run rollway login --url URL --email E, or set ROLLWAY_URL/);
  });
});

describe('rollway against a server: terminal behaviour', () => {
  it('draws the progress bar and colours on a terminal only, and honours NO_COLOR', async () => {
    const id = String(scanId);
    const [watchTty, scansTty, scansNoColour, saved, savedPiped] = await Promise.all([
      rollwayOnTty(['watch', id], { env }),
      rollwayOnTty(['scans'], { env }),
      rollwayOnTty(['scans'], { env: { ...env, NO_COLOR: '1' } }),
      rollwayOnTty(['results', id, '--out', join(home.HOME!, 'tty.csv')], { env }),
      rollway(['results', id, '--out', join(home.HOME!, 'piped.csv')], { env }),
    ]);
    expect(watchTty.code).toBe(0);
    expect(watchTty.stdout).toMatch(/\r\x1b\[2K█{24} 100% {2}12\/12 points .*completed/);
    expect(watchTty.stdout).toMatch(/scan \d+ "CLI loop, E-model" completed: 12\/12 points/);
    expect(scansTty.stdout).toContain(`${ESCAPE}32mcompleted${ESCAPE}0m`);
    expect(scansNoColour.stdout).toMatch(/completed/);
    expect(scansNoColour.stdout).not.toContain(ESCAPE);
    expect(saved.stdout).toMatch(/12\/12 rows/);
    expect(savedPiped.code).toBe(0);
    expect(savedPiped.stderr).toBe('');
    expect(savedPiped.stdout).toBe('');
  });
});
