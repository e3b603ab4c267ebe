import { describe, expect, it } from 'vitest';
import { computePointWithTrajectory } from '../../../shared/physics/point/trajectory.ts';
import { preparePoint } from '../../../shared/physics/point/preparePoint.ts';
import { computePoint } from '../../../shared/physics/point/computePoint.ts';
import { pointRequestSchema, type PointRequestInput } from '../../../shared/plan/pointRequest.ts';

const input = (request: PointRequestInput) => preparePoint(pointRequestSchema.parse(request));
const quadratic = { potential: { family: 'quadratic' }, params: {}, pivot: { efolds: 60 } } as const;

/** Sample index closest to `before` e-folds before the end. */
function at(t: { N: number[]; nEnd: number }, before: number): number {
  let best = 0;
  t.N.forEach((n, i) => { if (Math.abs(t.nEnd - n - before) < Math.abs(t.nEnd - t.N[best]! - before)) best = i; });
  return best;
}

describe('point with its sampled trajectory', () => {
  const { result, trajectory } = computePointWithTrajectory(input(quadratic));
  if (!trajectory) throw new Error('quadratic inflation must give a trajectory');
  const { N, phi, eps1, eps2 } = trajectory;

  it('gives the same observables as computePoint and a few hundred samples from phi0 to the end', () => {
    expect(result).toEqual(computePoint(input(quadratic)));
    expect(N.length).toBeGreaterThanOrEqual(280);
    expect(N.length).toBeLessThanOrEqual(320);
    expect(N[0]).toBe(0);
    expect(phi[0]).toBe(result.phiStart);
    expect(N.at(-1)).toBe(result.nTotal);
    expect(phi.at(-1)).toBe(result.phiEnd);
    for (let i = 1; i < N.length; i++) expect(N[i]!).toBeGreaterThan(N[i - 1]!);
  });

  it('marks the pivot N_* e-folds before the end, at the field value of the result', () => {
    expect(trajectory.pivotN).toBeCloseTo(result.nTotal - 60, 12);
    expect(N[trajectory.pivotIndex]).toBe(trajectory.pivotN);
    expect(Math.abs(phi[trajectory.pivotIndex]! / result.phiPivot - 1)).toBeLessThan(1e-12);
    expect(Math.abs(eps1[trajectory.pivotIndex]! / result.eps1 - 1)).toBeLessThan(1e-12);
  });

  it('ends where eps1 = 1 (definition of the end of inflation, common practice)', () => {
    expect(Math.abs(eps1.at(-1)! - 1)).toBeLessThan(1e-8);
    // eps1 grows monotonically towards the end for a monomial potential (from memory).
    for (let i = 1; i < eps1.length; i++) expect(eps1[i]!).toBeGreaterThan(eps1[i - 1]!);
  });

  it('follows phi^2 = phi_end^2 + 4 N in slow roll for V ∝ phi^2', () => {
    // Liddle & Lyth 2000, "Cosmological Inflation and Large-Scale Structure", quadratic
    // potential: N(phi) = (phi^2 - phi_end^2)/4 at leading order in slow roll, so d(phi^2)/dN = -4
    // (N counted before the end) up to first-order corrections of relative size ~eps1.
    for (const [a, b] of [[20, 30], [40, 50], [50, 60]] as const) {
      const i = at(trajectory, a);
      const j = at(trajectory, b);
      const slope = (phi[j]! ** 2 - phi[i]! ** 2) / ((trajectory.nEnd - N[j]!) - (trajectory.nEnd - N[i]!));
      expect(Math.abs(slope / 4 - 1)).toBeLessThan(eps1[i]!);
    }
    // The relation itself at N = 60: the neglected corrections add up to a few units in phi^2
    // (out of ~240), i.e. at the percent level.
    const k = at(trajectory, 60);
    const predicted = phi.at(-1)! ** 2 + 4 * (trajectory.nEnd - N[k]!);
    expect(Math.abs(phi[k]! ** 2 / predicted - 1)).toBeLessThan(0.02);
  });

  it('has eps1 = 2/phi^2 and eps2 = 4/phi^2 deep in slow roll for V ∝ phi^2', () => {
    // Slow-roll parameters of the quadratic potential, eps_V = eta_V = 2/phi^2, and the Hubble-flow
    // relations eps1 ≈ eps_V, eps2 ≈ 4 eps_V - 2 eta_V (Liddle & Lyth 2000; Schwarz, Terrero-Escalante
    // & Garcia, Phys. Lett. B 517, 243 (2001)), equal up to relative corrections O(eps).
    for (const before of [30, 60]) {
      const i = at(trajectory, before);
      const epsV = 2 / phi[i]! ** 2;
      expect(Math.abs(eps1[i]! / epsV - 1)).toBeLessThan(2 * epsV);
      expect(Math.abs(eps2[i]! / (2 * epsV) - 1)).toBeLessThan(2 * epsV);
    }
  });

  it('keeps the trajectory of a point that falls short of N_*, without a pivot', () => {
    // phi0 = 5 gives about (25 - 1)/4 ≈ 6 e-folds (same slow-roll relation), far fewer than 60.
    const short = computePointWithTrajectory(input({ ...quadratic, phi0: 5 }));
    expect(short.result.status).toBe('too_few_efolds');
    expect(short.trajectory?.nEnd).toBeGreaterThan(4);
    expect(short.trajectory?.nEnd).toBeLessThan(8);
    expect(short.trajectory?.pivotIndex).toBe(-1);
    expect(Number.isNaN(short.trajectory?.pivotN)).toBe(true);
  });

  it('gives no trajectory when there is no background to sample', () => {
    // V = V0 (phi^2 - 4) is negative at phi0 = 1: no inflation can start there.
    const bad = computePointWithTrajectory(input({ potential: { expression: 'V0 * (phi^2 - 4)' }, params: { V0: 1 }, pivot: { efolds: 60 }, phi0: 1 }));
    expect(bad.result.status).toBe('negative_potential');
    expect(bad.trajectory).toBeNull();
  });
});
