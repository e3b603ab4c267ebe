import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PLANE_MAX, type Plane } from '../../../shared/api/plots.ts';
import { DEFAULT_BOUND_SET } from '../../../shared/physics/bounds/boundSet.ts';
import type { NewPointResultRow } from '../../../server/db/schema/pointResults.ts';
import { gridPlan, insertSynthetic, smallPlan, startResultsApp, type ResultsApp } from './resultsHarness.ts';

// Synthetic rows (see resultsHarness.ts): the arrays are checked against the same rows read
// directly, not against physics.
let app: ResultsApp;
let small: number;
let rows: NewPointResultRow[];
let big: number;
const BIG = gridPlan(60, 100); // 6,000 points
const BIG_COUNT = 6_000;

beforeAll(async () => {
  app = await startResultsApp();
  small = await app.submit(smallPlan);
  rows = await insertSynthetic(app, small, smallPlan);
  big = await app.submit(BIG);
  await insertSynthetic(app, big, BIG, false);
  // The inserts keep the event loop busy past the server's keep-alive timeout: let fetch see the
  // closed sockets before the first test reuses one (else ECONNRESET).
  await new Promise((resolve) => setTimeout(resolve, 50));
}, 60_000);
afterAll(() => app.close());

const get = async <T = Plane>(scan: number, query = '') => {
  const res = await fetch(`${app.api}/scans/${scan}/plane${query}`);
  return { status: res.status, body: (await res.json()) as T & { error: { field?: string; message: string } } };
};
const plotted = (r: NewPointResultRow) => r.status === 'ok' && r.ns != null && r.r != null;

describe('GET /scans/:id/plane', () => {
  it('returns every ok point as parallel arrays in point order, coloured by a parameter', async () => {
    const { status, body } = await get(small, '?color=param.alpha');
    expect(status).toBe(200);
    const want = rows.filter(plotted);
    expect(body).toMatchObject({ scanId: small, colorBy: 'param.alpha', total: want.length, downsampled: false, stride: 1 });
    expect(body.pointIndex).toEqual(want.map((r) => r.pointIndex));
    expect(body.ns).toEqual(want.map((r) => r.ns));
    expect(body.r).toEqual(want.map((r) => r.r));
    expect(body.color).toEqual(want.map((r) => r.params.alpha));
    expect(body.region).toEqual(want.map((r) => r.region));
    expect(body.boundSet).toEqual(DEFAULT_BOUND_SET);
  });

  it('colours by a column, or by nothing', async () => {
    const byChi2 = await get(small, '?color=chi2');
    expect(byChi2.body.color).toEqual(rows.filter(plotted).map((r) => r.chi2));
    const none = await get(small);
    expect(none.body.colorBy).toBeNull();
    expect(none.body.color.every((c) => c === null)).toBe(true);
    expect(none.body.color).toHaveLength(none.body.ns.length);
  });

  it('applies filters and region selections like the results table', async () => {
    const { body } = await get(small, '?region=inside68,inside95&param.alpha.gte=4');
    const want = rows.filter((r) => plotted(r) && r.params.alpha! >= 4 && (r.region === 'inside68' || r.region === 'inside95'));
    expect(want.length).toBeGreaterThan(0);
    expect(body.pointIndex).toEqual(want.map((r) => r.pointIndex));
  });

  it('thins a large scan evenly to at most max points and says so', async () => {
    const { body } = await get(big, '?max=500&color=param.pivotEfolds');
    // Every 7th synthetic point (index 3 mod 7) fails.
    const total = BIG_COUNT - Math.floor((BIG_COUNT - 3 + 6) / 7);
    expect(body.total).toBe(total);
    expect(body.downsampled).toBe(true);
    expect(body.stride).toBe(Math.ceil(total / 500));
    expect(body.ns.length).toBe(Math.ceil(total / body.stride));
    expect(body.ns.length).toBeLessThanOrEqual(500);
    // Even in point order: consecutive kept ok points are `stride` ok points apart.
    const okIndex = Array.from({ length: BIG_COUNT }, (_, i) => i).filter((i) => i % 7 !== 3);
    expect(body.pointIndex).toEqual(okIndex.filter((_, k) => k % body.stride === 0));
    const all = await get(big);
    expect(all.body).toMatchObject({ total, downsampled: false, stride: 1 });
    expect(all.body.pointIndex).toEqual(okIndex);
  });

  it('is empty, not an error, when nothing matches', async () => {
    const { status, body } = await get(small, '?ns.gt=5');
    expect(status).toBe(200);
    expect(body).toMatchObject({ total: 0, downsampled: false, stride: 1, ns: [], r: [], color: [], pointIndex: [], region: [] });
  });

  it('names the field of every bad query parameter', async () => {
    const cases: [string, string, RegExp][] = [
      ['?max=0', 'max', /whole number from 1 to 100000/],
      [`?max=${PLANE_MAX + 1}`, 'max', /from 1 to 100000/],
      ['?max=ten', 'max', /whole number/],
      ['?max=5&max=6', 'max', /given once/],
      ['?color=banana', 'color', /unknown column "banana"/],
      ['?color=param.beta', 'color', /no parameter "beta"; its parameters are alpha, pivotEfolds, V0/],
      ['?region=inside99', 'region', /unknown value "inside99"/],
      ['?status=ok', 'status', /unknown query parameter "status"/],
      ['?ns.gt=abc', 'ns.gt', /finite number/],
    ];
    for (const [query, field, message] of cases) {
      const { status, body } = await get(small, query);
      expect(status, query).toBe(400);
      expect(body.error.field, query).toBe(field);
      expect(body.error.message, query).toMatch(message);
    }
    expect((await get(99_999)).status).toBe(404);
    expect((await get(Number.NaN)).body.error.field).toBe('id');
  });
});
