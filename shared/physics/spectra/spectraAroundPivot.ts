import { flowState } from '../background/equations.ts';
import { stateAt, type BackgroundResult } from '../background/integrateBackground.ts';
import { scalarAmplitude } from '../observables/hubbleFlow.ts';
import type { PivotState } from '../point/pivotState.ts';
import { runBackground } from '../point/runBackground.ts';
import type { PointInput } from '../point/types.ts';
import { computeExactSpectra } from './exactSpectra.ts';

/** Horizon exits of the sampled modes, in e-folds after the pivot's (negative: earlier, larger scales). */
export const SPECTRUM_OFFSETS: readonly number[] = [-3, -2, -1, 0, 1, 2, 3];

export interface SpectrumSample {
  /** ln(k / k_*) of the mode that leaves the horizon at the offset. */
  lnK: number;
  /** P_R(k) and P_t(k) of the potential normalised so that P_R(k_*) is the target A_s. */
  scalar: number;
  tensor: number;
}

export interface SpectraAroundPivot {
  samples: SpectrumSample[];
  /** One line per offset whose modes could not be computed (e.g. too close to the start). */
  failures: string[];
  evaluations: number;
}

function stateAtExit(input: PointInput, background: BackgroundResult, nPivot: number): PivotState {
  const at = stateAt(background, background.nEnd - nPivot);
  const flow = flowState(input.evaluate, input.params, at.y[0]!, at.y[1]!);
  return { nPivot, phi: at.y[0]!, u: at.y[1]!, flow, As: scalarAmplitude(flow.H2, flow), evaluations: at.evaluations };
}

/**
 * The exact (Mukhanov–Sasaki) scalar and tensor spectra at a few k around the pivot, for plotting.
 * The existing solver reads the spectra at the mode that leaves the horizon at a given background
 * state, so each sample uses the state `offset` e-folds after the pivot's exit as that state: its
 * mode has k = a H there, i.e. ln(k/k_*) = offset + ln(H/H_*). The background is re-run from the
 * point's stored phi0 and N_*, so it is the one the stored observables came from.
 */
export function spectraAroundPivot(input: PointInput, phiStart: number, nPivot: number, offsets: readonly number[] = SPECTRUM_OFFSETS): SpectraAroundPivot {
  const fixed: PointInput = { ...input, phi0: phiStart, pivot: { kind: 'efolds', efolds: nPivot } };
  const run = runBackground(fixed, nPivot);
  if (!run.ok) return { samples: [], failures: [`the background did not run again: ${run.reason}`], evaluations: run.evaluations };
  let evaluations = run.evaluations;
  const pivot = stateAtExit(fixed, run.background, nPivot);
  const raw: { lnK: number; scalar: number; tensor: number }[] = [];
  const failures: string[] = [];
  for (const offset of offsets) {
    const exitState = offset === 0 ? pivot : stateAtExit(fixed, run.background, nPivot - offset);
    const spectra = computeExactSpectra(fixed, run.background, exitState);
    evaluations += exitState.evaluations + spectra.evaluations;
    if (!spectra.ok) {
      failures.push(`ln(k/k_*) ≈ ${offset}: ${spectra.reason}`);
      continue;
    }
    const { As, r } = spectra.observables;
    raw.push({ lnK: offset + 0.5 * Math.log(exitState.flow.H2 / pivot.flow.H2), scalar: As, tensor: r * As });
  }
  // Spectra scale like V; the pivot's own exact P_R fixes the factor that brings it to the target.
  const atPivot = raw.find((s) => s.lnK === 0);
  const amplitude = atPivot === undefined ? Number.NaN : input.targetAs / atPivot.scalar;
  const samples = raw.map((s) => ({ lnK: s.lnK, scalar: s.scalar * amplitude, tensor: s.tensor * amplitude }));
  if (atPivot === undefined) failures.push('the pivot mode itself failed, so the spectra cannot be normalised');
  return { samples: atPivot === undefined ? [] : samples, failures, evaluations };
}
