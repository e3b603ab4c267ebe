import { readdirSync, readFileSync } from 'node:fs';
import { pino } from 'pino';
import { openEmbedded } from '../server/embedded.ts';
import { startPostgres } from '../tests/helpers/postgres.ts';
import { createDatabase, startWorker, STAROBINSKY, waitForScan } from '../tests/scaleout/cluster.ts';
import { cpuSecondsOf as cpuSeconds } from './cpuTime.ts';

/**
 * Where the CPU of a scale-out scan goes, per point: PostgreSQL's processes, each worker
 * process's main thread and its other threads (the compute thread, V8's platform threads), and
 * this process (the server, computing nothing). Read from /proc just before the scan is submitted
 * and after it completes, so start-up is not counted.
 *   npx tsx --tsconfig tsconfig.base.json bench/scaleoutCpu.ts [points=100000] [workers=2] [batchSize=500]
 */
function snapshot(workerPids: readonly number[]): Map<string, number> {
  const seconds = new Map<string, number>();
  const add = (key: string, s: number) => seconds.set(key, (seconds.get(key) ?? 0) + s);
  for (const entry of readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
    const pid = Number(entry);
    try {
      if (workerPids.includes(pid)) {
        const w = workerPids.indexOf(pid) + 1;
        for (const tid of readdirSync(`/proc/${pid}/task`)) {
          add(tid === entry ? `worker ${w} main thread` : `worker ${w} other threads`, cpuSeconds(`/proc/${pid}/task/${tid}/stat`));
        }
      } else if (readFileSync(`/proc/${pid}/cmdline`, 'utf8').startsWith('postgres')) add('postgresql', cpuSeconds(`/proc/${pid}/stat`));
      else if (pid === process.pid) add('server (this process)', cpuSeconds(`/proc/${pid}/stat`));
    } catch {
      // the process ended while being read
    }
  }
  return seconds;
}

const [points = 100_000, workerCount = 2, batchSize = 500] = process.argv.slice(2).map(Number);
const postgres = await startPostgres();
try {
  const url = await createDatabase(postgres.url, 'cpu_account');
  const core = await openEmbedded({ databaseUrl: url, workers: 0, batchSize, logger: pino({ level: 'warn' }) });
  const workers = [];
  for (let i = 0; i < workerCount; i++) workers.push(await startWorker(url, 1));
  const pids = workers.map((w) => w.child.pid!);
  const before = snapshot(pids);
  const scan = await core.scans.submit({ planText: STAROBINSKY('CPU accounting', points) });
  const done = await waitForScan(core, scan.id, 30 * 60_000);
  const after = snapshot(pids);
  const seconds = (Date.parse(done.finishedAt!) - Date.parse(done.startedAt!)) / 1000;
  console.log(`${points} points, ${workerCount} worker(s), batches of ${batchSize}: ${(points / seconds).toFixed(0)} points/s`);
  for (const [key, s] of after) {
    const used = s - (before.get(key) ?? 0);
    console.log(`${key.padEnd(26)} ${used.toFixed(2).padStart(7)} s  ${((used / points) * 1e6).toFixed(1).padStart(7)} µs a point`);
  }
  for (const w of workers) w.child.kill('SIGTERM');
  await Promise.all(workers.map((w) => w.exited));
  await core.close();
} finally {
  await postgres.destroy();
}
