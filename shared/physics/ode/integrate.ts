import { Solver as OdexSolver, type Solver } from 'odex';

// odex's Outcome enum; Node cannot see it as a named export of the CommonJS module.
const Outcome = { Converged: 0, EarlyReturn: 2 } as const;

/**
 * Thin layer over odex: one configured solver per system size, reused across calls (it holds
 * settings only, no state between solves), and a plain "advance y from x0 to x1" for the short
 * re-integrations that replace dense output (measured ~150x slower in odex).
 */
export type Rhs = (x: number, y: number[]) => number[];
export type StepObserver = (x: number, y: number[]) => boolean;

export interface SolverSettings {
  rtol: number | number[];
  atol: number | number[];
  maxSteps?: number;
  maxStepSize?: number;
  columns?: number;
  sequence?: number;
}

export function createSolver(dimension: number, settings: SolverSettings): Solver {
  const solver = new OdexSolver(dimension);
  solver.relativeTolerance = settings.rtol;
  solver.absoluteTolerance = settings.atol;
  solver.maxSteps = settings.maxSteps ?? 100_000;
  solver.initialStepSize = 1e-2;
  solver.denseOutput = false;
  if (settings.maxStepSize) solver.maxStepSize = settings.maxStepSize;
  if (settings.columns) (solver as any).maxExtrapolationColumns = settings.columns;
  if (settings.sequence) (solver as any).stepSizeSequence = settings.sequence;
  return solver;
}

export interface SolveResult {
  /** Last accepted point (the solver's end point, or where the observer stopped it). */
  x: number;
  y: number[];
  converged: boolean;
  stoppedByObserver: boolean;
  evaluations: number;
}

/** Integrates from x0 to x1, calling `observe` at every accepted step (return false to stop). */
export function solve(solver: Solver, f: Rhs, x0: number, y0: number[], x1: number, observe?: StepObserver): SolveResult {
  let lastX = x0;
  let lastY = y0;
  const result = solver.solve(f, x0, y0, x1, (_nr, _xOld, x, y) => {
    lastX = x;
    lastY = y;
    return observe ? observe(x, y) : true;
  });
  return {
    x: result.outcome === Outcome.Converged ? x1 : lastX,
    y: result.outcome === Outcome.Converged ? result.y : lastY,
    converged: result.outcome === Outcome.Converged,
    stoppedByObserver: result.outcome === Outcome.EarlyReturn,
    evaluations: result.nEval,
  };
}

/** y(x1) from y(x0) = y0; exact copy when the two points coincide. */
export function advance(solver: Solver, f: Rhs, x0: number, y0: number[], x1: number): SolveResult {
  if (x1 === x0) return { x: x0, y: y0.slice(), converged: true, stoppedByObserver: false, evaluations: 0 };
  return solve(solver, f, x0, y0, x1);
}
