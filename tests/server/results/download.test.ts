import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OBSERVABLE_COLUMNS, type Provenance, type ResultRow, type ResultsPage } from '../../../shared/api/results.ts';
import { csvProvenance, csvText } from '../../../server/results/resultsFormat.ts';
import type { NewPointResultRow } from '../../../server/db/schema/pointResults.ts';
import { insertSynthetic, parseCsv, smallPlan, startResultsApp, type ResultsApp } from './resultsHarness.ts';

// Synthetic rows (see resultsHarness.ts): checks the formats, not physics.
let app: ResultsApp;
let scanId: number;
let scan: { planHash: string; physicsVersion: string; title: string };
let rows: NewPointResultRow[];

beforeAll(async () => {
  app = await startResultsApp();
  scanId = await app.submit(smallPlan);
  rows = await insertSynthetic(app, scanId, smallPlan);
  scan = (await (await fetch(`${app.api}/scans/${scanId}`)).json()) as typeof scan;
});
afterAll(() => app.close());

const download = (query: string) => fetch(`${app.api}/scans/${scanId}/download?${query}`);
const apiRows = async (query: string) =>
  ((await (await fetch(`${app.api}/scans/${scanId}/results?limit=5000&${query}`)).json()) as ResultsPage).rows;

function checkProvenance(p: Record<string, unknown>) {
  expect(p).toMatchObject({ scanId, title: scan.title, planHash: scan.planHash, physicsVersion: scan.physicsVersion, boundSet: 'cmb-2018-bmodes-2021', pointCount: 48 });
  expect(new Date(String(p.generatedAt)).getTime()).toBeGreaterThan(Date.now() - 60_000);
}

describe('GET /scans/:id/download', () => {
  it('writes CSV with a provenance block, parameter columns and RFC 4180 quoting', async () => {
    const res = await download('format=csv');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(new RegExp(`^attachment; filename="?scan-${scanId}\\.csv"?$`));
    const text = await res.text();
    const lines = text.split('\r\n');
    const comments = lines.filter((l) => l.startsWith('# '));
    const provenance = Object.fromEntries(comments.map((l) => [l.slice(2, l.indexOf(':')), l.slice(l.indexOf(':') + 2)]));
    checkProvenance({ ...provenance, scanId: Number(provenance.scanId), pointCount: Number(provenance.pointCount) });
    expect(provenance.query).toBe('sort=pointIndex&order=asc');

    const [header, ...data] = parseCsv(lines.slice(comments.length).join('\r\n')).filter((r) => r.length > 1);
    expect(header).toEqual(['pointIndex', 'param.alpha', 'param.pivotEfolds', 'param.V0', 'status', 'reason', ...OBSERVABLE_COLUMNS, 'region', 'computeMs', 'evaluations']);
    expect(data).toHaveLength(48);
    const at = (name: string) => header!.indexOf(name);
    for (const [i, fields] of data.entries()) {
      const row = rows[i]!;
      expect(fields).toHaveLength(header!.length);
      expect(Number(fields[0])).toBe(row.pointIndex);
      expect(Number(fields[at('param.alpha')])).toBe(row.params.alpha);
      expect(fields[at('status')]).toBe(row.status);
      // Failure reasons hold a comma and quotes; they must read back exactly.
      expect(fields[at('reason')]).toBe(row.reason);
      expect(fields[at('ns')]).toBe(row.ns == null ? '' : String(row.ns));
      expect(fields[at('exactNs')]).toBe('');
      expect(fields[at('region')]).toBe(row.region ?? '');
    }
    expect(text).toContain('"only 41.5 e-folds, need ""55"", then some"');
  });

  it('applies the filters and the sort of the table', async () => {
    const text = await (await download('format=csv&status=ok&sort=chi2&order=desc&param.alpha.lte=4')).text();
    const body = parseCsv(text.split('\r\n').filter((l) => !l.startsWith('# ')).join('\r\n')).filter((r) => r.length > 1);
    const want = (await apiRows('status=ok&sort=chi2&order=desc&param.alpha.lte=4')).map((r) => String(r.pointIndex));
    expect(want.length).toBeGreaterThan(5);
    expect(body.slice(1).map((r) => r[0])).toEqual(want);
    expect(text).toContain('# query: param.alpha.lte=4&status=ok&sort=chi2&order=desc');
  });

  it('writes NDJSON: provenance first, then the same rows as the table, one per line', async () => {
    const res = await download('format=ndjson&sort=ns');
    expect(res.headers.get('content-type')).toMatch(/^application\/x-ndjson/);
    expect(res.headers.get('content-disposition')).toMatch(new RegExp(`^attachment; filename="?scan-${scanId}\\.ndjson"?$`));
    const lines = (await res.text()).trimEnd().split('\n').map((l) => JSON.parse(l) as unknown);
    checkProvenance((lines[0] as { provenance: Provenance }).provenance);
    expect(lines.slice(1)).toEqual(await apiRows('sort=ns'));
  });

  it('writes JSON as one document with provenance and rows', async () => {
    const res = await download('format=json&region=inside68');
    expect(res.headers.get('content-disposition')).toMatch(new RegExp(`^attachment; filename="?scan-${scanId}\\.json"?$`));
    const doc = (await res.json()) as { provenance: Provenance; rows: ResultRow[] };
    checkProvenance(doc.provenance);
    expect(doc.rows).toEqual(await apiRows('region=inside68'));
    const empty = (await (await download('format=json&ns.gt=2')).json()) as { rows: ResultRow[] };
    expect(empty.rows).toEqual([]);
  });

  it('refuses a bad query with a JSON 400 before any file starts', async () => {
    for (const [query, field] of [['format=xml', 'format'], ['limit=10', 'limit'], ['sort=param.nope', 'sort']] as const) {
      const res = await download(query);
      expect(res.status, query).toBe(400);
      expect(res.headers.get('content-disposition')).toBeNull();
      expect(((await res.json()) as { error: { field: string } }).error.field).toBe(field);
    }
  });
});

describe('CSV text fields', () => {
  it('quotes only when needed and doubles quotes (RFC 4180)', () => {
    expect(csvText('plain')).toBe('plain');
    expect(csvText('a,b')).toBe('"a,b"');
    expect(csvText('say "hi"')).toBe('"say ""hi"""');
    expect(csvText('two\nlines')).toBe('"two\nlines"');
    expect(csvText('#not a comment')).toBe('"#not a comment"');
    expect(csvText(null)).toBe('');
  });

  it('keeps each provenance value on its own comment line', () => {
    const block = csvProvenance({ scanId: 1, title: 'two\nlines', state: 'completed', pointCount: 1, pointsDone: 1, planHash: 'h', physicsVersion: 'v', boundSet: 'b', query: 'q', generatedAt: 't' });
    expect(block.split('\r\n').filter(Boolean).every((l) => l.startsWith('# '))).toBe(true);
    expect(block).toContain('# title: two lines\r\n');
  });
});
