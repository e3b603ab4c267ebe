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

const SCIPY_SCRIPT = fileURLToPath(new URL('./scipy_baseline.py', import.meta.url));
/** Our default's own rtol, at which the scipy script was compared before the equal-accuracy rule. */
const NOMINAL_RTOL = 1e-8;
/** Half-decade tolerance ladder for the scipy script's equal-accuracy run. */
const SCIPY_LADDER = [1e-8, 3e-9, 1e-9, 3e-10, 1e-10, 3e-11, 1e-11, 3e-12, 1e-12];

async function runScipy(args: string[]): Promise<Array<Record<string, number>>> {
  const { stdout } = await execFileAsync('/usr/bin/python3', [SCIPY_SCRIPT, ...args], { encoding: 'utf8' });
  return stdout.trim().split('\n').map((line) => JSON.parse(line) as Record<string, number>);
}

interface ScipyAccuracy {
  rtol: number;
  nsError: number;
  nEndError: number;
}

/** The scipy script's n_s and N_end errors at each rung of the ladder (no timing). */
async function scipyAccuracy(): Promise<ScipyAccuracy[]> {
  const rows = await runScipy(['--accuracy', '--rtol', SCIPY_LADDER.join(',')]);
  return rows.map((row) => ({ rtol: row.rtol!, nsError: row.nsError!, nEndError: row.nEndError! }));
}

/**
 * The same work: the loosest rung at which the scipy script's n_s and N_end are both at least as
 * accurate as ours at the default precision (a work-precision comparison; Hairer, Nørsett &
 * Wanner 1993, Solving ODEs I, section II.10). The tightest rung when none is.
 */
export function equalAccuracyRung(ladder: readonly ScipyAccuracy[], ours: { ns: number; nEnd: number }): ScipyAccuracy {
  return ladder.find((rung) => rung.nsError <= ours.ns && rung.nEndError <= ours.nEnd) ?? ladder.at(-1)!;
}

/** The scipy script in a child process (its own core): points per CPU second at each rtol, timed one after the other. */
async function scipyRates(rtols: number[], seconds: number): Promise<number[]> {
  const rows = await runScipy(['--rtol', rtols.join(','), '--seconds', String(seconds)]);
  return rows.map((row) => row.pointsPerSecond!);
}

export interface PhysicsFigures {
  fastPointsPerSecond: number;
  customExprPointsPerSecond: number;
  exactPointsPerSecond: number;
  /** The scipy script at equal accuracy (see equalAccuracyRung), its rtol and errors. */
  baselinePointsPerSecond: number;
  baselineRatio: number;
  baselineRtol: number;
  baselineNsError: number;
  baselineNEndError: number;
  /** The scipy script at our nominal rtol 1e-8, with its (larger) errors. */
  baselineNominalPointsPerSecond: number;
  baselineNominalRatio: number;
  baselineNominalNsError: number;
  baselineNominalNEndError: number;
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
  // Fast-path errors first (they choose the scipy rung); the exact path runs only after the
  // fast timing, whose code would otherwise meet a second, 10-component right-hand side in odex
  // and run ~3% slower (measured 2026-12-04).
  const ladder = scipyAccuracy();
  const fastErrors = errorsAtDefault(false);
  const rungs = await ladder;
  const matched = equalAccuracyRung(rungs, fastErrors);
  const nominal = rungs.find((rung) => rung.rtol === NOMINAL_RTOL)!;
  // The scipy script runs on the other core while the fast path and the reference are timed on
  // this one (each for `seconds`, as the script's two rtols), so the ratios compare the two at
  // the same moments: this machine's speed drifts by up to 2x within an hour, and Python and V8
  // do not always drift together.
  const scipy = scipyRates([matched.rtol, NOMINAL_RTOL], seconds);
  const fast = rate({ family: 'starobinsky' }, false, seconds);
  const reference = odexReferenceRate(seconds);
  const [baseline, baselineNominal] = await scipy;
  const custom = rate({ expression: STAROBINSKY_EXPRESSION }, false, seconds);
  const exact = rate({ family: 'starobinsky' }, true, seconds);
  const exactErrors = errorsAtDefault(true);
  return {
    fastPointsPerSecond: fast.pointsPerSecond,
    customExprPointsPerSecond: custom.pointsPerSecond,
    exactPointsPerSecond: exact.pointsPerSecond,
    baselinePointsPerSecond: baseline!,
    baselineRatio: fast.pointsPerSecond / baseline!,
    baselineRtol: matched.rtol,
    baselineNsError: matched.nsError,
    baselineNEndError: matched.nEndError,
    baselineNominalPointsPerSecond: baselineNominal!,
    baselineNominalRatio: fast.pointsPerSecond / baselineNominal!,
    baselineNominalNsError: nominal.nsError,
    baselineNominalNEndError: nominal.nEndError,
    customExprRatio: fast.pointsPerSecond / custom.pointsPerSecond,
    nsErrorFast: fastErrors.ns,
    nsErrorExact: exactErrors.ns,
    nEndErrorFast: fastErrors.nEnd,
    fastEvaluationsPerPoint: fast.evaluationsPerPoint,
    fastNsPerEvaluation: 1e9 / (fast.pointsPerSecond * fast.evaluationsPerPoint),
    odexReferencePointsPerSecond: reference,
    fastReferenceRatio: fast.pointsPerSecond / reference,
  };
}
