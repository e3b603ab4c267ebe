import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunningServer } from '../../server/startServer.ts';
import { TEST_ADMIN, TEST_ADMIN_ENV } from '../helpers/auth.ts';
import { startTestServer } from '../helpers/server.ts';
import { ensureWebBuild } from './helpers/webBuild.ts';

/**
 * The plan builder in real Chromium against the real server serving a fresh build: pick a family,
 * scan a parameter, see the point count and the trial point, submit, land on the scan page.
 */
const SCREENS = join(process.cwd(), 'tests/.artifacts/screens');
const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

let server: RunningServer;
let base: string;
let context: BrowserContext;
let page: Page;
let userDir: string;
const consoleErrors: string[] = [];

beforeAll(async () => {
  userDir = mkdtempSync(join(tmpdir(), 'rollway-plan-e2e-'));
  // Independent, so side by side: the shared web build (locked, redone only when sources
  // changed; the server serves dist/web and looks the folder up per request), the server, the browser.
  [, server, context] = await Promise.all([
    ensureWebBuild(),
    startTestServer(TEST_ADMIN_ENV),
    chromium.launchPersistentContext(userDir, { executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS, viewport: { width: 1400, height: 1000 } }),
  ]);
  base = server.url;
  page = context.pages()[0] ?? await context.newPage();
  page.on('console', (m) => { if (m.type() === 'error') consoleErrors.push(m.text()); });
  page.on('pageerror', (e) => consoleErrors.push(e.message));
  mkdirSync(SCREENS, { recursive: true });
  // Sign in from a page of the origin that makes no API calls of its own (the app would ask
  // /auth/me first and log the 401), so the session cookie is the browser's own.
  await page.goto(`${base}/api/v1/health`);
  const status = await page.evaluate(async (c) => (await fetch('/api/v1/auth/login', {
    method: 'POST', credentials: 'same-origin', headers: { 'content-type': 'application/json' }, body: JSON.stringify(c),
  })).status, TEST_ADMIN);
  expect(status).toBe(200);
}, 120_000);

afterAll(async () => {
  await context?.close();
  await server?.stop();
  if (userDir) rmSync(userDir, { recursive: true, force: true });
});

const field = (test: string) => page.locator(`[data-test="${test}"] input`);

describe('New scan in the browser', () => {
  it('builds a plan from the form, previews a point, submits it and opens the scan', async () => {
    await page.goto(`${base}/scans/new`);
    await page.locator('[data-test="family-select"]').click();
    await page.locator('.v-overlay .v-list-item', { hasText: 'E-model' }).click();
    await expect.poll(() => page.locator('[data-test="formula"] .katex').count()).toBeGreaterThan(0);

    await field('title').fill('Browser plan: E-model alpha');
    await page.locator('[data-test="scan-alpha"]').click();
    await field('axis-count-0').fill('3');
    await field('efolds').fill('60');
    await expect.poll(() => page.locator('[data-test="point-count"]').textContent()).toBe('3');

    // The trial point: alpha = 0.01 (first value), computed in the worker. Plateau models give
    // n_s ≈ 1 - 2/N_* = 0.967 at N_* = 60 (Kallosh, Linde & Roest 2013, from memory).
    const table = page.locator('[data-test="preview-observables"]');
    await table.waitFor({ timeout: 20_000 });
    const ns = Number(await table.locator('tr', { hasText: /^n_s/ }).first().locator('td').textContent());
    expect(ns).toBeGreaterThan(0.96);
    expect(ns).toBeLessThan(0.97);
    await expect.poll(() => page.locator('[data-test="preview"] canvas').count()).toBeGreaterThan(0);
    await page.screenshot({ path: join(SCREENS, 'plan-builder.png') });

    await page.locator('[data-test="show-yaml"]').click();
    const yaml = await page.locator('[data-test="plan-yaml"]').textContent();
    expect(yaml).toContain('family: e-model');
    expect(yaml).toContain('logRange:');
    await page.keyboard.press('Escape');

    await page.locator('[data-test="submit"]').click();
    await page.waitForURL(/\/scans\/\d+$/, { timeout: 20_000 });
    const id = Number(new URL(page.url()).pathname.split('/').pop());
    const scan = await page.evaluate(async (scanId) => (await fetch(`/api/v1/scans/${scanId}`, { credentials: 'same-origin' })).json(), id);
    expect(scan).toMatchObject({ id, title: 'Browser plan: E-model alpha', pointCount: 3 });
    await page.screenshot({ path: join(SCREENS, 'plan-submitted-scan.png') });
  });

  it('shows an uploaded plan with mistakes in the form, each problem next to its field', async () => {
    await page.goto(`${base}/scans/new`);
    await field('title').fill('typed before the upload');
    await page.locator('[data-test="plan-file"]').setInputFiles({
      name: 'typo.yaml', mimeType: 'text/yaml',
      buffer: Buffer.from('title: Uploaded\npotential: { family: hilltop }\naxes:\n  - name: mu\n    range: { from: 5, to: 10, count: lots }\npivot: { efolds: 55 }\n'),
    });
    await expect.poll(() => page.locator('[data-test="upload-problems"]').textContent()).toContain('axes[0].range.count');
    expect(await field('title').inputValue()).toBe('Uploaded');
    const countField = page.locator('[data-test="axis-count-0"]');
    expect(await countField.locator('input').inputValue()).toBe('lots');
    await expect.poll(() => countField.textContent()).toContain('must be a whole number');

    // A file that is not YAML at all leaves the form as it was.
    await page.locator('[data-test="plan-file"]').setInputFiles({ name: 'broken.yaml', mimeType: 'text/yaml', buffer: Buffer.from('title: [unclosed\n') });
    await expect.poll(() => page.locator('[data-test="upload-problems"]').textContent()).toMatch(/YAML syntax error at line \d+/);
    expect(await field('title').inputValue()).toBe('Uploaded');
    await page.screenshot({ path: join(SCREENS, 'plan-upload-problems.png') });
  });

  it('logged no console errors', () => {
    expect(consoleErrors).toEqual([]);
  });
});
