import { execFile } from 'node:child_process';
import { chown, mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir, userInfo } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';

const BIN = '/usr/lib/postgresql/15/bin';
const run = promisify(execFile);

export interface TestPostgres {
  /** postgres://postgres@127.0.0.1:PORT/postgres (trust authentication on loopback only). */
  url: string;
  port: number;
  /** Fast shutdown (open connections are terminated) and start again on the same port and data. */
  restart(pauseMs?: number): Promise<void>;
  stop(): Promise<void>;
  /** Stops the server and removes its data directory. */
  destroy(): Promise<void>;
}

/** A port the kernel just handed out and took back; free unless something grabs it in between. */
async function freePort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as { port: number };
  await new Promise((resolve) => server.close(resolve));
  return port;
}

/**
 * A real PostgreSQL 15 server (Debian's package) in a temporary data directory, on 127.0.0.1 only.
 * PostgreSQL refuses to run as root, so when the tests run as root initdb and pg_ctl run as the
 * `postgres` OS user. fsync is off: the tests restart the server with a clean shutdown, never a crash.
 */
export async function startPostgres(): Promise<TestPostgres> {
  const dir = await mkdtemp(join(tmpdir(), 'rollway-pg-'));
  const asRoot = userInfo().uid === 0;
  if (asRoot) await chown(dir, Number((await run('id', ['-u', 'postgres'])).stdout), Number((await run('id', ['-g', 'postgres'])).stdout));
  const as = (command: string, args: string[]) => (asRoot ? run('runuser', ['-u', 'postgres', '--', `${BIN}/${command}`, ...args]) : run(`${BIN}/${command}`, args));
  const data = join(dir, 'data');
  const port = await freePort();
  await as('initdb', ['-D', data, '-A', 'trust', '-U', 'postgres', '-E', 'UTF8', '--no-sync']);
  const options = `-p ${port} -h 127.0.0.1 -k ${dir} -c fsync=off -c max_connections=100`;
  const start = () => as('pg_ctl', ['-D', data, '-l', join(dir, 'log'), '-w', '-t', '30', '-o', options, 'start']);
  let running = false;
  const stop = async () => {
    if (!running) return;
    await as('pg_ctl', ['-D', data, '-m', 'fast', '-w', 'stop']);
    running = false;
  };
  await start();
  running = true;
  return {
    url: `postgres://postgres@127.0.0.1:${port}/postgres`,
    port,
    async restart(pauseMs = 0) {
      await stop();
      await new Promise((r) => setTimeout(r, pauseMs));
      await start();
      running = true;
    },
    stop,
    async destroy() {
      await stop().catch(() => undefined);
      await rm(dir, { recursive: true, force: true });
    },
  };
}
