import { spawn } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * End to end: a fast scan of `points` Starobinsky points through the real `rollway serve` child
 * process (PGlite on disk, local workers), its points/s, the server's peak resident memory
 * (VmHWM), and the median time of a sorted, filtered 1,000-row page.
 */
export interface ServiceFigures {
  servicePointsPerSecond: number;
  serverPeakMB: number;
  pageQueryMedianMs: number;
  servicePoints: number;
  serviceWorkers: number;
}

const BIN = new URL('../cli/bin.mjs', import.meta.url).pathname;

async function peakMB(pid: number): Promise<number> {
  const status = await readFile(`/proc/${pid}/status`, 'utf8');
  return Number(/VmHWM:\s+(\d+)/.exec(status)![1]) / 1024;
}

const ADMIN = { email: 'bench@rollway.test', password: 'bench-admin-password' };
let authorization = '';

async function json<T>(url: string, init: RequestInit = {}): Promise<T> {
  const res = await fetch(url, { ...init, headers: { ...(init.headers as Record<string, string>), authorization } });
  if (!res.ok) throw new Error(`${url}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

export async function measureService(points: number, workers: number): Promise<ServiceFigures> {
  const dataDir = await mkdtemp(join(tmpdir(), 'rollway-bench-'));
  const child = spawn(process.execPath, [BIN, 'serve', '--port', '0', '--data-dir', dataDir], {
    env: { ...process.env, LOG_LEVEL: 'warn', ROLLWAY_WORKERS: String(workers), ROLLWAY_MAIL: 'off', ROLLWAY_ADMIN_EMAIL: ADMIN.email, ROLLWAY_ADMIN_PASSWORD: ADMIN.password },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  try {
    const base = await new Promise<string>((resolve, reject) => {
      let out = '';
      child.stdout.on('data', (c: Buffer) => {
        out += c.toString();
        const m = /listening on (http:\S+)/.exec(out);
        if (m) resolve(m[1]!);
      });
      child.once('exit', (code) => reject(new Error(`server exited ${code}`)));
    });
    const login = await json<{ token: string }>(`${base}/api/v1/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ ...ADMIN, returnToken: true }) });
    authorization = `Bearer ${login.token}`;
    const planText = `title: service benchmark\npotential: { family: starobinsky }\naxes:\n  - { name: pivotEfolds, range: { from: 50, to: 60, count: ${points} } }\n`;
    const scan = await json<{ id: number }>(`${base}/api/v1/scans`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ planText }) });
    const deadline = Date.now() + 30 * 60_000;
    let view: { state: string; pointsDone: number; startedAt: string; finishedAt: string | null };
    for (;;) {
      view = await json(`${base}/api/v1/scans/${scan.id}`);
      if (view.state !== 'queued' && view.state !== 'running') break;
      if (Date.now() > deadline) throw new Error('service benchmark timed out');
      await new Promise((r) => setTimeout(r, 250));
    }
    if (view.state !== 'completed') throw new Error(`benchmark scan ended ${view.state}`);
    const seconds = (Date.parse(view.finishedAt!) - Date.parse(view.startedAt)) / 1000;
    // 20 consecutive pages as a grid scrolls them: sorted by r, filtered on n_s, keyset cursor.
    const times: number[] = [];
    let cursor: string | null = null;
    for (let i = 0; i < 20; i++) {
      const t0 = performance.now();
      const query = `limit=1000&sort=r&order=desc&ns.gte=0.96${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`;
      const page: { nextCursor: string | null } = await json(`${base}/api/v1/scans/${scan.id}/results?${query}`);
      times.push(performance.now() - t0);
      cursor = page.nextCursor;
    }
    times.sort((a, b) => a - b);
    return {
      servicePointsPerSecond: points / seconds,
      serverPeakMB: await peakMB(child.pid!),
      pageQueryMedianMs: (times[9]! + times[10]!) / 2,
      servicePoints: points,
      serviceWorkers: workers,
    };
  } finally {
    child.kill('SIGTERM');
    await new Promise((r) => child.once('exit', r));
    await rm(dataDir, { recursive: true, force: true });
  }
}
