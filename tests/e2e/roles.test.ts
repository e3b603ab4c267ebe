import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/demo/demoAccounts.ts';
import { openBrowser, type TestBrowser } from '../helpers/browser.ts';
import { startTestServer } from '../helpers/server.ts';
import { ensureWebBuild } from './helpers/webBuild.ts';

/**
 * The three demo roles in real Chromium against one demo server, each signed in through the
 * sign-in page in a browser of its own: the researcher builds a plan, watches it finish and
 * filters its rows (checked against the API); the collaborator browses but cannot submit (no
 * "New scan", a 403 from the API); the admin changes the researcher's quota on the Admin page.
 */
const SCREENS = join(process.cwd(), 'tests/.artifacts/screens');
const account = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!;
const researcher = account('researcher');
const collaborator = account('collaborator');
const admin = account('admin');

let server: Awaited<ReturnType<typeof startTestServer>>;
const browsers: TestBrowser[] = [];

beforeAll(async () => {
  [, server] = await Promise.all([ensureWebBuild(), startTestServer({ ROLLWAY_WORKERS: '2' }, { demo: true })]);
  mkdirSync(SCREENS, { recursive: true });
}, 120_000);

afterAll(async () => {
  await Promise.all(browsers.map((b) => b.close()));
  await server?.stop();
});

const screenshot = (page: Page, name: string) => page.screenshot({ path: join(SCREENS, `roles-${name}.png`), fullPage: true });
/** JSON from the API with the page's own session cookie. */
const pageApi = (page: Page, path: string, init: { method?: string; body?: unknown } = {}) => page.evaluate(async ({ path, init }) => {
  const response = await fetch(`/api/v1${path}`, {
    method: init.method ?? 'GET', credentials: 'same-origin',
    ...(init.body === undefined ? {} : { headers: { 'content-type': 'application/json' }, body: JSON.stringify(init.body) }),
  });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : undefined };
}, { path, init });

/** A fresh browser (own profile, own cookies) signed in through the sign-in page. */
async function signedIn(who: { email: string; password: string }): Promise<TestBrowser> {
  const browser = await openBrowser({ width: 1400, height: 900 });
  browsers.push(browser);
  browser.page.setDefaultTimeout(15_000);
  // The console names no URL for a failed load; this does.
  browser.page.on('response', (r) => r.status() >= 400 && browser.consoleErrors.push(`HTTP ${r.status()} ${r.request().method()} ${new URL(r.url()).pathname}`));
  const { page } = browser;
  await page.goto(`${server.url}/sign-in`);
  await page.getByLabel('E-mail').fill(who.email);
  await page.getByLabel('Password').fill(who.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  try {
    await page.waitForURL(`${server.url}/scans`);
  } catch (error) {
    // Say where the page stands: its address, what the sign-in form shows, what failed to load.
    const shown = await page.locator('main').innerText().catch(() => '(no main)');
    await page.screenshot({ path: join(SCREENS, `roles-not-signed-in-${who.email.split('@')[0]}.png`), fullPage: true }).catch(() => undefined);
    throw new Error(`${who.email} not signed in: at ${page.url()}, page says ${JSON.stringify(shown)}; errors: ${browser.consoleErrors.join(' | ')}`, { cause: error });
  }
  return browser;
}

/**
 * Errors that are expected, each for a reason: the app asks GET /auth/me before anyone has signed
 * in (the sign-in page itself), which answers 401; and the collaborator's POST /scans that the test
 * provokes on purpose answers 403. Chromium logs each as "Failed to load resource … status of N".
 */
function unexpectedErrors(browser: TestBrowser, allowed: RegExp[]): string[] {
  const ignore = [/status of 401/, /^HTTP 401 GET \/api\/v1\/auth\/me$/, ...allowed];
  return browser.consoleErrors.filter((e) => !ignore.some((p) => p.test(e)));
}

describe('roles in the browser', () => {
  it('researcher: builds a plan, watches it finish, filters the rows by n_s as the API does', async () => {
    const browser = await signedIn(researcher);
    const { page } = browser;
    await screenshot(page, 'researcher-scans');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'New scan' }).click();
    await page.waitForURL(/\/scans\/new$/);
    await page.locator('[data-test="family-select"]').click();
    await page.locator('.v-overlay .v-list-item', { hasText: 'E-model' }).click();
    const field = (test: string) => page.locator(`[data-test="${test}"] input`);
    await field('title').fill('Roles e2e: E-model alpha, five values');
    await page.locator('[data-test="scan-alpha"]').click();
    await field('axis-count-0').fill('5');
    await field('efolds').fill('55');
    await expect.poll(() => page.locator('[data-test="point-count"]').textContent()).toBe('5');
    await screenshot(page, 'researcher-new-scan');
    await page.locator('[data-test="submit"]').click();
    await page.waitForURL(/\/scans\/\d+$/, { timeout: 20_000 });
    const id = Number(new URL(page.url()).pathname.split('/').pop());

    // The state on the page itself reaches "Done" (the scan's live updates, no reload).
    await page.locator('header').getByText('Done', { exact: true }).waitFor({ timeout: 60_000 });
    await page.locator('header').getByText('5 / 5 points').waitFor();
    const scan = await pageApi(page, `/scans/${id}`);
    expect(scan.body).toMatchObject({ id, state: 'completed', pointCount: 5, pointsDone: 5 });

    // A threshold between the 2nd and 3rd largest n_s: the filter keeps exactly two rows.
    const all = (await pageApi(page, `/scans/${id}/results?sort=ns&order=desc`)).body.rows as { pointIndex: number; ns: number }[];
    expect(all).toHaveLength(5);
    expect(new Set(all.map((r) => r.ns)).size).toBe(5);
    const threshold = (all[1]!.ns + all[2]!.ns) / 2;
    const expected = (await pageApi(page, `/scans/${id}/results?ns.gt=${threshold}`)).body;
    expect(expected.total).toBe(2);

    const shownRows = async () => (await page.locator('.ag-row[row-index] .ag-cell[col-id="pointIndex"]').allTextContents()).map(Number).sort((a, b) => a - b);
    await expect.poll(shownRows, { timeout: 15_000 }).toEqual([0, 1, 2, 3, 4]);
    const header = page.locator('.ag-header-cell[col-id="ns"]');
    await header.hover();
    await header.locator('.ag-header-cell-filter-button, .ag-header-cell-menu-button').first().click();
    const filter = page.locator('.ag-filter');
    await filter.waitFor();
    // "Greater than" is the first of the grid's filter options, so it is the one chosen.
    await filter.locator('input[type="number"], input.ag-input-field-input').first().fill(String(threshold));
    await filter.getByRole('button', { name: 'Apply' }).click();
    await expect.poll(shownRows, { timeout: 10_000 }).toEqual((expected.rows as { pointIndex: number }[]).map((r) => r.pointIndex).sort((a, b) => a - b));
    await page.getByRole('status').getByText('2 matching points').waitFor();
    await screenshot(page, 'researcher-filtered');
    expect(unexpectedErrors(browser, []).join('\n')).toBe('');
  });

  it('collaborator: sees the demo scans and their rows, has no "New scan", and the API refuses a submission', async () => {
    const browser = await signedIn(collaborator);
    const { page } = browser;
    const quick = 'Quick check, three E-model points with exact spectra';
    await page.getByRole('link', { name: quick }).waitFor();
    for (const title of ['E-model plateau survey, alpha against N_*', 'Hilltop mu against q at N_* = 55']) await page.getByRole('link', { name: title }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Scans' }).waitFor();
    expect(await nav.getByRole('link', { name: 'New scan' }).count()).toBe(0);
    expect(await nav.getByRole('link', { name: 'Admin' }).count()).toBe(0);
    await screenshot(page, 'collaborator-scans');

    await page.getByRole('link', { name: quick }).click();
    await page.getByRole('heading', { name: quick }).waitFor();
    await page.locator('header').getByText('Done', { exact: true }).waitFor({ timeout: 60_000 });
    await expect.poll(() => page.locator('.ag-row[row-index] .ag-cell[col-id="pointIndex"]').count(), { timeout: 15_000 }).toBe(3);
    expect(await page.getByRole('button', { name: 'Run a copy' }).count()).toBe(0);
    await screenshot(page, 'collaborator-scan');

    const plan = { title: 'A collaborator may not submit', potential: { family: 'quadratic' }, axes: [{ name: 'pivotEfolds', values: [50, 60] }] };
    const refused = await pageApi(page, '/scans', { method: 'POST', body: { plan } });
    expect(refused.status, JSON.stringify(refused.body)).toBe(403);
    expect(unexpectedErrors(browser, [/status of 403/, /^HTTP 403 POST \/api\/v1\/scans$/]).join('\n')).toBe('');
  });

  it("admin: changes the researcher's monthly quota on the Admin page", async () => {
    const browser = await signedIn(admin);
    const { page } = browser;
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Admin' }).click();
    await page.waitForURL(/\/admin$/);
    const row = page.getByRole('row', { name: new RegExp(researcher.email) });
    await row.waitFor();
    await screenshot(page, 'admin-people');
    const before = ((await pageApi(page, '/admin/users')).body.users as { email: string; quota: { monthlyPoints: number; maxRunning: number } }[]).find((u) => u.email === researcher.email)!;
    const monthly = before.quota.monthlyPoints === 1_234_567 ? 7_654_321 : 1_234_567;

    await page.getByRole('button', { name: `Edit the quota of ${researcher.email}` }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Points per month').fill(String(monthly));
    await dialog.getByLabel('Scans computing at once').fill(String(before.quota.maxRunning));
    await screenshot(page, 'admin-quota');
    await dialog.getByRole('button', { name: 'Save the quota' }).click();
    await page.getByText(`Quota of ${researcher.email} saved.`).waitFor();
    await row.getByText(`${monthly.toLocaleString('en-US')} / month`).waitFor();

    const after = ((await pageApi(page, '/admin/users')).body.users as { email: string; quota: { monthlyPoints: number; maxRunning: number; custom: boolean } }[]).find((u) => u.email === researcher.email)!;
    expect(after.quota).toEqual({ monthlyPoints: monthly, maxRunning: before.quota.maxRunning, custom: true });
    expect(unexpectedErrors(browser, []).join('\n')).toBe('');
  });
});
