import { fastObservables } from '../observables/hubbleFlow.ts';
import { REDUCED_PLANCK_MASS_GEV } from '../observables/constants.ts';
import { computeExactSpectra } from '../spectra/exactSpectra.ts';
import { findPivotState } from './pivotState.ts';
import { runBackground } from './runBackground.ts';
import type { PointInput, PointResult, PointStatus } from './types.ts';

/** First guess of N_* when it follows from reheating (typical values are 45–60). */
const REHEATING_GUESS = 60;

function failed(status: PointStatus, reason: string, evaluations: number, known: Partial<PointResult> = {}): PointResult {
  const nan = Number.NaN;
  return {
    status, reason, evaluations,
    nTotal: nan, nPivot: nan, phiStart: nan, phiEnd: nan, phiPivot: nan, deltaPhi: nan,
    eps1: nan, eps2: nan, eps3: nan, ns: nan, r: nan, nt: nan, alphaS: nan,
    As: nan, amplitude: nan, energyScaleGeV: nan, hubbleGeV: nan,
    ...known,
  };
}

/**
 * One point of a scan: the background beyond slow roll, the pivot N_* e-folds before the end,
 * Hubble-flow observables there and, when asked, exact spectra from the mode equations.
 * Never throws for a physical failure: the outcome is in `status` and `reason`.
 */
export function computePoint(input: PointInput): PointResult {
  const margin = input.precision.efoldMargin;
  let nPivotNeeded = input.pivot.kind === 'efolds' ? input.pivot.efolds : REHEATING_GUESS;
  let evaluations = 0;
  for (let attempt = 0; attempt < 3; attempt++) {
    // With phi0 given the user owns the start: only N_* itself must fit.
    const needed = input.phi0 === undefined ? nPivotNeeded + margin : nPivotNeeded;
    const run = runBackground(input, needed);
    evaluations += run.evaluations;
    if (!run.ok) return failed(run.status, run.reason, evaluations);
    const { background } = run;
    const last = background.trajectory.n.length - 1;
    const phiEnd = background.trajectory.phi[last]!;
    const known = { nTotal: background.nEnd, phiStart: run.phi0, phiEnd };
    const tooShort = (nPivot: number) => failed('too_few_efolds',
      `inflation lasts ${background.nEnd.toFixed(2)} e-folds from phi0 = ${run.phi0}, fewer than N_* = ${nPivot.toFixed(2)}`, evaluations, known);
    if (input.pivot.kind === 'efolds' && background.nEnd < needed) return tooShort(input.pivot.efolds);
    const pivot = findPivotState(input, background, nPivotNeeded);
    evaluations += pivot.evaluations;
    if (!(pivot.nPivot > 0)) {
      return failed('too_few_efolds', `the reheating history puts the pivot at N_* = ${pivot.nPivot.toFixed(2)}, which is not after the start`, evaluations, known);
    }
    if (background.nEnd < (input.phi0 === undefined ? pivot.nPivot + margin : pivot.nPivot)) {
      if (input.phi0 !== undefined) return tooShort(pivot.nPivot);
      nPivotNeeded = pivot.nPivot + 1;
      continue;
    }
    const fast = fastObservables(pivot.flow);
    const amplitude = input.targetAs / pivot.As;
    const result: PointResult = {
      status: 'ok',
      reason: '',
      nTotal: background.nEnd,
      nPivot: pivot.nPivot,
      phiStart: run.phi0,
      phiEnd,
      phiPivot: pivot.phi,
      deltaPhi: Math.abs(phiEnd - pivot.phi),
      eps1: pivot.flow.eps1,
      eps2: pivot.flow.eps2,
      eps3: pivot.flow.eps3,
      ...fast,
      As: pivot.As,
      amplitude,
      energyScaleGeV: (amplitude * pivot.flow.V) ** 0.25 * REDUCED_PLANCK_MASS_GEV,
      hubbleGeV: Math.sqrt(amplitude * pivot.flow.H2) * REDUCED_PLANCK_MASS_GEV,
      evaluations,
    };
    if (input.exact) {
      const spectra = computeExactSpectra(input, background, pivot);
      result.evaluations += spectra.evaluations;
      if (!spectra.ok) return failed('solver_failed', spectra.reason, result.evaluations);
      result.exact = { ...spectra.observables, amplitude: input.targetAs / spectra.observables.As };
    }
    return result;
  }
  return failed('too_few_efolds', 'the reheating pivot kept moving beyond the available e-folds', evaluations);
}
