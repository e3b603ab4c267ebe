import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

/** Debian's Chromium, headless, with a fresh profile; nothing leaves the machine. */
export const CHROMIUM = '/usr/bin/chromium';
export const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];
/** Screenshots go here (gitignored). */
export const ARTIFACTS = join(process.cwd(), 'tests/.artifacts');

export interface Browser {
  context: BrowserContext;
  page: Page;
  /** Console errors, uncaught exceptions and 4xx/5xx answers of every page, for a test to check. */
  errors: string[];
  screenshot(name: string): Promise<void>;
  close(): Promise<void>;
}

export async function openBrowser(options: { width?: number; height?: number } = {}): Promise<Browser> {
  const profile = mkdtempSync(join(tmpdir(), 'rollway-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM, args: CHROMIUM_ARGS, viewport: { width: options.width ?? 1400, height: options.height ?? 900 }, acceptDownloads: true,
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const errors: string[] = [];
  page.on('console', (m) => m.type() === 'error' && errors.push(m.text()));
  page.on('pageerror', (e) => errors.push(e.message));
  // The console names no URL for a failed load; this does (and says which answer it was).
  page.on('response', (r) => r.status() >= 400 && errors.push(`HTTP ${r.status()} ${r.request().method()} ${new URL(r.url()).pathname}`));
  mkdirSync(ARTIFACTS, { recursive: true });
  return {
    context, page, errors,
    screenshot: async (name) => void (await page.screenshot({ path: join(ARTIFACTS, `${name}.png`), fullPage: true })),
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}
