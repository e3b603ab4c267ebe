import { pino } from 'pino';
import { TERMINAL_STATES } from '../../shared/api/scans.ts';
import { loadConfig } from '../../server/config.ts';
import { startServer, type RunningServer } from '../../server/startServer.ts';
import { attachCredential, signIn, TEST_ADMIN, TEST_ADMIN_ENV } from './auth.ts';

/**
 * The real server on an ephemeral loopback port, in-memory PGlite unless a data dir is given,
 * mail off unless asked for. Requests from the test to it are signed in as TEST_ADMIN unless
 * they send their own Authorization header (see attachCredential).
 */
export async function startTestServer(env: Record<string, string> = {}, options: { demo?: boolean } = {}): Promise<RunningServer & { adminToken: string }> {
  const config = loadConfig({ PORT: '0', HOST: '127.0.0.1', DATA_DIR: 'memory://', ROLLWAY_WORKERS: '2', LOG_LEVEL: 'silent', ROLLWAY_MAIL: 'off', ...TEST_ADMIN_ENV, ...env });
  const server = await startServer(config, pino({ level: 'silent' }), options);
  const adminToken = await signIn(server.url, TEST_ADMIN.email, TEST_ADMIN.password);
  attachCredential(server.url, adminToken);
  return Object.assign(server, { adminToken });
}

export async function api<T = any>(base: string, path: string, init: RequestInit & { json?: unknown } = {}): Promise<{ status: number; body: T }> {
  const { json, ...rest } = init;
  const response = await fetch(`${base}/api/v1${path}`, {
    ...rest,
    ...(json === undefined ? {} : { body: JSON.stringify(json), headers: { 'content-type': 'application/json' } }),
  });
  const text = await response.text();
  return { status: response.status, body: (text ? JSON.parse(text) : undefined) as T };
}

/** Polls a scan until it reaches a final state or the time runs out (bounded, as every test loop). */
export async function waitForScan(base: string, id: number, timeoutMs = 60_000, until: (s: any) => boolean = (s) => TERMINAL_STATES.has(s.state)): Promise<any> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const { body } = await api(base, `/scans/${id}`);
    if (until(body)) return body;
    if (Date.now() > deadline) throw new Error(`scan ${id} still ${body.state} after ${timeoutMs} ms (${body.pointsDone}/${body.pointCount})`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
