import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OBSERVABLE_COLUMNS, type Heatmap, type ResultsSummary } from '../../../shared/api/results.ts';
import type { NewPointResultRow } from '../../../server/db/schema/pointResults.ts';
import { insertSynthetic, smallPlan, startResultsApp, type ResultsApp } from './resultsHarness.ts';

// Synthetic rows (see resultsHarness.ts): the numbers are checked against a direct computation
// over the same rows, not against physics.
let app: ResultsApp;
let scanId: number;
let rows: NewPointResultRow[];

beforeAll(async () => {
  app = await startResultsApp();
  scanId = await app.submit(smallPlan);
  rows = await insertSynthetic(app, scanId, smallPlan);
});
afterAll(() => app.close());

const get = async <T>(path: string) => {
  const res = await fetch(`${app.api}/scans/${scanId}/${path}`);
  return { status: res.status, body: (await res.json()) as T & { error: { field?: string; message: string } } };
};
const RANK = ['inside68', 'inside95', 'outside'] as const;

describe('GET /scans/:id/summary', () => {
  it('counts statuses and regions and gives min, max and mean over ok points', async () => {
    const { status, body } = await get<ResultsSummary>('summary');
    expect(status).toBe(200);
    const ok = rows.filter((r) => r.status === 'ok');
    expect(body.total).toBe(48);
    expect(body.byStatus).toEqual({ ok: ok.length, no_inflation: 0, too_few_efolds: 48 - ok.length, never_ends: 0, negative_potential: 0, solver_failed: 0 });
    expect(body.byRegion).toEqual({
      inside68: rows.filter((r) => r.region === 'inside68').length,
      inside95: rows.filter((r) => r.region === 'inside95').length,
      outside: rows.filter((r) => r.region === 'outside').length,
      unscored: rows.filter((r) => r.region == null).length,
    });
    for (const name of OBSERVABLE_COLUMNS) {
      const values = ok.map((r) => r[name]).filter((v): v is number => typeof v === 'number');
      const stats = body.observables[name];
      expect(stats.count, name).toBe(values.length);
      if (values.length === 0) {
        expect(stats, name).toEqual({ min: null, max: null, mean: null, count: 0 });
        continue;
      }
      expect(stats.min, name).toBe(Math.min(...values));
      expect(stats.max, name).toBe(Math.max(...values));
      // Summation order differs between PostgreSQL and here, so the mean agrees to rounding only.
      const mean = values.reduce((a, b) => a + b, 0) / values.length;
      expect(Math.abs(stats.mean! - mean), name).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(mean)));
    }
  });

  it('lists the ten lowest-chi2 ok points as full rows', async () => {
    const { body } = await get<ResultsSummary>('summary');
    const want = rows.filter((r) => r.status === 'ok' && r.chi2 != null)
      .sort((a, b) => a.chi2! - b.chi2! || a.pointIndex - b.pointIndex).slice(0, 10);
    expect(body.best.map((r) => r.pointIndex)).toEqual(want.map((r) => r.pointIndex));
    expect(body.best[0]).toMatchObject({ chi2: want[0]!.chi2, params: want[0]!.params, status: 'ok' });
  });
});

describe('GET /scans/:id/heatmap', () => {
  it('grids an observable over two axes with the region of each cell', async () => {
    const { status, body } = await get<Heatmap>('heatmap?x=alpha&y=pivotEfolds&value=ns');
    expect(status).toBe(200);
    expect(body.x).toEqual([0.5, 1, 2, 4, 8, 16, 32, 64]);
    expect(body.y).toEqual([50, 52, 54, 56, 58, 60]);
    expect(body.values).toHaveLength(6);
    for (const [iy, y] of body.y.entries()) {
      expect(body.values[iy]).toHaveLength(8);
      for (const [ix, x] of body.x.entries()) {
        // One point per cell here: the cell is that point (its ns only when it is ok).
        const point = rows.find((r) => r.params.alpha === x && r.params.pivotEfolds === y)!;
        expect(body.values[iy]![ix]).toBe(point.status === 'ok' ? point.ns : null);
        expect(body.region[iy]![ix]).toBe(point.region ?? null);
      }
    }
  });

  it('aggregates mean, min, max and count over the points of a cell, ok points only', async () => {
    // V0 is fixed, so (alpha, V0) cells each hold the 6 points of one alpha.
    const cell = (alpha: number) => rows.filter((r) => r.params.alpha === alpha);
    for (const agg of ['mean', 'min', 'max', 'count'] as const) {
      const { body } = await get<Heatmap>(`heatmap?x=alpha&y=V0&value=chi2&agg=${agg}`);
      expect(body.y).toEqual([1]);
      body.x.forEach((alpha, ix) => {
        const values = cell(alpha).filter((r) => r.status === 'ok').map((r) => r.chi2!);
        const want = agg === 'count' ? values.length : agg === 'min' ? Math.min(...values) : agg === 'max' ? Math.max(...values)
          : values.reduce((a, b) => a + b, 0) / values.length;
        expect(body.values[0]![ix]! - want, `${agg} alpha=${alpha}`).toBeCloseTo(0, 9);
        const best = Math.min(...cell(alpha).filter((r) => r.region != null).map((r) => RANK.indexOf(r.region!)));
        expect(body.region[0]![ix]).toBe(RANK[best]);
      });
    }
    const counted = await get<Heatmap>('heatmap?x=alpha&y=V0&agg=count');
    expect(counted.body.values[0]).toEqual(counted.body.x.map((a) => cell(a).filter((r) => r.status === 'ok').length));
  });

  it('takes the same filters as the table', async () => {
    const { body } = await get<Heatmap>('heatmap?x=alpha&y=pivotEfolds&value=ns&param.pivotEfolds.lte=52&param.alpha.gte=8');
    expect(body.x).toEqual([8, 16, 32, 64]);
    expect(body.y).toEqual([50, 52]);
  });

  it('answers 400 for names the plan or the whitelist does not have', async () => {
    const cases: [string, string, RegExp][] = [
      ['x=beta&y=alpha&value=ns', 'x', /no parameter "beta"; its parameters are alpha, pivotEfolds, V0/],
      ['x=alpha&y=alpha&value=ns', 'y', /must differ from x/],
      ['x=alpha&y=pivotEfolds&value=bogus', 'value', /one of nTotal, .*chi2/],
      ['x=alpha&y=pivotEfolds', 'value', /required unless agg=count/],
      ['x=alpha&y=pivotEfolds&value=ns&agg=median', 'agg', /one of mean, min, max, count/],
      ['y=pivotEfolds&value=ns', 'x', /parameter name/],
      ['x=alpha&y=pivotEfolds&value=ns&limit=5', 'limit', /unknown query parameter/],
    ];
    for (const [query, field, message] of cases) {
      const { status, body } = await get<Heatmap>(`heatmap?${query}`);
      expect(status, query).toBe(400);
      expect(body.error.field, query).toBe(field);
      expect(body.error.message, query).toMatch(message);
    }
  });
});
