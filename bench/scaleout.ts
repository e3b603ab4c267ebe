import { mkdtemp, rm } from 'node:fs/promises';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pino } from 'pino';
import { openEmbedded, type Embedded } from '../server/embedded.ts';
import { startPostgres } from '../tests/helpers/postgres.ts';
import { createDatabase, startWorker, STAROBINSKY, waitForScan, type WorkerProcess } from '../tests/scaleout/cluster.ts';
import { cpuTicks, stealPercent } from './steal.ts';

/**
 * Scale-out figures: the same fast Starobinsky scan computed by 1 and then 2 `rollway worker`
 * processes (one thread each) against a temporary PostgreSQL server on this machine, the server
 * computing nothing itself (ROLLWAY_WORKERS=0). points/s run from the scan's start to its end
 * (database timestamps), so worker start-up is not counted. A fresh database per run. Beside
 * them the embedded default (PGlite on disk, one local thread per core) on the same plan.
 */
export interface ScaleoutFigures {
  scaleoutPoints: number;
  workers1PointsPerSecond: number;
  workers2PointsPerSecond: number;
  /** workers2 / workers1; the target is >= 1.7 on 2 cores. */
  scaleoutRatio: number;
  scaleoutEmbeddedPointsPerSecond: number;
  /** CPU time the hypervisor took during each run (bench/steal.ts), to read the ratio by. */
  workers1StealPercent: number;
  workers2StealPercent: number;
}

interface Run {
  pointsPerSecond: number;
  stealPercent: number;
}

/**
 * The scan: `points` fast Starobinsky points. An axis holds at most 100,000 values, so larger
 * scans repeat the N_* axis for a few values of the scale V0, which costs the same per point.
 */
function benchPlan(points: number): string {
  const copies = Math.ceil(points / 100_000);
  if (points % copies !== 0) throw new Error(`--scaleout-points: ${points} must be a multiple of ${copies} above 100,000`);
  if (copies === 1) return STAROBINSKY('scale-out benchmark', points);
  const scales = Array.from({ length: copies }, (_, i) => i + 1).join(', ');
  return `${STAROBINSKY('scale-out benchmark', points / copies)}  - { name: V0, values: [${scales}] }\n`;
}

async function timedScan(core: Embedded, points: number): Promise<Run> {
  const before = cpuTicks();
  const scan = await core.scans.submit({ planText: benchPlan(points) });
  const done = await waitForScan(core, scan.id, 30 * 60_000);
  if (done.state !== 'completed') throw new Error(`benchmark scan ended ${done.state}`);
  return {
    pointsPerSecond: points / ((Date.parse(done.finishedAt!) - Date.parse(done.startedAt!)) / 1000),
    stealPercent: stealPercent(before, cpuTicks()),
  };
}

async function withWorkers(serverUrl: string, count: number, points: number): Promise<Run> {
  const url = await createDatabase(serverUrl, `bench_${count}_workers`);
  const core = await openEmbedded({ databaseUrl: url, workers: 0, batchSize: 500, logger: pino({ level: 'warn' }) });
  const workers: WorkerProcess[] = [];
  try {
    for (let i = 0; i < count; i++) workers.push(await startWorker(url, 1));
    return await timedScan(core, points);
  } finally {
    for (const w of workers) w.child.kill('SIGTERM');
    await Promise.all(workers.map((w) => w.exited));
    await core.close();
  }
}

async function embedded(points: number): Promise<Run> {
  const dataDir = await mkdtemp(join(tmpdir(), 'rollway-bench-embedded-'));
  const core = await openEmbedded({ dataDir, workers: availableParallelism(), batchSize: 500, logger: pino({ level: 'warn' }) });
  try {
    return await timedScan(core, points);
  } finally {
    await core.close();
    await rm(dataDir, { recursive: true, force: true });
  }
}

export async function measureScaleout(points: number): Promise<ScaleoutFigures> {
  const postgres = await startPostgres();
  try {
    const one = await withWorkers(postgres.url, 1, points);
    const two = await withWorkers(postgres.url, 2, points);
    return {
      scaleoutPoints: points,
      workers1PointsPerSecond: one.pointsPerSecond,
      workers2PointsPerSecond: two.pointsPerSecond,
      scaleoutRatio: two.pointsPerSecond / one.pointsPerSecond,
      scaleoutEmbeddedPointsPerSecond: (await embedded(points)).pointsPerSecond,
      workers1StealPercent: one.stealPercent,
      workers2StealPercent: two.stealPercent,
    };
  } finally {
    await postgres.destroy();
  }
}
