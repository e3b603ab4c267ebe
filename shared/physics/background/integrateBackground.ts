import type { Solver } from 'odex';
import type { PotentialEvaluator } from '../potential/types.ts';
import { advance, createSolver, solve } from '../ode/integrate.ts';
import { createBackgroundRhs, type BackgroundRhs } from './equations.ts';
import { locateCrossing, type EventFunction } from './locateCrossing.ts';

/** Where inflation ends: at eps1 = 1, or at a field value for models that never end by themselves. */
export type EndCondition = { kind: 'eps1' } | { kind: 'field'; phiEnd: number };

export type BackgroundStatus = 'ok' | 'no_inflation' | 'never_ends' | 'negative_potential' | 'solver_failed';

/** Accepted steps from N = 0 at phi0 to the end of inflation (the last entry is the end itself). */
export interface Trajectory {
  n: number[];
  phi: number[];
  u: number[];
}

export interface BackgroundResult {
  status: BackgroundStatus;
  reason: string;
  trajectory: Trajectory;
  /** N at the end of inflation (= total e-folds from phi0); NaN unless status is ok. */
  nEnd: number;
  evaluations: number;
  rhs: BackgroundRhs;
  solver: Solver;
}

export interface BackgroundOptions {
  rtol: number;
  atol: number;
  maxEfolds: number;
  columns?: number;
  sequence?: number;
}

function eventFor(end: EndCondition, evaluate: PotentialEvaluator, params: Float64Array, rollSign: number): EventFunction {
  const buf = new Float64Array(3);
  if (end.kind === 'field') return (phi) => rollSign * (phi - end.phiEnd);
  return (phi, u) => {
    evaluate(phi, params, buf);
    const dphi = u - buf[1]! / buf[0]!;
    return 0.5 * dphi * dphi - 1;
  };
}

/** Integrates the background from rest on the slow-roll attractor (u = 0) at phi0 to the end. */
export function integrateBackground(
  evaluate: PotentialEvaluator,
  params: Float64Array,
  phi0: number,
  end: EndCondition,
  options: BackgroundOptions,
): BackgroundResult {
  const rhs = createBackgroundRhs(evaluate, params);
  const solver = createSolver(2, { rtol: options.rtol, atol: options.atol, columns: options.columns, sequence: options.sequence });
  const trajectory: Trajectory = { n: [0], phi: [phi0], u: [0] };
  const fail = (status: BackgroundStatus, reason: string, evaluations = 0): BackgroundResult =>
    ({ status, reason, trajectory, nEnd: Number.NaN, evaluations, rhs, solver });

  const buf = new Float64Array(3);
  evaluate(phi0, params, buf);
  if (!Number.isFinite(buf[0]!) || !Number.isFinite(buf[1]!) || !Number.isFinite(buf[2]!)) {
    return fail('solver_failed', `the potential or its derivatives are not finite at phi0 = ${phi0}`);
  }
  if (buf[0]! <= 0) return fail('negative_potential', `V(phi0) = ${buf[0]} is not positive at phi0 = ${phi0}`);
  const rollSign = buf[1]! > 0 ? -1 : 1;
  const event = eventFor(end, evaluate, params, rollSign);
  if (event(phi0, 0) >= 0) {
    return end.kind === 'eps1'
      ? fail('no_inflation', `eps1 >= 1 already at phi0 = ${phi0}: the potential is too steep there to inflate`)
      : fail('no_inflation', `the field rolls away from end-phi = ${end.phiEnd}, or starts past it (phi0 = ${phi0})`);
  }

  let problem: { status: BackgroundStatus; reason: string } | undefined;
  const run = solve(solver, rhs, 0, [phi0, 0], options.maxEfolds, (n, y) => {
    const phi = y[0]!;
    const u = y[1]!;
    if (!Number.isFinite(phi) || !Number.isFinite(u)) {
      problem = { status: 'solver_failed', reason: `the background became non-finite at N = ${n}` };
      return false;
    }
    evaluate(phi, params, buf);
    if (!(buf[0]! > 0)) {
      problem = { status: 'negative_potential', reason: `V = ${buf[0]} at phi = ${phi} (N = ${n}) before inflation ended` };
      return false;
    }
    if (n === 0) return true;
    trajectory.n.push(n);
    trajectory.phi.push(phi);
    trajectory.u.push(u);
    return event(phi, u) < 0;
  });
  if (problem) return fail(problem.status, problem.reason, run.evaluations);
  if (run.converged) {
    return fail('never_ends', `inflation did not end within ${options.maxEfolds} e-folds of phi0 = ${phi0}`, run.evaluations);
  }
  if (!run.stoppedByObserver) return fail('solver_failed', 'the ODE solver exceeded its step limit', run.evaluations);

  // The crossing lies between the last two accepted steps: replace the overshooting last step
  // by the located end point.
  const last = trajectory.n.length - 1;
  const crossing = locateCrossing(solver, rhs, event, trajectory.n[last - 1]!, [trajectory.phi[last - 1]!, trajectory.u[last - 1]!],
    trajectory.n[last]!, [trajectory.phi[last]!, trajectory.u[last]!]);
  trajectory.n[last] = crossing.x;
  trajectory.phi[last] = crossing.y[0]!;
  trajectory.u[last] = crossing.y[1]!;
  return {
    status: 'ok',
    reason: '',
    trajectory,
    nEnd: crossing.x,
    evaluations: run.evaluations + crossing.evaluations,
    rhs,
    solver,
  };
}

/** The background state (phi, u) at any N inside the trajectory, by a short re-integration from the step before it. */
export function stateAt(result: BackgroundResult, n: number): { y: number[]; evaluations: number } {
  const { trajectory } = result;
  let i = trajectory.n.length - 1;
  while (i > 0 && trajectory.n[i]! > n) i--;
  const run = advance(result.solver, result.rhs, trajectory.n[i]!, [trajectory.phi[i]!, trajectory.u[i]!], n);
  return { y: run.y, evaluations: run.evaluations };
}
