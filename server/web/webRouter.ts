import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import express, { Router } from 'express';

/** Where `npm run build:web` (vite) puts the app. */
export const DEFAULT_WEB_DIR = fileURLToPath(new URL('../../dist/web/', import.meta.url));

const NOT_BUILT = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Rollway</title></head>
<body style="font-family: sans-serif; max-width: 40rem; margin: 4rem auto; line-height: 1.5">
<h1>Rollway</h1><p>The API is running under <code>/api/v1</code>, but the web app has not been built.</p>
<p>Run <code>npm run build:web</code> and reload this page (or start with <code>npm run demo</code>, which builds it).</p>
</body></html>`;

/**
 * Serves the built single-page app: files as they are, hashed assets with a year-long cache (their
 * names change with their content), and index.html for any other GET so that the client router
 * handles deep links such as /scans/3. Mounted after the API, whose unknown routes stay JSON 404s.
 * The folder is looked up per request, so a build made while the server runs is picked up.
 */
export function webRouter(dir: string = DEFAULT_WEB_DIR): Router {
  const router = Router();
  const index = join(dir, 'index.html');
  router.use('/assets', express.static(join(dir, 'assets'), { immutable: true, maxAge: '365d', index: false, fallthrough: false }));
  router.use(express.static(dir, { index: false, maxAge: 0 }));
  router.use((req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || /^\/api(\/|$)/.test(req.path)) {
      next();
      return;
    }
    if (!req.accepts('html')) {
      res.status(404).type('text/plain').send('not found');
      return;
    }
    res.setHeader('cache-control', 'no-cache');
    if (existsSync(index)) res.sendFile(index);
    else res.status(200).type('html').send(NOT_BUILT);
  });
  return router;
}
