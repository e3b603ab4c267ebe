import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PointDetail } from '../../../shared/api/plots.ts';
import type { ResultsPage } from '../../../shared/api/results.ts';
import type { ScanPlanInput } from '../../../shared/plan/scanPlan.ts';
import { api, startTestServer, waitForScan } from '../../helpers/server.ts';

/**
 * GET /scans/:id/points/:index on the real server with real compute: the recomputed trajectory
 * and spectra must agree with the row the scan stored, which comes from an independent run.
 */
let server: Awaited<ReturnType<typeof startTestServer>>;
let fast: number;
let exact: number;
let failing: number;

const submit = async (plan: ScanPlanInput) => {
  const { status, body } = await api(server.url, '/scans', { method: 'POST', json: { plan } });
  if (status !== 201) throw new Error(`submit: ${status} ${JSON.stringify(body)}`);
  return body.id as number;
};

beforeAll(async () => {
  server = await startTestServer();
  fast = await submit({ title: 'point detail, fast', potential: { family: 'e-model' }, fixed: { V0: 1 }, axes: [{ name: 'alpha', values: [1, 10] }, { name: 'pivotEfolds', values: [50, 60] }] });
  exact = await submit({ title: 'point detail, exact', potential: { family: 'starobinsky' }, axes: [{ name: 'pivotEfolds', values: [55] }], precision: { preset: 'exact' } });
  // Starting at phi = 0.5 the quadratic potential has eps1 > 1: it never inflates.
  failing = await submit({ title: 'point detail, no inflation', potential: { family: 'quadratic' }, phi0: 0.5, axes: [{ name: 'pivotEfolds', values: [55] }] });
  for (const id of [fast, exact, failing]) await waitForScan(server.url, id);
}, 60_000);
afterAll(() => server?.stop());

const detail = (scan: number, index: number | string) => api<PointDetail & { error: { field?: string; message: string } }>(server.url, `/scans/${scan}/points/${index}`);
const stored = async (scan: number) => (await api<ResultsPage>(server.url, `/scans/${scan}/results`)).body.rows;
const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('GET /scans/:id/points/:index', () => {
  it('returns the stored row and the trajectory the observables came from', async () => {
    const rows = await stored(fast);
    for (const row of rows) {
      const { status, body } = await detail(fast, row.pointIndex);
      expect(status).toBe(200);
      expect(body.row).toEqual(row);
      expect(body.spectra).toBeNull();
      const t = body.trajectory!;
      const last = t.N.length - 1;
      expect(t.N[0]).toBe(0);
      expect(t.phi[0]).toBe(row.phiStart);
      expect(rel(t.nEnd, row.nTotal!)).toBeLessThan(1e-9);
      expect(t.N[last]).toBe(t.nEnd);
      // Inflation ends where eps1 = 1 (the end condition of the e-model, which ends by itself).
      expect(Math.abs(t.eps1[last]! - 1)).toBeLessThan(1e-6);
      // The pivot is N_* e-folds before the end, and the state there is the stored one.
      expect(t.pivotN!).toBeCloseTo(row.nTotal! - row.nPivot!, 8);
      const at = t.N.indexOf(t.pivotN!);
      expect(at).toBeGreaterThan(0);
      expect(rel(t.phi[at]!, row.phiPivot!)).toBeLessThan(1e-8);
      expect(rel(t.eps1[at]!, row.eps1!)).toBeLessThan(1e-7);
      expect(rel(t.eps2[at]!, row.eps2!)).toBeLessThan(1e-7);
      // eps1 grows towards the end on these plateaus: slow roll early, eps1 = 1 last.
      expect(t.eps1[0]!).toBeLessThan(t.eps1[at]!);
    }
  });

  it('adds the exact spectra around the pivot for an exact scan, normalised to the target A_s', async () => {
    const [row] = await stored(exact);
    const { body } = await detail(exact, 0);
    expect(body.row).toEqual(row);
    const { samples, failures } = body.spectra!;
    expect(failures).toEqual([]);
    expect(samples.length).toBe(7);
    const pivot = samples.find((s) => s.lnK === 0)!;
    // The plan names no target, so the scan's default A_s = 2.1e-9 (DESIGN.md) applies.
    expect(rel(pivot.scalar, 2.1e-9)).toBeLessThan(1e-12);
    expect(rel(pivot.tensor / pivot.scalar, row!.exactR!)).toBeLessThan(1e-9);
    const i = samples.indexOf(pivot);
    const [lo, hi] = [samples[i - 1]!, samples[i + 1]!];
    // Over ±1 in ln k the Starobinsky running (alpha_s ≈ -2/N^2 ≈ -7e-4) moves the slope by < 1e-3.
    const slope = (Math.log(hi.scalar) - Math.log(lo.scalar)) / (hi.lnK - lo.lnK);
    expect(Math.abs(1 + slope - row!.exactNs!)).toBeLessThan(1e-3);
    // The scalar spectrum is red: larger scales (smaller k) carry more power.
    expect(samples[0]!.scalar).toBeGreaterThan(samples[samples.length - 1]!.scalar);
  });

  it('explains a point without a trajectory', async () => {
    const { status, body } = await detail(failing, 0);
    expect(status).toBe(200);
    expect(body.row.status).toBe('no_inflation');
    expect(body.trajectory).toBeNull();
    expect(body.trajectoryNote).toMatch(/^no trajectory to show: /);
    expect(body.trajectoryNote.length).toBeGreaterThan('no trajectory to show: '.length);
    expect(body.spectra).toBeNull();
  });

  it('names the field of a bad index and says which points exist', async () => {
    for (const bad of ['abc', '-1', '1.5', '99999999999']) {
      const { status, body } = await detail(fast, bad);
      expect(status, bad).toBe(400);
      expect(body.error.field, bad).toBe('index');
      expect(body.error.message, bad).toMatch(/is not a point index/);
    }
    const missing = await detail(fast, 4);
    expect(missing.status).toBe(404);
    expect(missing.body.error.message).toBe(`scan ${fast} has points 0 to 3; there is no point 4`);
    expect((await detail(999_999, 0)).status).toBe(404);
  });
});
