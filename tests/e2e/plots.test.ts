import { mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ScanPlanInput } from '../../shared/plan/scanPlan.ts';
import { TEST_ADMIN, TEST_ADMIN_ENV } from '../helpers/auth.ts';
import { openBrowser, signInBrowser, type TestBrowser } from '../helpers/browser.ts';
import { api, startTestServer, waitForScan } from '../helpers/server.ts';
import { ensureWebBuild } from './helpers/webBuild.ts';

/**
 * The plots in real Chromium against the real server serving a fresh build: a finished scan's
 * n_s–r plane and heatmap on its page, PNG and SVG export read back from the downloads, a click
 * from the heatmap to the point detail page, and the compare page over two scans.
 */
const SCREENS = join(process.cwd(), 'tests/.artifacts/screens');

let server: Awaited<ReturnType<typeof startTestServer>>;
let base: string;
let browser: TestBrowser;
let page: Page;
let grid: number;
let other: number;

const submit = async (plan: ScanPlanInput) => {
  const { status, body } = await api(server.url, '/scans', { method: 'POST', json: { plan } });
  if (status !== 201) throw new Error(`submit: ${status} ${JSON.stringify(body)}`);
  return body.id as number;
};

beforeAll(async () => {
  // Locked and by source digest: e2e files run in parallel and share dist/web.
  await ensureWebBuild();
  server = await startTestServer(TEST_ADMIN_ENV);
  base = server.url;
  grid = await submit({ title: 'Plots e2e: E-model grid', potential: { family: 'e-model' }, fixed: { V0: 1 },
    axes: [{ name: 'alpha', logRange: { from: 0.1, to: 100, count: 5 } }, { name: 'pivotEfolds', values: [50, 55, 60] }] });
  other = await submit({ title: 'Plots e2e: T-model', potential: { family: 't-model' }, axes: [{ name: 'alpha', logRange: { from: 0.1, to: 100, count: 4 } }], pivot: { efolds: 55 } });
  browser = await openBrowser();
  page = browser.page;
  mkdirSync(SCREENS, { recursive: true });
  expect(await signInBrowser(page, base, TEST_ADMIN)).toBe(200);
  await waitForScan(server.url, grid);
  await waitForScan(server.url, other);
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

/** Clicks an export button and returns the downloaded file's name and bytes. */
async function download(button: string): Promise<{ name: string; bytes: Buffer }> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.locator(`[data-test="${button}"]`).first().click()]);
  const path = await file.path();
  return { name: file.suggestedFilename(), bytes: readFileSync(path) };
}
const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
const pngSize = (bytes: Buffer) => ({ width: bytes.readUInt32BE(16), height: bytes.readUInt32BE(20) });
const chartCanvas = () => page.locator('.plot-frame canvas').first();
/** Opens a page with a plot, waits until it is drawn and ready to export, and takes its screenshot. */
async function showPlot(path: string, screenshot: string): Promise<void> {
  await page.goto(`${base}${path}`);
  await chartCanvas().waitFor({ timeout: 20_000 });
  await expect.poll(() => page.locator('.plot-frame [data-test="export-png"]').isEnabled()).toBe(true);
  await page.screenshot({ path: join(SCREENS, screenshot), fullPage: true });
}

describe('plots in the browser', () => {
  it('draws the n_s–r plane of a finished scan and exports it as PNG and SVG', async () => {
    await showPlot(`/scans/${grid}?tab=plane`, 'plots-plane.png');

    const png = await download('export-png');
    expect(png.name).toBe(`scan-${grid}-plane.png`);
    expect(png.bytes.subarray(0, 8).equals(PNG_SIGNATURE)).toBe(true);
    // Exported at twice the on-screen size (pixelRatio 2).
    const box = (await page.locator('.plot-frame .plot-area').first().boundingBox())!;
    expect(pngSize(png.bytes)).toEqual({ width: Math.round(box.width) * 2, height: Math.round(box.height) * 2 });
    expect(png.bytes.length).toBeGreaterThan(10_000);

    const svg = await download('export-svg');
    expect(svg.name).toBe(`scan-${grid}-plane.svg`);
    const text = svg.bytes.toString('utf8');
    expect(text.startsWith('<svg')).toBe(true);
    expect(text).toContain('n_s');
    expect(text).toContain('Plots e2e: E-model grid');
  });

  it('draws a heatmap over the two axes, and a click on a cell opens that point', async () => {
    await showPlot(`/scans/${grid}?tab=maps`, 'plots-heatmap.png');
    const png = await download('export-png');
    expect(png.name).toBe(`scan-${grid}-heatmap-ns-alpha-pivotEfolds.png`);
    expect(png.bytes.subarray(0, 8).equals(PNG_SIGNATURE)).toBe(true);

    // The grid fills the middle of the chart: 5 × 3 cells, each one point of the plan.
    const box = (await chartCanvas().boundingBox())!;
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await page.waitForURL(new RegExp(`/scans/${grid}/points/\\d+$`), { timeout: 10_000 });
    const index = Number(new URL(page.url()).pathname.split('/').pop());
    expect(index).toBeGreaterThanOrEqual(0);
    expect(index).toBeLessThan(15);
  });

  it('shows a point: its trajectory, every observable and a way back', async () => {
    await page.goto(`${base}/scans/${grid}/points/7`);
    const table = page.locator('[data-test="observable-table"]');
    await table.waitFor({ timeout: 20_000 });
    const { body: row } = await api(server.url, `/scans/${grid}/points/7`);
    const ns = await table.locator('tr', { hasText: /^n_s/ }).first().locator('td').textContent();
    expect(Number(ns)).toBeCloseTo(row.row.ns, 5);
    await chartCanvas().waitFor({ timeout: 20_000 });
    expect(await page.locator('[data-test="point-outcome"]').textContent()).toContain('ok');
    await page.screenshot({ path: join(SCREENS, 'plots-point.png'), fullPage: true });
    await page.locator('[data-test="back-to-scan"]').click();
    await page.waitForURL(new RegExp(`/scans/${grid}$`));
  });

  it('overlays two scans on the plane with their summaries side by side', async () => {
    await page.goto(`${base}/compare?ids=${grid},${other}`);
    await chartCanvas().waitFor({ timeout: 20_000 });
    const cards = page.locator('[data-test="compare-summaries"] .v-card');
    await expect.poll(() => cards.count()).toBe(2);
    expect(await cards.nth(0).textContent()).toContain('15 points stored');
    expect(await cards.nth(1).textContent()).toContain('4 points stored');
    await page.screenshot({ path: join(SCREENS, 'plots-compare.png'), fullPage: true });
    const png = await download('export-png');
    expect(png.name).toBe(`compare-${grid}-${other}.png`);
  });

  it('logged no console errors', () => {
    expect(browser.consoleErrors).toEqual([]);
  });
});
