import { Solver } from 'odex';
import { callsPerCpuSecond } from './measure.ts';

/**
 * The machine's speed, read off the reference run DESIGN.md ("Measured on these machines") gives
 * its figure for: bare odex on the quadratic potential V = phi^2/2 in the plain state
 * (phi, phi'), rtol = atol = 1e-10, a hand-written right-hand side, from the slow-roll attractor
 * ~70 e-folds up to eps1 = 1 (no event location, no observables). DESIGN.md measured about
 * 0.23 ms (4,300 points/s) and ~3,700 evaluations a point; ours takes ~3,840. The fast path's
 * rate over this one, taken minutes apart on the same machine, says how our physics compares with
 * a bare integration whatever the machine's speed that hour.
 */
export const DESIGN_REFERENCE_POINTS_PER_SECOND = 4_300;

function rhs(_n: number, y: number[], dy: number[]): void {
  const dphi = y[1]!;
  dy[0] = dphi;
  dy[1] = -(3 - 0.5 * dphi * dphi) * (dphi + 2 / y[0]!); // V'/V = 2/phi
}

function referencePoint(): number {
  const solver = new Solver(rhs, 2, {
    rawFunction: true, denseOutput: false, relativeTolerance: 1e-10, absoluteTolerance: 1e-10,
    maxSteps: 100_000, initialStepSize: 1e-2,
  });
  // Slow roll: N = (phi^2 - phi_e^2)/4 with phi_e^2 = 2, so 70 e-folds start at phi^2 = 282.
  const phi0 = Math.sqrt(282);
  for (const segment of solver.solutionSegments(0, [phi0, -2 / phi0], 500)) {
    if (0.5 * segment.y[1]! ** 2 >= 1) return segment.x1;
  }
  throw new Error('odex reference run: inflation did not end');
}

export function odexReferenceRate(seconds: number): number {
  return callsPerCpuSecond(() => {
    if (!(referencePoint() > 60)) throw new Error('odex reference run: fewer than 60 e-folds');
  }, seconds, 50);
}
