/**
 * `npm run bench [-- --json] [-- --seconds S] [-- --service-points N (0 skips)] [-- --scaleout [--scaleout-points N]]`:
 * speed figures of the physics core on one core, beside a plain scipy script doing the same work
 * (at the tolerance where its n_s and N_end are as accurate as ours, and at our nominal rtol). --scaleout adds 1 and 2 `rollway worker` processes on a temporary
 * PostgreSQL (200,000 points by default, a few minutes on 2 cores). With --json the last line is
 * one JSON object (the benchmark contract in DESIGN.md).
 */
import { availableParallelism } from 'node:os';
import { DESIGN_REFERENCE_POINTS_PER_SECOND } from './odexReference.ts';
import { measurePhysics } from './physics.ts';
import { measureScaleout } from './scaleout.ts';
import { measureService } from './service.ts';

const args = process.argv.slice(2);
const json = args.includes('--json');
const secondsArg = args.indexOf('--seconds');
const seconds = secondsArg >= 0 ? Number(args[secondsArg + 1]) : 3;

const pointsArg = args.indexOf('--service-points');
const servicePoints = pointsArg >= 0 ? Number(args[pointsArg + 1]) : 100_000;
const physics = await measurePhysics(seconds);
const workers = availableParallelism();
const service = servicePoints > 0 ? await measureService(servicePoints, workers) : undefined;
const scaleoutArg = args.indexOf('--scaleout-points');
const scaleout = args.includes('--scaleout') ? await measureScaleout(scaleoutArg >= 0 ? Number(args[scaleoutArg + 1]) : 200_000) : undefined;
// The raw compute rate the service is compared with: the one-core rate times the worker threads.
const serviceRawRatio = service ? service.servicePointsPerSecond / (physics.fastPointsPerSecond * workers) : undefined;
const figures = { ...physics, ...service, ...(serviceRawRatio === undefined ? {} : { serviceRawRatio }), ...scaleout };
const rows: Array<[string, string]> = [
  ['fast path, starobinsky (points/s, one core)', figures.fastPointsPerSecond.toFixed(0)],
  ['fast path, same potential as custom expression', figures.customExprPointsPerSecond.toFixed(0)],
  ['  built-in / custom speed ratio', figures.customExprRatio.toFixed(2)],
  ['exact spectra, starobinsky (points/s, one core)', figures.exactPointsPerSecond.toFixed(0)],
  [`scipy DOP853 script, equal accuracy: rtol ${figures.baselineRtol.toExponential(0)}`, figures.baselinePointsPerSecond.toFixed(1)],
  ['  its |Δn_s| / |ΔN_end| (ours, fast path)', `${figures.baselineNsError.toExponential(1)} / ${figures.baselineNEndError.toExponential(1)} (${figures.nsErrorFast.toExponential(1)} / ${figures.nEndErrorFast.toExponential(1)})`],
  ['  fast path / scipy, equal accuracy', `${figures.baselineRatio.toFixed(0)}x`],
  ['scipy DOP853 script at our nominal rtol 1e-8', figures.baselineNominalPointsPerSecond.toFixed(1)],
  ['  its |Δn_s| / |ΔN_end|', `${figures.baselineNominalNsError.toExponential(1)} / ${figures.baselineNominalNEndError.toExponential(1)}`],
  ['  fast path / scipy at rtol 1e-8', `${figures.baselineNominalRatio.toFixed(0)}x`],
  [`bare odex reference run (DESIGN.md: ${DESIGN_REFERENCE_POINTS_PER_SECOND}/s)`, figures.odexReferencePointsPerSecond.toFixed(0)],
  ['  fast path / reference (machine speed removed)', figures.fastReferenceRatio.toFixed(2)],
  ['largest |Δn_s| fast, default vs rtol 1e-12', figures.nsErrorFast.toExponential(1)],
  ['largest |Δn_s| exact, default vs rtol 1e-12', figures.nsErrorExact.toExponential(1)],
];
if (service) {
  rows.push(
    [`service, ${service.servicePoints} points, ${workers} workers (points/s)`, service.servicePointsPerSecond.toFixed(0)],
    ['  service / (one-core rate x workers)', serviceRawRatio!.toFixed(2)],
    ['  server peak memory (MB)', service.serverPeakMB.toFixed(0)],
    ['  sorted, filtered 1,000-row page, median (ms)', service.pageQueryMedianMs.toFixed(1)],
  );
}
if (scaleout) {
  rows.push(
    [`scale-out, ${scaleout.scaleoutPoints} points, 1 worker (points/s)`, `${scaleout.workers1PointsPerSecond.toFixed(0)} (steal ${scaleout.workers1StealPercent.toFixed(0)}%)`],
    ['  1 worker before / after the 2-worker run', `${scaleout.workers1BeforePointsPerSecond.toFixed(0)} / ${scaleout.workers1AfterPointsPerSecond.toFixed(0)}`],
    ['  2 worker processes, one thread each (points/s)', `${scaleout.workers2PointsPerSecond.toFixed(0)} (steal ${scaleout.workers2StealPercent.toFixed(0)}%)`],
    ['  2 / 1 workers (target >= 1.7 on 2 cores)', scaleout.scaleoutRatio.toFixed(2)],
    ['  worker CPU a point, 1 / 2 workers (µs)', `${scaleout.workers1CpuMicrosPerPoint.toFixed(0)} / ${scaleout.workers2CpuMicrosPerPoint.toFixed(0)}`],
    ['  compute-thread wall time a point, 1 / 2 (µs)', `${scaleout.workers1ComputeMicrosPerPoint.toFixed(0)} / ${scaleout.workers2ComputeMicrosPerPoint.toFixed(0)}`],
    [`  embedded default, same plan, ${workers} threads`, scaleout.scaleoutEmbeddedPointsPerSecond.toFixed(0)],
  );
}
for (const [label, value] of rows) process.stdout.write(`${label.padEnd(50)}${value}\n`);
if (json) process.stdout.write(`${JSON.stringify(figures)}\n`);
