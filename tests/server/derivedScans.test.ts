import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunningServer } from '../../server/startServer.ts';
import { api, startTestServer, waitForScan } from '../helpers/server.ts';

const plan = (mu: number[], extra = '') => `title: hilltop mu\npotential: { family: hilltop }\naxes:\n  - { name: mu, values: [${mu.join(', ')}] }\npivot: { efolds: 55 }\n${extra}`;

let server: RunningServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.stop());

const rowsOf = async (id: number) => (await api(server.url, `/scans/${id}/results?limit=100&sort=pointIndex&order=asc`)).body.rows as Array<{ params: { mu: number }; ns: number; computeMs: number }>;

describe('re-running or extending a scan without recomputing what it has', () => {
  it('copies the points an extended axis shares with the source and computes only the new ones', async () => {
    const first = (await api(server.url, '/scans', { method: 'POST', json: { planText: plan([8, 10, 12]) } })).body;
    await waitForScan(server.url, first.id);
    const extended = (await api(server.url, '/scans', { method: 'POST', json: { planText: plan([8, 10, 12, 14]), basedOn: first.id } })).body;
    expect(extended.basedOnScanId).toBe(first.id);
    expect((await waitForScan(server.url, extended.id)).state).toBe('completed');
    const before = await rowsOf(first.id);
    const after = await rowsOf(extended.id);
    expect(after).toHaveLength(4);
    for (const [i, row] of before.entries()) {
      expect(after[i]!.ns).toBe(row.ns);
      expect(after[i]!.computeMs).toBe(0); // copied
    }
    expect(after[3]!.computeMs).toBeGreaterThan(0); // mu = 14 was computed
  });

  it('recomputes every point when the precision changes', async () => {
    const first = (await api(server.url, '/scans', { method: 'POST', json: { planText: plan([9, 11]) } })).body;
    await waitForScan(server.url, first.id);
    const rerun = (await api(server.url, '/scans', { method: 'POST', json: { planText: plan([9, 11], 'precision: { preset: fast, rtol: 1.0e-10 }\n'), basedOn: first.id } })).body;
    await waitForScan(server.url, rerun.id);
    for (const row of await rowsOf(rerun.id)) expect(row.computeMs).toBeGreaterThan(0);
  });

  it('names basedOn when the source scan does not exist', async () => {
    const bad = await api(server.url, '/scans', { method: 'POST', json: { planText: plan([9]), basedOn: 999_999 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('basedOn');
  });
});
