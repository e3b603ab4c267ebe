/**
 * `npm run bench [-- --json] [-- --seconds S]`: speed figures of the physics core on one core,
 * beside a plain scipy script doing the same work at the same tolerance. With --json the last
 * line is one JSON object (the benchmark contract in DESIGN.md).
 */
import { measurePhysics } from './physics.ts';

const args = process.argv.slice(2);
const json = args.includes('--json');
const secondsArg = args.indexOf('--seconds');
const seconds = secondsArg >= 0 ? Number(args[secondsArg + 1]) : 3;

const figures = measurePhysics(seconds);
const rows: Array<[string, string]> = [
  ['fast path, starobinsky (points/s, one core)', figures.fastPointsPerSecond.toFixed(0)],
  ['fast path, same potential as custom expression', figures.customExprPointsPerSecond.toFixed(0)],
  ['  built-in / custom speed ratio', figures.customExprRatio.toFixed(2)],
  ['exact spectra, starobinsky (points/s, one core)', figures.exactPointsPerSecond.toFixed(0)],
  ['scipy DOP853 script, same work, rtol 1e-8', figures.baselinePointsPerSecond.toFixed(1)],
  ['  fast path / scipy', `${figures.baselineRatio.toFixed(0)}x`],
  ['largest |Δn_s| fast, default vs rtol 1e-12', figures.nsErrorFast.toExponential(1)],
  ['largest |Δn_s| exact, default vs rtol 1e-12', figures.nsErrorExact.toExponential(1)],
];
for (const [label, value] of rows) process.stdout.write(`${label.padEnd(50)}${value}\n`);
if (json) process.stdout.write(`${JSON.stringify(figures)}\n`);
