import { flowState, type FlowState } from '../background/equations.ts';
import { stateAt, type BackgroundResult } from '../background/integrateBackground.ts';
import { scalarAmplitude } from '../observables/hubbleFlow.ts';
import { pivotEfoldsFromReheating } from '../observables/reheating.ts';
import type { PointInput } from './types.ts';

export interface PivotState {
  nPivot: number;
  phi: number;
  u: number;
  flow: FlowState;
  /** A_s for V as given. */
  As: number;
  evaluations: number;
}

const REHEATING_TOLERANCE = 1e-9;
const REHEATING_MAX_ITERATIONS = 30;

function stateAtPivot(input: PointInput, background: BackgroundResult, nPivot: number): PivotState {
  const at = stateAt(background, background.nEnd - nPivot);
  const phi = at.y[0]!;
  const u = at.y[1]!;
  const flow = flowState(input.evaluate, input.params, phi, u);
  return { nPivot, phi, u, flow, As: scalarAmplitude(flow.H2, flow), evaluations: at.evaluations };
}

/**
 * The pivot's background state. With a reheating history N_* depends on the normalised H_* and
 * rho_end, which depend on N_* only logarithmically, so a fixed-point iteration converges in a
 * few steps.
 */
export function findPivotState(input: PointInput, background: BackgroundResult, guess: number): PivotState {
  if (input.pivot.kind === 'efolds') return stateAtPivot(input, background, input.pivot.efolds);
  const { history } = input.pivot;
  const last = background.trajectory.n.length - 1;
  const endFlow = flowState(input.evaluate, input.params, background.trajectory.phi[last]!, background.trajectory.u[last]!);
  let state = stateAtPivot(input, background, Math.min(guess, background.nEnd));
  let evaluations = state.evaluations;
  for (let i = 0; i < REHEATING_MAX_ITERATIONS; i++) {
    const amplitude = input.targetAs / state.As;
    const next = pivotEfoldsFromReheating(Math.sqrt(amplitude * state.flow.H2), 3 * amplitude * endFlow.H2, history);
    if (!(next > 0) || next > background.nEnd) return { ...state, nPivot: next, evaluations };
    const converged = Math.abs(next - state.nPivot) < REHEATING_TOLERANCE;
    state = stateAtPivot(input, background, next);
    evaluations += state.evaluations;
    if (converged) break;
  }
  return { ...state, evaluations };
}
