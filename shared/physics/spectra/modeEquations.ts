import type { PotentialEvaluator } from '../potential/types.ts';
import type { FlowState } from '../background/equations.ts';
import type { Rhs } from '../ode/integrate.ts';

/**
 * Mukhanov–Sasaki equations in e-folds for one comoving wavenumber, integrated together with
 * the background so no interpolation of H or eps2 is needed:
 *   R'' + (3 + eps2 - eps1) R' + (k/aH)^2 R = 0,   h'' + (3 - eps1) h' + (k/aH)^2 h = 0.
 * a = exp(N - N_p) so that the pivot mode k_* = a_p H_p = H_p. The modes are scaled,
 * R~ = R sqrt(2k^3)/H_p and h~ = h sqrt(2k^3)/H_p, so frozen values are of order 1/sqrt(2 eps1)
 * and 1 whatever the overall scale of V; then P_R = (H_p/2pi)^2 |R~|^2, P_t = 2 (H_p/2pi)^2 |h~|^2.
 * State: [phi, u, Re R, Im R, Re R', Im R', Re h, Im h, Re h', Im h'].
 */
export const MODE_DIMENSION = 10;

export function createModeRhs(evaluate: PotentialEvaluator, params: Float64Array, k: number, nPivot: number): Rhs {
  const buf = new Float64Array(3);
  return (n, y, dy) => {
    const u = y[1]!;
    evaluate(y[0]!, params, buf);
    const v = buf[0]!;
    const dlnV = buf[1]! / v;
    const d2lnV = buf[2]! / v - dlnV * dlnV;
    const dphi = u - dlnV;
    const eps1 = 0.5 * dphi * dphi;
    const eps2 = (-2 * (3 - eps1) * u) / dphi;
    const x = (k * Math.exp(nPivot - n)) / Math.sqrt(v / (3 - eps1));
    const x2 = x * x;
    const frictionR = 3 + eps2 - eps1;
    const frictionH = 3 - eps1;
    dy[0] = dphi;
    dy[1] = -(3 - eps1) * u + d2lnV * dphi;
    dy[2] = y[4]!;
    dy[3] = y[5]!;
    dy[4] = -frictionR * y[4]! - x2 * y[2]!;
    dy[5] = -frictionR * y[5]! - x2 * y[3]!;
    dy[6] = y[8]!;
    dy[7] = y[9]!;
    dy[8] = -frictionH * y[8]! - x2 * y[6]!;
    dy[9] = -frictionH * y[9]! - x2 * y[7]!;
  };
}

/**
 * Adiabatic (first-order WKB) vacuum deep inside the horizon: v = exp(-i∫ω dτ)/sqrt(2ω) with
 * ω^2 = k^2 - z''/z, z''/z = (aH)^2 (2 - e1 + 3e2/2 + e2^2/4 - e1e2/2 + e2e3/2) for scalars and
 * a''/a = (aH)^2 (2 - e1) for tensors (Schwarz, Terrero-Escalante & Garcia 2001, PLB 517, 243).
 * It leaves errors of order (aH/k)^4 where a plain Bunch–Davies start leaves (aH/k)^2.
 * Returns the scaled mode state [Re R~, Im R~, Re R~', Im R~', Re h~, Im h~, Re h~', Im h~'].
 */
export function adiabaticVacuum(flow: FlowState, n: number, nPivot: number, k: number, hubblePivot: number): number[] {
  const { eps1: e1, eps2: e2, eps2eps3: e2e3 } = flow;
  const hubble = Math.sqrt(flow.H2);
  const a = Math.exp(n - nPivot);
  const x = k / (a * hubble);
  const scale = Math.sqrt(2 * k * k * k) / hubblePivot;
  const mode = (massTerm: number, amplitudeFactor: number, extraDamping: number): number[] => {
    const w2 = x * x - massTerm;
    const w = Math.sqrt(w2);
    // v = 1/sqrt(2 omega), omega = w aH; d ln v/d tau /(aH) = -i w + (1 - e1) massTerm/(2 w^2).
    const amplitude = (amplitudeFactor / Math.sqrt(2 * w * a * hubble)) * scale;
    const real = -1 - extraDamping + ((1 - e1) * massTerm) / (2 * w2);
    return [amplitude, 0, amplitude * real, -amplitude * w];
  };
  const zOverA = flow.dphi;
  const scalarMass = 2 - e1 + 1.5 * e2 + 0.25 * e2 * e2 - 0.5 * e1 * e2 + 0.5 * e2e3;
  return [
    ...mode(scalarMass, 1 / (a * zOverA), 0.5 * e2),
    ...mode(2 - e1, 2 / a, 0),
  ];
}
