import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import express from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { notFound } from '../../../server/middleware/errorHandler.ts';
import { webRouter } from '../../../server/web/webRouter.ts';

/** The web router on an ephemeral port, behind the API's JSON 404 as in server/app.ts. */
async function serve(dir: string) {
  const app = express();
  app.use('/api', notFound);
  app.use(webRouter(dir));
  const server = app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  return { base: `http://127.0.0.1:${(server.address() as AddressInfo).port}`, close: () => server.close() };
}

describe('web router', () => {
  const built = mkdtempSync(join(tmpdir(), 'rollway-web-'));
  const missing = join(built, 'not-built');
  let app: Awaited<ReturnType<typeof serve>>;
  let bare: Awaited<ReturnType<typeof serve>>;
  beforeAll(async () => {
    mkdirSync(join(built, 'assets'));
    writeFileSync(join(built, 'index.html'), '<!doctype html><div id="app"></div>');
    writeFileSync(join(built, 'assets', 'index-AbC123.js'), 'console.log(1)');
    writeFileSync(join(built, 'favicon.svg'), '<svg/>');
    app = await serve(built);
    bare = await serve(missing);
  });
  afterAll(() => {
    app.close();
    bare.close();
    rmSync(built, { recursive: true, force: true });
  });

  it('answers deep links with index.html, never cached', async () => {
    const res = await fetch(`${app.base}/scans/3/points/7`, { headers: { accept: 'text/html' } });
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('no-cache');
    expect(await res.text()).toContain('<div id="app">');
  });

  it('serves hashed assets with a long, immutable cache', async () => {
    const res = await fetch(`${app.base}/assets/index-AbC123.js`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/javascript/);
    expect(res.headers.get('cache-control')).toMatch(/max-age=31536000.*immutable/);
  });

  it('answers a missing asset with 404, not with the page', async () => {
    expect((await fetch(`${app.base}/assets/gone-123.js`)).status).toBe(404);
  });

  it('leaves unknown API routes to the API as JSON 404s', async () => {
    const res = await fetch(`${app.base}/api/v1/nothing`, { headers: { accept: 'text/html' } });
    expect(res.status).toBe(404);
    expect(await res.json()).toMatchObject({ error: { code: 'not_found' } });
  });

  it('says how to build the app when dist/web is missing', async () => {
    const res = await fetch(`${bare.base}/`, { headers: { accept: 'text/html' } });
    expect(res.status).toBe(200);
    expect(await res.text()).toContain('npm run build:web');
  });
});
