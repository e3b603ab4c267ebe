import { flowState } from '../background/equations.ts';
import { stateAt, type BackgroundResult } from '../background/integrateBackground.ts';
import { createIntegrator } from '../ode/integrate.ts';
import type { PivotState } from '../point/pivotState.ts';
import type { PointInput } from '../point/types.ts';
import { adiabaticVacuum, createModeRhs, MODE_DIMENSION } from './modeEquations.ts';

export interface SpectraObservables {
  ns: number;
  r: number;
  nt: number;
  alphaS: number;
  As: number;
}

export type SpectraResult =
  | { ok: true; observables: SpectraObservables; evaluations: number }
  | { ok: false; reason: string; evaluations: number };

interface ModePower {
  scalar: number;
  tensor: number;
  evaluations: number;
}

/**
 * Integrates the mode of wavenumber k = k_* e^s from k/aH = modeStartRatio (adiabatic vacuum)
 * until it is modeEndRatio outside its own horizon, and returns P_R and P_t there.
 */
function modePower(input: PointInput, background: BackgroundResult, pivot: PivotState, s: number): ModePower | string {
  const { precision } = input;
  const nPivotAbs = background.nEnd - pivot.nPivot;
  const hubblePivot = Math.sqrt(pivot.flow.H2);
  const k = hubblePivot * Math.exp(s);
  let evaluations = 0;
  // k/aH = x at N ≈ N_p + s - ln x + ln(H_p/H); one correction for the change of H is plenty,
  // as the initial conditions use the actual k/aH at the chosen start.
  let nStart = nPivotAbs + s - Math.log(precision.modeStartRatio);
  if (nStart < 0) return `the mode k = k_* e^${s} needs ${(-nStart).toFixed(2)} more e-folds before the pivot than the background has`;
  let start = stateAt(background, nStart);
  evaluations += start.evaluations;
  let flow = flowState(input.evaluate, input.params, start.y[0]!, start.y[1]!);
  nStart += 0.5 * Math.log(pivot.flow.H2 / flow.H2);
  start = stateAt(background, Math.max(nStart, 0));
  evaluations += start.evaluations;
  flow = flowState(input.evaluate, input.params, start.y[0]!, start.y[1]!);
  const nStop = Math.min(nPivotAbs + s - Math.log(precision.modeEndRatio), background.nEnd);

  const rhs = createModeRhs(input.evaluate, input.params, k, nPivotAbs);
  const atol = [precision.atol, precision.atol, ...new Array<number>(8).fill(precision.rtol * 1e-3)];
  const integrator = createIntegrator(rhs, MODE_DIMENSION, { rtol: precision.rtol, atol });
  const y0 = [start.y[0]!, start.y[1]!, ...adiabaticVacuum(flow, Math.max(nStart, 0), nPivotAbs, k, hubblePivot)];
  const run = integrator.advance(Math.max(nStart, 0), y0, nStop);
  evaluations += run.evaluations;
  if (!run.converged) return `the mode equations for k = k_* e^${s} did not converge`;
  const y = run.y;
  const norm = pivot.flow.H2 / (4 * Math.PI * Math.PI);
  return {
    scalar: norm * (y[2]! * y[2]! + y[3]! * y[3]!),
    tensor: 2 * norm * (y[6]! * y[6]! + y[7]! * y[7]!),
    evaluations,
  };
}

/** n_s, r, n_t and alpha_s from the spectra of the pivot mode and two neighbours at ln k_* ± step. */
export function computeExactSpectra(input: PointInput, background: BackgroundResult, pivot: PivotState): SpectraResult {
  const step = input.precision.spectralStep;
  const modes: ModePower[] = [];
  let evaluations = 0;
  for (const s of [-step, 0, step]) {
    const mode = modePower(input, background, pivot, s);
    if (typeof mode === 'string') return { ok: false, reason: mode, evaluations };
    evaluations += mode.evaluations;
    modes.push(mode);
  }
  const [lo, mid, hi] = modes as [ModePower, ModePower, ModePower];
  const lnS = [Math.log(lo.scalar), Math.log(mid.scalar), Math.log(hi.scalar)] as const;
  return {
    ok: true,
    evaluations,
    observables: {
      ns: 1 + (lnS[2] - lnS[0]) / (2 * step),
      alphaS: (lnS[2] - 2 * lnS[1] + lnS[0]) / (step * step),
      nt: (Math.log(hi.tensor) - Math.log(lo.tensor)) / (2 * step),
      r: mid.tensor / mid.scalar,
      As: mid.scalar,
    },
  };
}
