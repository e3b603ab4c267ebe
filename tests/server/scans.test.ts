import { readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunningServer } from '../../server/startServer.ts';
import { api, startTestServer, waitForScan } from '../helpers/server.ts';

const quickCheck = await readFile(new URL('../../examples/quick-check.yaml', import.meta.url), 'utf8');
const bigPlan = (count: number) => `title: cancel me\npotential: { family: hilltop }\naxes:\n  - { name: mu, range: { from: 8, to: 20, count: ${count} } }\npivot: { efolds: 55 }\n`;

let server: RunningServer;
let base: string;
beforeAll(async () => {
  server = await startTestServer();
  base = server.url;
});
afterAll(() => server.stop());

describe('scans API on the real app (PGlite in memory, piscina workers)', () => {
  it('answers health and readiness, and unknown routes with JSON 404', async () => {
    expect((await api(base, '/health')).body.status).toBe('ok');
    expect((await api(base, '/ready')).status).toBe(200);
    const missing = await api(base, '/nope');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('not_found');
  });

  it('computes a submitted plan to completion and keeps its provenance', async () => {
    const created = await api(base, '/scans', { method: 'POST', json: { planText: quickCheck } });
    expect(created.status).toBe(201);
    expect(created.body.planHash).toMatch(/^[0-9a-f]{64}$/);
    expect(created.body.planText).toBe(quickCheck);
    const done = await waitForScan(base, created.body.id);
    expect(done.state).toBe('completed');
    expect(done.pointsDone).toBe(3);
    expect(done.pointsFailed).toBe(0);
    const list = await api(base, '/scans');
    expect(list.body.scans.some((s: { id: number }) => s.id === created.body.id)).toBe(true);
  });

  it('refuses an invalid plan with every problem named, and stores nothing', async () => {
    const before = (await api(base, '/scans')).body.scans.length;
    const bad = await api(base, '/scans', { method: 'POST', json: { plan: { title: '', potential: { family: 'nope' }, axes: [] } } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('invalid_plan');
    expect(bad.body.error.message).toMatch(/title/);
    expect(bad.body.error.message).toMatch(/family/);
    expect(bad.body.error.message).toMatch(/axes/);
    expect((await api(base, '/scans')).body.scans.length).toBe(before);
  });

  it('accepts a plan file upload', async () => {
    const form = new FormData();
    form.append('plan', new Blob([quickCheck], { type: 'application/yaml' }), 'quick-check.yaml');
    const response = await fetch(`${base}/api/v1/scans`, { method: 'POST', body: form });
    expect(response.status).toBe(201);
  });

  it('cancels within seconds and keeps what is done', async () => {
    const created = await api(base, '/scans', { method: 'POST', json: { planText: bigPlan(40_000) } });
    await waitForScan(base, created.body.id, 30_000, (s) => s.pointsDone > 0);
    const cancelled = await api(base, `/scans/${created.body.id}/cancel`, { method: 'POST' });
    expect(cancelled.status).toBe(200);
    expect(cancelled.body.state).toBe('cancelled');
    // Batches in flight are abandoned at once; a write already under way may still land.
    await new Promise((r) => setTimeout(r, 1000));
    const settled = (await api(base, `/scans/${created.body.id}`)).body;
    await new Promise((r) => setTimeout(r, 1000));
    const later = (await api(base, `/scans/${created.body.id}`)).body;
    expect(later.pointsDone).toBe(settled.pointsDone);
    expect(later.pointsDone).toBeLessThan(40_000);
    expect((await api(base, `/scans/${created.body.id}/cancel`, { method: 'POST' })).status).toBe(409);
  });

  it('clones, deletes, and streams progress as server-sent events', async () => {
    const created = await api(base, '/scans', { method: 'POST', json: { planText: quickCheck } });
    const events = await (await fetch(`${base}/api/v1/scans/${created.body.id}/events`)).text();
    const last = events.trim().split('\n\n').at(-1)!;
    expect(last).toMatch(/^event: progress\ndata: /);
    expect(JSON.parse(last.split('data: ')[1]!).state).toBe('completed');
    const clone = await api(base, `/scans/${created.body.id}/clone`, { method: 'POST' });
    expect(clone.status).toBe(201);
    expect(clone.body.id).not.toBe(created.body.id);
    expect(clone.body.planHash).toBe(created.body.planHash);
    await waitForScan(base, clone.body.id);
    expect((await api(base, `/scans/${clone.body.id}`, { method: 'DELETE' })).status).toBe(204);
    expect((await api(base, `/scans/${clone.body.id}`)).status).toBe(404);
  });

  it('names the field of a bad id', async () => {
    const bad = await api(base, '/scans/abc');
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('id');
  });
});
