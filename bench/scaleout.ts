import { mkdtemp, rm } from 'node:fs/promises';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pino } from 'pino';
import { openEmbedded, type Embedded } from '../server/embedded.ts';
import { startPostgres } from '../tests/helpers/postgres.ts';
import { createDatabase, startWorker, STAROBINSKY, waitForScan, type WorkerProcess } from '../tests/scaleout/cluster.ts';
import { cpuTicks, processCpuSeconds, stealPercent } from './cpuTime.ts';

/**
 * Scale-out figures: the same fast Starobinsky scan computed by 1, then 2, then again 1
 * `rollway worker` processes (one thread each) against a temporary PostgreSQL server on this
 * machine, the server computing nothing itself (ROLLWAY_WORKERS=0). points/s run from the scan's
 * start to its end (database timestamps), so worker start-up is not counted. A fresh database per
 * run. This machine's speed drifts by up to 2x within an hour, so the 1-worker figure is the mean
 * of the runs before and after the 2-worker run: a steady drift then cancels from the ratio.
 * Beside them the embedded default (PGlite on disk, one local thread per core) on the same plan.
 */
export interface ScaleoutFigures {
  scaleoutPoints: number;
  /** Mean of the two 1-worker runs, before and after the 2-worker run (each also given). */
  workers1PointsPerSecond: number;
  workers1BeforePointsPerSecond: number;
  workers1AfterPointsPerSecond: number;
  workers2PointsPerSecond: number;
  /** workers2 / workers1; the target is >= 1.7 on 2 cores. */
  scaleoutRatio: number;
  scaleoutEmbeddedPointsPerSecond: number;
  /** CPU time the hypervisor took during each run (bench/cpuTime.ts), to read the ratio by. */
  workers1StealPercent: number;
  workers2StealPercent: number;
  /**
   * Per point: CPU of the worker processes (all their threads), and the time a point spent
   * inside its compute thread (the rows' compute_ms, wall clock). The work is the same in both
   * runs, so CPU that rises from 1 to 2 workers means the cores slowed each other (shared
   * physical cores, caches); wall time that rises beyond it means the compute threads waited for
   * a core PostgreSQL or the server had.
   */
  workers1CpuMicrosPerPoint: number;
  workers2CpuMicrosPerPoint: number;
  workers1ComputeMicrosPerPoint: number;
  workers2ComputeMicrosPerPoint: number;
}

interface Run {
  pointsPerSecond: number;
  stealPercent: number;
  computeMicrosPerPoint: number;
  cpuMicrosPerPoint: number;
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

async function timedScan(core: Embedded, points: number, workerPids: readonly number[] = []): Promise<Run> {
  const cpu = () => workerPids.reduce((sum, pid) => sum + processCpuSeconds(pid), 0);
  const cpuBefore = cpu();
  const before = cpuTicks();
  const scan = await core.scans.submit({ planText: benchPlan(points) });
  const done = await waitForScan(core, scan.id, 30 * 60_000);
  if (done.state !== 'completed') throw new Error(`benchmark scan ended ${done.state}`);
  return {
    pointsPerSecond: points / ((Date.parse(done.finishedAt!) - Date.parse(done.startedAt!)) / 1000),
    stealPercent: stealPercent(before, cpuTicks()),
    computeMicrosPerPoint: (done.computeSeconds / points) * 1e6,
    cpuMicrosPerPoint: ((cpu() - cpuBefore) / points) * 1e6,
  };
}

async function withWorkers(serverUrl: string, count: number, points: number, label: string): Promise<Run> {
  const url = await createDatabase(serverUrl, `bench_${label}`);
  const core = await openEmbedded({ databaseUrl: url, workers: 0, batchSize: 500, logger: pino({ level: 'warn' }) });
  const workers: WorkerProcess[] = [];
  try {
    for (let i = 0; i < count; i++) workers.push(await startWorker(url, 1));
    return await timedScan(core, points, workers.map((w) => w.child.pid!));
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

/** Two runs of the same scan as one: points/s over their summed time, the other figures averaged. */
function mean(a: Run, b: Run): Run {
  const average = (key: keyof Run) => (a[key] + b[key]) / 2;
  return {
    pointsPerSecond: 2 / (1 / a.pointsPerSecond + 1 / b.pointsPerSecond),
    stealPercent: average('stealPercent'),
    computeMicrosPerPoint: average('computeMicrosPerPoint'),
    cpuMicrosPerPoint: average('cpuMicrosPerPoint'),
  };
}

export async function measureScaleout(points: number): Promise<ScaleoutFigures> {
  const postgres = await startPostgres();
  try {
    const before = await withWorkers(postgres.url, 1, points, '1_worker_before');
    const two = await withWorkers(postgres.url, 2, points, '2_workers');
    const after = await withWorkers(postgres.url, 1, points, '1_worker_after');
    const one = mean(before, after);
    return {
      scaleoutPoints: points,
      workers1PointsPerSecond: one.pointsPerSecond,
      workers1BeforePointsPerSecond: before.pointsPerSecond,
      workers1AfterPointsPerSecond: after.pointsPerSecond,
      workers2PointsPerSecond: two.pointsPerSecond,
      scaleoutRatio: two.pointsPerSecond / one.pointsPerSecond,
      scaleoutEmbeddedPointsPerSecond: (await embedded(points)).pointsPerSecond,
      workers1StealPercent: one.stealPercent,
      workers2StealPercent: two.stealPercent,
      workers1CpuMicrosPerPoint: one.cpuMicrosPerPoint,
      workers2CpuMicrosPerPoint: two.cpuMicrosPerPoint,
      workers1ComputeMicrosPerPoint: one.computeMicrosPerPoint,
      workers2ComputeMicrosPerPoint: two.computeMicrosPerPoint,
    };
  } finally {
    await postgres.destroy();
  }
}
