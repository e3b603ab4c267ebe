import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { fileURLToPath } from 'node:url';
import { computePoint } from '../shared/physics/point/computePoint.ts';
import { preparePoint, preparePotential } from '../shared/physics/point/preparePoint.ts';
import type { PointInput } from '../shared/physics/point/types.ts';
import { pointRequestSchema, type PotentialSpec } from '../shared/plan/pointRequest.ts';
import { callsPerCpuSecond } from './measure.ts';
import { odexReferenceRate } from './odexReference.ts';

const execFileAsync = promisify(execFile);

/** The benchmark's work: one Starobinsky point per call, N_* cycling over 64 values in [50, 60]. */
const PIVOTS = Array.from({ length: 64 }, (_, i) => 50 + (10 * i) / 63);
const STAROBINSKY_EXPRESSION = 'V0 * (1 - exp(-sqrt(2/3) * phi))^2';

function inputs(potential: PotentialSpec, exact: boolean, rtol?: number): PointInput[] {
  const prepared = preparePotential(potential, []);
  return PIVOTS.map((efolds) => preparePoint(pointRequestSchema.parse({
    potential, pivot: { efolds }, exact, ...(rtol === undefined ? {} : { precision: { rtol } }),
  }), prepared));
}

function rate(potential: PotentialSpec, exact: boolean, seconds: number): { pointsPerSecond: number; evaluationsPerPoint: number } {
  const work = inputs(potential, exact);
  let evaluations = 0;
  let points = 0;
  const pointsPerSecond = callsPerCpuSecond((i) => {
    const result = computePoint(work[i % work.length]!);
    if (result.status !== 'ok') throw new Error(`benchmark point failed: ${result.reason}`);
    evaluations += result.evaluations;
    points++;
  }, seconds, exact ? 30 : 200);
  return { pointsPerSecond, evaluationsPerPoint: evaluations / points };
}

/** Largest n_s and N_end differences between the default precision and rtol = 1e-12 over the benchmark's points. */
function errorsAtDefault(exact: boolean): { ns: number; nEnd: number } {
  const coarse = inputs({ family: 'starobinsky' }, exact);
  const fine = inputs({ family: 'starobinsky' }, exact, 1e-12);
  let ns = 0;
  let nEnd = 0;
  for (let i = 0; i < PIVOTS.length; i += 4) {
    const a = computePoint(coarse[i]!);
    const b = computePoint(fine[i]!);
    ns = Math.max(ns, Math.abs((exact ? a.exact!.ns : a.ns) - (exact ? b.exact!.ns : b.ns)));
    nEnd = Math.max(nEnd, Math.abs(a.nTotal - b.nTotal));
  }
  return { ns, nEnd };
}

/** The scipy script in a child process (its own core); resolves with its points per CPU second. */
async function scipyBaseline(seconds: number): Promise<number> {
  const script = fileURLToPath(new URL('./scipy_baseline.py', import.meta.url));
  const { stdout } = await execFileAsync('/usr/bin/python3', [script, '--rtol', '1e-8', '--seconds', String(seconds)], { encoding: 'utf8' });
  return (JSON.parse(stdout.trim().split('\n').at(-1)!) as { pointsPerSecond: number }).pointsPerSecond;
}

export interface PhysicsFigures {
  fastPointsPerSecond: number;
  customExprPointsPerSecond: number;
  exactPointsPerSecond: number;
  baselinePointsPerSecond: number;
  baselineRatio: number;
  customExprRatio: number;
  nsErrorFast: number;
  nsErrorExact: number;
  /** Largest |ΔN_end| of the fast path, default precision vs rtol 1e-12 (to be located to 1e-8). */
  nEndErrorFast: number;
  /** Right-hand-side evaluations per fast point, and CPU nanoseconds per evaluation (all work of a point included). */
  fastEvaluationsPerPoint: number;
  fastNsPerEvaluation: number;
  /** DESIGN.md's bare-odex reference run on this machine now (bench/odexReference.ts), and the fast path over it. */
  odexReferencePointsPerSecond: number;
  fastReferenceRatio: number;
}

export async function measurePhysics(seconds: number): Promise<PhysicsFigures> {
  // The scipy script runs on the other core while the fast path is timed on this one, so the
  // ratio compares the two at the same moments: this machine's speed drifts by up to 2x within
  // an hour, and Python and V8 do not always drift together.
  const scipy = scipyBaseline(seconds);
  const fast = rate({ family: 'starobinsky' }, false, seconds);
  const reference = odexReferenceRate(seconds);
  const baseline = await scipy;
  const custom = rate({ expression: STAROBINSKY_EXPRESSION }, false, seconds);
  const exact = rate({ family: 'starobinsky' }, true, seconds);
  const fastErrors = errorsAtDefault(false);
  return {
    fastPointsPerSecond: fast.pointsPerSecond,
    customExprPointsPerSecond: custom.pointsPerSecond,
    exactPointsPerSecond: exact.pointsPerSecond,
    baselinePointsPerSecond: baseline,
    baselineRatio: fast.pointsPerSecond / baseline,
    customExprRatio: fast.pointsPerSecond / custom.pointsPerSecond,
    nsErrorFast: fastErrors.ns,
    nsErrorExact: errorsAtDefault(true).ns,
    nEndErrorFast: fastErrors.nEnd,
    fastEvaluationsPerPoint: fast.evaluationsPerPoint,
    fastNsPerEvaluation: 1e9 / (fast.pointsPerSecond * fast.evaluationsPerPoint),
    odexReferencePointsPerSecond: reference,
    fastReferenceRatio: fast.pointsPerSecond / reference,
  };
}
