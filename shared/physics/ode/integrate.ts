import { Solver } from 'odex';

/**
 * Thin layer over odex: one configured solver per right-hand side, and a plain "advance y from
 * x0 to x1" for the short re-integrations that replace dense output (measured ~150x slower in
 * odex). The right-hand side writes into odex's own derivative array (odex's `rawFunction`
 * mode): no array is allocated or copied per evaluation.
 */
export type Rhs = (x: number, y: readonly number[], dy: number[]) => void;
export type StepObserver = (x: number, y: number[]) => boolean;

export interface SolverSettings {
  rtol: number | number[];
  atol: number | number[];
  maxSteps?: number;
  maxStepSize?: number;
  columns?: number;
  sequence?: number;
}

export interface SolveResult {
  /** Last accepted point (the solver's end point, or where the observer stopped it). */
  x: number;
  y: number[];
  converged: boolean;
  stoppedByObserver: boolean;
  evaluations: number;
}

export interface Integrator {
  readonly rhs: Rhs;
  /** Integrates from x0 to x1, calling `observe` at every accepted step (return false to stop). */
  solve(x0: number, y0: readonly number[], x1: number, observe?: StepObserver): SolveResult;
  /** y(x1) from y(x0) = y0; exact copy when the two points coincide. */
  advance(x0: number, y0: readonly number[], x1: number): SolveResult;
}

export function createIntegrator(rhs: Rhs, dimension: number, settings: SolverSettings): Integrator {
  const solver = new Solver(rhs, dimension, {
    rawFunction: true,
    denseOutput: false,
    relativeTolerance: settings.rtol,
    absoluteTolerance: settings.atol,
    maxSteps: settings.maxSteps ?? 100_000,
    initialStepSize: 1e-2,
    ...(settings.maxStepSize ? { maxStepSize: settings.maxStepSize } : {}),
    ...(settings.columns ? { maxExtrapolationColumns: settings.columns } : {}),
    ...(settings.sequence ? { stepSizeSequence: settings.sequence } : {}),
  });

  const solve = (x0: number, y0: readonly number[], x1: number, observe?: StepObserver): SolveResult => {
    // odex counts evaluations over the solver's life; a run's share is the difference.
    const evaluationsBefore = solver.nEval;
    let x = x0;
    let y = y0.slice();
    let stoppedByObserver = false;
    let converged = false;
    try {
      for (const segment of solver.solutionSegments(x0, y, x1)) {
        x = segment.x1;
        y = segment.y;
        if (observe && !observe(x, y)) {
          stoppedByObserver = true;
          break;
        }
      }
      converged = !stoppedByObserver;
    } catch (error) {
      // odex throws when it runs out of steps; that is an outcome here, not an exception.
      if (!(error instanceof Error && error.message.startsWith('maximum allowed steps exceeded'))) throw error;
    }
    return { x: converged ? x1 : x, y, converged, stoppedByObserver, evaluations: solver.nEval - evaluationsBefore };
  };

  return {
    rhs,
    solve,
    advance: (x0, y0, x1) =>
      x1 === x0 ? { x: x0, y: y0.slice(), converged: true, stoppedByObserver: false, evaluations: 0 } : solve(x0, y0, x1),
  };
}
