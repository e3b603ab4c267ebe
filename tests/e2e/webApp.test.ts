import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/demo/demoAccounts.ts';
import { signIn } from '../helpers/auth.ts';
import { api, startTestServer, waitForScan } from '../helpers/server.ts';
import { openBrowser, type TestBrowser } from '../helpers/browser.ts';
import { ensureWebBuild } from './helpers/webBuild.ts';

/**
 * The app shell and scan pages in real Chromium against the real server (demo accounts and scans)
 * serving a fresh build: sign-in with a wrong then the right password, the demo scans in the list,
 * a finished scan's grid with rows from the server sorted by a column, stopping a running scan,
 * and the tokens page. Screenshots of each screen go to tests/.artifacts/.
 */
const researcher = DEMO_ACCOUNTS.find((a) => a.role === 'researcher')!;
const QUICK = 'Quick check, three E-model points with exact spectra';

let server: Awaited<ReturnType<typeof startTestServer>>;
let browser: TestBrowser;
let quickId: number;
const ARTIFACTS = join(process.cwd(), 'tests/.artifacts');
const screenshot = async (name: string) => void (await browser.page.screenshot({ path: join(ARTIFACTS, `${name}.png`), fullPage: true }));

beforeAll(async () => {
  await ensureWebBuild();
  server = await startTestServer({ ROLLWAY_WORKERS: '2', ROLLWAY_DEFAULT_MAX_RUNNING: '10' }, { demo: true });
  browser = await openBrowser({ width: 1400, height: 900 });
  browser.page.setDefaultTimeout(15_000);
  // The console names no URL for a failed load; this does (and says which answer it was).
  browser.page.on('response', (r) => r.status() >= 400 && browser.consoleErrors.push(`HTTP ${r.status()} ${r.request().method()} ${new URL(r.url()).pathname}`));
  mkdirSync(ARTIFACTS, { recursive: true });
  const { body } = await api(server.url, '/scans');
  quickId = (body.scans as { id: number; title: string }[]).find((s) => s.title === QUICK)!.id;
  await waitForScan(server.url, quickId);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

/** Chromium reports every 4xx answer on the console; the 401s of signing in are expected. */
const EXPECTED = [/status of 401/, /^HTTP 401 GET \/api\/v1\/auth\/me$/, /^HTTP 401 POST \/api\/v1\/auth\/login$/];
const unexpectedErrors = () => browser.consoleErrors.filter((e) => !EXPECTED.some((p) => p.test(e)));

describe('web app', () => {
  it('keeps the focus where the visitor puts it on the sign-in page', async () => {
    // Timers of the page run only when the test says so: a focus the page defers (Vuetify's
    // autofocus waits 50 ms, longer on a busy machine) would land between the two halves typed
    // into the password field and take the second half into the e-mail field.
    // A browser of its own: the clock is installed for a whole browser context.
    const own = await openBrowser({ width: 1400, height: 900 });
    const { page } = own;
    try {
      await page.clock.install({ time: new Date('2026-01-01T00:00:00Z') });
      await page.clock.pauseAt(new Date('2026-01-01T00:00:01Z'));
      await page.goto(`${server.url}/sign-in`);
      const email = page.getByLabel('E-mail');
      const password = page.getByLabel('Password');
      await password.waitFor();
      await expect.poll(() => email.evaluate((el) => el === el.ownerDocument.activeElement)).toBe(true);
      await password.focus();
      await page.keyboard.type('first-');
      await page.clock.runFor(2000);
      await page.keyboard.type('second');
      expect(await password.inputValue()).toBe('first-second');
      expect(await email.inputValue()).toBe('');
    } finally {
      await own.close();
    }
  });

  it('sends a visitor to sign in and back to the page asked for, with one message for any wrong login', async () => {
    const { page } = browser;
    await page.goto(`${server.url}/scans/${quickId}`);
    await page.waitForURL(/\/sign-in\?next=/);
    await screenshot('sign-in');
    await page.getByLabel('E-mail').fill(researcher.email);
    await page.getByLabel('Password').fill('not the password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('That e-mail and password do not match an active account.').waitFor();
    await page.getByLabel('Password').fill(researcher.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(`${server.url}/scans/${quickId}`);
    await page.getByRole('heading', { name: QUICK }).waitFor();
  });

  it('lists the demo scans with their state and owner', async () => {
    const { page } = browser;
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Scans' }).click();
    await page.waitForURL(/\/scans$/);
    const row = page.getByRole('row', { name: new RegExp(QUICK) });
    await row.waitFor();
    expect(await row.textContent()).toMatch(/Done.*3 \/ 3.*Iris/);
    for (const title of ['E-model plateau survey, alpha against N_*', 'Hilltop mu against q at N_* = 55']) await page.getByRole('link', { name: title }).waitFor();
    await page.getByRole('textbox', { name: 'Search titles' }).fill('hilltop');
    await expect.poll(() => page.getByRole('link', { name: QUICK }).count()).toBe(0);
    await page.getByRole('textbox', { name: 'Search titles' }).fill('');
    await screenshot('scans-list');
  });

  it("shows a scan's rows from the server and sorts them by a column on the server", async () => {
    const { page } = browser;
    await page.getByRole('link', { name: QUICK }).click();
    await page.waitForURL(`${server.url}/scans/${quickId}`);
    // The point index of each displayed row, in row order (AG Grid renders rows absolutely positioned).
    const order = async () => (await page.locator('.ag-row[row-index] .ag-cell[col-id="pointIndex"]').evaluateAll((cells) =>
      cells.map((cell) => [Number(cell.closest('.ag-row')?.getAttribute('row-index')), Number(cell.textContent)] as const)))
      .sort((a, b) => a[0] - b[0]).map(([, point]) => point);
    await expect.poll(order, { timeout: 15_000 }).toEqual([0, 1, 2]);
    expect(await page.locator('.ag-row[row-index="1"] .ag-cell[col-id="ns"]').textContent()).toMatch(/^0\.9\d{5}$/);
    const sorted = (await api(server.url, `/scans/${quickId}/results?sort=ns&order=desc`)).body.rows as { pointIndex: number }[];
    await page.locator('.ag-header-cell[col-id="ns"] .ag-header-cell-label').click(); // ascending
    await page.locator('.ag-header-cell[col-id="ns"] .ag-header-cell-label').click(); // descending
    await expect.poll(order, { timeout: 10_000 }).toEqual(sorted.map((r) => r.pointIndex));
    expect(new Set(sorted.map((r) => r.pointIndex)).size).toBe(3);
    await screenshot('scan-page');
    await page.getByRole('tab', { name: 'Plan & provenance' }).click();
    await page.getByLabel('Plan text').waitFor();
    expect(await page.getByLabel('Plan text').textContent()).toContain('family: e-model');
  });

  it('stops a running scan from its page', async () => {
    const { page } = browser;
    const token = await signIn(server.url, researcher.email, researcher.password);
    // 200,000 points: minutes of work on two threads, so it is surely still running when stopped.
    const plan = { title: 'E2E: a long scan to stop', potential: { family: 'e-model' }, axes: [{ name: 'alpha', logRange: { from: 0.1, to: 10, count: 400 } }, { name: 'pivotEfolds', range: { from: 45, to: 65, count: 500 } }] };
    const submitted = await api(server.url, '/scans', { method: 'POST', body: JSON.stringify({ plan }), headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' } });
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(201);
    const id = submitted.body.id as number;
    await waitForScan(server.url, id, 60_000, (s) => s.state === 'running' && s.pointsDone > 0);
    await page.goto(`${server.url}/scans/${id}`);
    await page.getByText('live', { exact: true }).waitFor();
    await page.getByRole('button', { name: 'Stop the scan' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Stop the scan' }).click();
    await page.getByText('Stopped', { exact: true }).waitFor();
    expect((await api(server.url, `/scans/${id}`)).body.state).toBe('cancelled');
    await screenshot('scan-stopped');
  });

  it('creates an API token, shows its secret once, and revokes it', async () => {
    const { page } = browser;
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Tokens' }).click();
    await page.getByRole('button', { name: 'New token' }).click();
    await page.getByLabel('Name').fill('e2e notebook');
    await page.getByRole('button', { name: 'Create the token' }).click();
    const secret = await page.getByTestId('token-secret').locator('input').inputValue();
    expect(secret).toMatch(/^rwt_/);
    expect((await api(server.url, '/scans', { headers: { authorization: `Bearer ${secret}` } })).status).toBe(200);
    await page.getByRole('button', { name: 'I have copied it' }).click();
    const row = page.getByRole('row', { name: /e2e notebook/ });
    await row.waitFor();
    await screenshot('tokens');
    await row.getByRole('button', { name: 'Revoke' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Revoke' }).click();
    await expect.poll(() => row.count()).toBe(0);
    expect((await api(server.url, '/scans', { headers: { authorization: `Bearer ${secret}` } })).status).toBe(401);
  });

  it('logged no unexpected console errors', () => {
    expect(unexpectedErrors().join('\n')).toBe('');
  });
});
