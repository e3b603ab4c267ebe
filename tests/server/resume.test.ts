import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { attachCredential, signIn, TEST_ADMIN, TEST_ADMIN_ENV } from '../helpers/auth.ts';
import { api, waitForScan } from '../helpers/server.ts';

const BIN = new URL('../../cli/bin.mjs', import.meta.url).pathname;
const PLAN = 'title: resume after kill -9\npotential: { family: starobinsky }\naxes:\n  - { name: pivotEfolds, range: { from: 45, to: 65, count: 12000 } }\n';

/** Starts `rollway serve` as a real child process, signed in as the test admin once it listens. */
async function serve(dataDir: string): Promise<{ child: ChildProcess; base: string }> {
  const started = await spawnServe(dataDir);
  attachCredential(started.base, await signIn(started.base, TEST_ADMIN.email, TEST_ADMIN.password));
  return started;
}

function spawnServe(dataDir: string): Promise<{ child: ChildProcess; base: string }> {
  const child = spawn(process.execPath, [BIN, 'serve', '--port', '0', '--data-dir', dataDir], {
    env: { ...process.env, LOG_LEVEL: 'warn', ROLLWAY_WORKERS: '2', ROLLWAY_MAIL: 'off', ...TEST_ADMIN_ENV },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  return new Promise((resolve, reject) => {
    let out = '';
    // Generous: a loaded 2-core machine has taken over a minute to start PGlite and the pool.
    const timer = setTimeout(() => reject(new Error(`server did not start: ${out}`)), 120_000);
    child.stdout!.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const match = /listening on (http:\/\/127\.0\.0\.1:\d+)/.exec(out);
      if (match) {
        clearTimeout(timer);
        resolve({ child, base: match[1]! });
      }
    });
    child.once('exit', (code) => reject(new Error(`server exited with ${code}: ${out}`)));
  });
}

const exited = (child: ChildProcess) => new Promise((r) => (child.exitCode !== null ? r(null) : child.once('exit', r)));

describe('nothing is lost when the server is killed mid-scan', () => {
  const dirs: string[] = [];
  afterAll(async () => {
    for (const d of dirs) await rm(d, { recursive: true, force: true });
  });

  it('resumes after kill -9 and stores every point exactly once', async () => {
    const dataDir = await mkdtemp(join(tmpdir(), 'rollway-resume-'));
    dirs.push(dataDir);
    const first = await serve(dataDir);
    const created = await api(first.base, '/scans', { method: 'POST', json: { planText: PLAN } });
    expect(created.status).toBe(201);
    const partway = await waitForScan(first.base, created.body.id, 60_000, (s) => s.pointsDone >= 1000);
    expect(partway.pointsDone).toBeLessThan(12_000);
    first.child.kill('SIGKILL');
    await exited(first.child);

    const second = await serve(dataDir);
    try {
      const done = await waitForScan(second.base, created.body.id, 120_000);
      expect(done.state).toBe('completed');
      expect(done.pointsDone).toBe(12_000);
      // The primary key (scan, point index) makes a re-run batch conflict instead of duplicate;
      // the total row count and the counter must both be exactly the plan's size.
      const page = await api(second.base, `/scans/${created.body.id}/results?limit=1`);
      expect(page.body.total).toBe(12_000);
      const summary = await api(second.base, `/scans/${created.body.id}/summary`);
      expect(summary.body.total).toBe(12_000);
      expect(summary.body.byStatus.ok).toBe(12_000);
    } finally {
      second.child.kill('SIGTERM');
      await exited(second.child);
    }
  }, 240_000);
});
