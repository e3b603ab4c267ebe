import { flowState } from '../background/equations.ts';
import { integrateBackground, stateAt, type BackgroundResult } from '../background/integrateBackground.ts';
import { computePoint } from './computePoint.ts';
import type { PointInput, PointResult } from './types.ts';

/** Background sampled for plotting: N counted from the start (phi0) to the end of inflation. */
export interface SampledTrajectory {
  N: number[];
  phi: number[];
  eps1: number[];
  eps2: number[];
  /** N (from the start) at which the pivot leaves the horizon, i.e. nEnd - N_*; NaN when there is no pivot. */
  pivotN: number;
  /** Index into the arrays of the pivot sample (-1 when there is none). */
  pivotIndex: number;
  /** N at the end of inflation (the last sample). */
  nEnd: number;
  /** Right-hand-side evaluations spent on the re-run and the samples. */
  evaluations: number;
}

export interface PointWithTrajectory {
  result: PointResult;
  /** null when the point failed before a background from start to end existed. */
  trajectory: SampledTrajectory | null;
}

export const DEFAULT_TRAJECTORY_SAMPLES = 300;
/** eps1 climbs from ~0.1 to 1 within the last e-fold or two, so that stretch gets its own samples. */
const END_WINDOW_EFOLDS = 2;
const END_WINDOW_SHARE = 0.15;

function sampleGrid(nEnd: number, samples: number, pivotN: number): number[] {
  const endCount = Math.max(2, Math.round(samples * END_WINDOW_SHARE));
  const bulkCount = Math.max(2, samples - endCount);
  const grid: number[] = [];
  for (let i = 0; i < bulkCount; i++) grid.push((nEnd * i) / (bulkCount - 1));
  const windowStart = Math.max(0, nEnd - END_WINDOW_EFOLDS);
  for (let i = 1; i < endCount; i++) grid.push(windowStart + ((nEnd - windowStart) * i) / endCount);
  if (Number.isFinite(pivotN) && pivotN >= 0 && pivotN <= nEnd) grid.push(pivotN);
  grid.sort((a, b) => a - b);
  return grid.filter((n, i) => i === 0 || n !== grid[i - 1]);
}

function sample(input: PointInput, background: BackgroundResult, samples: number, pivotN: number): SampledTrajectory {
  const grid = sampleGrid(background.nEnd, samples, pivotN);
  const out: SampledTrajectory = { N: [], phi: [], eps1: [], eps2: [], pivotN, pivotIndex: -1, nEnd: background.nEnd, evaluations: 0 };
  const buf = new Float64Array(3);
  for (const n of grid) {
    const at = stateAt(background, n);
    out.evaluations += at.evaluations;
    const phi = at.y[0]!;
    const flow = flowState(input.evaluate, input.params, phi, at.y[1]!, buf);
    if (n === pivotN) out.pivotIndex = out.N.length;
    out.N.push(n);
    out.phi.push(phi);
    out.eps1.push(flow.eps1);
    out.eps2.push(flow.eps2);
  }
  return out;
}

/**
 * One point (same outcome as computePoint) plus its background sampled at about `samples` values
 * of N for plotting. The background is integrated once more from the phi0 the point settled on,
 * with the same settings, so it is the very trajectory the observables came from; each sample is
 * a short re-integration from the accepted step before it (no dense output, see DEVELOPERS.md).
 */
export function computePointWithTrajectory(input: PointInput, samples = DEFAULT_TRAJECTORY_SAMPLES): PointWithTrajectory {
  const result = computePoint(input);
  if (!Number.isFinite(result.phiStart)) return { result, trajectory: null };
  const { rtol, atol, maxEfolds } = input.precision;
  const background = integrateBackground(input.evaluate, input.params, result.phiStart, input.end, { rtol, atol, maxEfolds });
  if (background.status !== 'ok') return { result, trajectory: null };
  const pivotN = Number.isFinite(result.nPivot) ? background.nEnd - result.nPivot : Number.NaN;
  const trajectory = sample(input, background, samples, pivotN);
  trajectory.evaluations += background.evaluations;
  return { result, trajectory };
}
