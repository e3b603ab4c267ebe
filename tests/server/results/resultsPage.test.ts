import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ResultRow, ResultsPage } from '../../../shared/api/results.ts';
import type { NewPointResultRow } from '../../../server/db/schema/pointResults.ts';
import { insertSynthetic, smallPlan, startResultsApp, type ResultsApp } from './resultsHarness.ts';

// Synthetic rows (see resultsHarness.ts): API plumbing, not physics.
let app: ResultsApp;
let scanId: number;
let rows: NewPointResultRow[];

beforeAll(async () => {
  app = await startResultsApp();
  scanId = await app.submit(smallPlan);
  rows = await insertSynthetic(app, scanId, smallPlan);
});
afterAll(() => app.close());

const get = async (query: string) => {
  const res = await fetch(`${app.api}/scans/${scanId}/results?${query}`);
  return { status: res.status, body: (await res.json()) as ResultsPage & { error: { code: string; message: string; field?: string } } };
};
const indices = (page: { rows: ResultRow[] }) => page.rows.map((r) => r.pointIndex);

type Key = (r: NewPointResultRow) => number | null | undefined;
/** The order the API promises: by the key, NULLs last, ties by pointIndex, both in `dir`. */
function expected(key: Key, dir: 1 | -1, keep: (r: NewPointResultRow) => boolean = () => true): number[] {
  return rows.filter(keep).sort((a, b) => {
    const x = key(a) ?? null;
    const y = key(b) ?? null;
    if (x !== y) return x === null ? 1 : y === null ? -1 : dir * (x - y);
    return dir * (a.pointIndex - b.pointIndex);
  }).map((r) => r.pointIndex);
}

async function walkCursor(query: string): Promise<{ order: number[]; pages: number; totals: Set<number> }> {
  const order: number[] = [];
  const totals = new Set<number>();
  let cursor: string | null = null;
  let pages = 0;
  do {
    const { status, body } = await get(`${query}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`);
    expect(status).toBe(200);
    order.push(...indices(body));
    totals.add(body.total);
    cursor = body.nextCursor;
    pages++;
  } while (cursor !== null && pages < 100);
  return { order, pages, totals };
}

describe('GET /scans/:id/results', () => {
  it('answers the first page in pointIndex order with camelCase rows and params as an object', async () => {
    const { status, body } = await get('');
    expect(status).toBe(200);
    expect(body.total).toBe(48);
    expect(body.nextCursor).toBeNull();
    expect(indices(body)).toEqual(rows.map((r) => r.pointIndex));
    const first = body.rows[0]!;
    expect(first.params).toEqual({ V0: 1, alpha: 0.5, pivotEfolds: 50 });
    expect(first).toMatchObject({ status: 'ok', reason: '', ns: 0.95, exactNs: null, region: 'inside68', evaluations: 3000 });
    // Internal columns stay out of the API.
    expect(Object.keys(first)).not.toContain('scanId');
    expect(Object.keys(first)).not.toContain('pointKey');
  });

  it('pages with offset across a sort with ties and NULLs, without duplicates or gaps', async () => {
    for (const dir of [1, -1] as const) {
      const seen: number[] = [];
      for (let offset = 0; offset < 48; offset += 5) {
        const { body } = await get(`sort=ns&order=${dir === 1 ? 'asc' : 'desc'}&limit=5&offset=${offset}`);
        seen.push(...indices(body));
      }
      expect(seen).toEqual(expected((r) => r.ns, dir));
    }
  });

  it('pages with a cursor through every sort, ties and NULL sections included', async () => {
    const sorts: [string, Key][] = [
      ['ns', (r) => r.ns], ['chi2', (r) => r.chi2], ['pointIndex', (r) => r.pointIndex],
      ['param.alpha', (r) => r.params.alpha], ['param.pivotEfolds', (r) => r.params.pivotEfolds], ['evaluations', (r) => r.evaluations],
    ];
    for (const [sort, key] of sorts) {
      for (const dir of [1, -1] as const) {
        const walk = await walkCursor(`sort=${sort}&order=${dir === 1 ? 'asc' : 'desc'}&limit=7`);
        expect(walk.order, `${sort} ${dir}`).toEqual(expected(key, dir));
        expect(walk.pages).toBe(7);
        expect([...walk.totals]).toEqual([48]);
      }
    }
  });

  it('keeps a cursor within its filter and ends with nextCursor null', async () => {
    const walk = await walkCursor('sort=ns&order=desc&limit=4&status=ok&ns.gte=0.96');
    const keep = (r: NewPointResultRow) => r.status === 'ok' && (r.ns ?? -1) >= 0.96;
    expect(walk.order).toEqual(expected((r) => r.ns, -1, keep));
    expect([...walk.totals]).toEqual([rows.filter(keep).length]);
  });

  it('applies every filter operator to columns and parameters', async () => {
    const cases: [string, (r: NewPointResultRow) => boolean][] = [
      ['ns.gt=0.96', (r) => r.ns != null && r.ns > 0.96],
      ['ns.gte=0.96', (r) => r.ns != null && r.ns >= 0.96],
      ['ns.lt=0.96', (r) => r.ns != null && r.ns < 0.96],
      ['ns.lte=0.96', (r) => r.ns != null && r.ns <= 0.96],
      ['ns.eq=0.95', (r) => r.ns === 0.95],
      ['chi2.lt=20&r.gte=0.005', (r) => r.chi2 != null && r.chi2 < 20 && r.r != null && r.r >= 0.005],
      ['pointIndex.lt=10', (r) => r.pointIndex < 10],
      ['evaluations.gte=3040', (r) => (r.evaluations ?? 0) >= 3040],
      ['param.alpha.eq=4', (r) => r.params.alpha === 4],
      ['param.pivotEfolds.gte=56&param.alpha.lte=2', (r) => r.params.pivotEfolds! >= 56 && r.params.alpha! <= 2],
      ['status=too_few_efolds', (r) => r.status === 'too_few_efolds'],
      ['status=ok,too_few_efolds', () => true],
      ['region=inside68,outside', (r) => r.region === 'inside68' || r.region === 'outside'],
      ['region=inside95&ns.gt=0.955', (r) => r.region === 'inside95' && r.ns != null && r.ns > 0.955],
    ];
    for (const [query, keep] of cases) {
      const { status, body } = await get(`${query}&limit=100`);
      expect(status, query).toBe(200);
      const want = rows.filter(keep).map((r) => r.pointIndex);
      expect(indices(body), query).toEqual(want);
      expect(body.total, query).toBe(want.length);
    }
  });

  it('answers 400 naming the query parameter and the allowed values', async () => {
    const cases: [string, string, RegExp][] = [
      ['foo.gt=1', 'foo.gt', /unknown column "foo".*pointIndex, nTotal.*chi2.*param\.<name>/],
      ['ns.between=1', 'ns.between', /unknown operator "between"; use one of gt, gte, lt, lte, eq/],
      ['ns.gt=abc', 'ns.gt', /must be a finite number.*"abc"/],
      ['ns.gt=', 'ns.gt', /must be a finite number/],
      ['ns.gt=1&ns.gt=2', 'ns.gt', /given once/],
      ['pointIndex.gt=2.5', 'pointIndex.gt', /whole number/],
      ['param.beta.gt=1', 'param.beta.gt', /no parameter "beta"; its parameters are alpha, pivotEfolds, V0/],
      ['limit=0', 'limit', /whole number from 1 to 5000/],
      ['limit=5001', 'limit', /whole number from 1 to 5000/],
      ['limit=ten', 'limit', /whole number from 1 to 5000/],
      ['offset=-1', 'offset', /whole number/],
      ['sort=bogus', 'sort', /unknown column "bogus"; sort by one of pointIndex/],
      ['sort=param.beta', 'sort', /no parameter "beta"/],
      ['order=up', 'order', /one of asc, desc/],
      ['status=ok,bogus', 'status', /unknown value "bogus"; use a comma list of ok, no_inflation/],
      ['region=inside99', 'region', /inside68, inside95, outside/],
      ['cursor=garbage', 'cursor', /not a cursor/],
      ['offset=5&cursor=x', 'cursor', /offset or cursor, not both/],
      ['sotr=ns', 'sotr', /unknown query parameter "sotr"; use .*sort/],
    ];
    for (const [query, field, message] of cases) {
      const { status, body } = await get(query);
      expect(status, query).toBe(400);
      expect(body.error.field, query).toBe(field);
      expect(body.error.message, query).toMatch(message);
    }
  });

  it('refuses a cursor made for another sort', async () => {
    const { body } = await get('sort=ns&limit=5');
    const reused = await get(`sort=chi2&limit=5&cursor=${encodeURIComponent(body.nextCursor!)}`);
    expect(reused.status).toBe(400);
    expect(reused.body.error).toMatchObject({ field: 'cursor', message: expect.stringMatching(/belongs to sort=ns&order=asc/) });
  });

  it('answers 404 for a scan that does not exist and 400 for an id that is not one', async () => {
    for (const path of ['results', 'summary', 'download', 'heatmap?x=alpha&y=pivotEfolds&value=ns']) {
      const res = await fetch(`${app.api}/scans/99999/${path}`);
      expect(res.status, path).toBe(404);
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('not_found');
    }
    const bad = await fetch(`${app.api}/scans/abc/results`);
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { field: string } }).error.field).toBe('id');
  });
});
