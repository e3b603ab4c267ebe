import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

/** Debian's Chromium with the flags every browser test uses (a fresh profile, no network of its own). */
export const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

export interface TestBrowser {
  context: BrowserContext;
  page: Page;
  /** Console errors and uncaught page errors, for a "no console errors" check. */
  consoleErrors: string[];
  close(): Promise<void>;
}

export async function openBrowser(viewport = { width: 1400, height: 1000 }): Promise<TestBrowser> {
  const userDir = mkdtempSync(join(tmpdir(), 'rollway-browser-'));
  const context = await chromium.launchPersistentContext(userDir, { executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS, viewport, acceptDownloads: true });
  const page = context.pages()[0] ?? await context.newPage();
  const consoleErrors: string[] = [];
  page.on('console', (m) => { if (m.type() === 'error') consoleErrors.push(m.text()); });
  page.on('pageerror', (e) => consoleErrors.push(e.message));
  return {
    context, page, consoleErrors,
    async close() {
      await context.close();
      rmSync(userDir, { recursive: true, force: true });
    },
  };
}

/**
 * Signs the browser in from a page of the origin that makes no API calls of its own (the app would
 * ask /auth/me first and log the 401), so the session cookie is the browser's own. Returns the status.
 */
export async function signInBrowser(page: Page, base: string, credentials: { email: string; password: string }): Promise<number> {
  await page.goto(`${base}/api/v1/health`);
  return page.evaluate(async (c) => (await fetch('/api/v1/auth/login', {
    method: 'POST', credentials: 'same-origin', headers: { 'content-type': 'application/json' }, body: JSON.stringify(c),
  })).status, credentials);
}
