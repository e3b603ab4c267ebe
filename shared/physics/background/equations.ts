import type { Rhs } from '../ode/integrate.ts';
import type { PotentialEvaluator } from '../potential/types.ts';

/**
 * Background of a canonical scalar field in e-folds N (M_pl = 1):
 *   phi'' = -(3 - eps1)(phi' + V_phi/V),  eps1 = phi'^2/2,  H^2 = V/(3 - eps1).
 * The state is (phi, u) with u = phi' + V_phi/V. On the slow-roll attractor u is a small
 * difference of two nearly equal numbers; integrating it directly keeps its relative accuracy,
 * which eps2 and eps3 are built from (integrating (phi, phi') loses it).
 *   phi' = u - (ln V)',   u' = -(3 - eps1) u + (ln V)'' phi'.
 */
export function createBackgroundRhs(evaluate: PotentialEvaluator, params: Float64Array): Rhs {
  const buf = new Float64Array(3);
  return (_n, y, dy) => {
    const phi = y[0]!;
    const u = y[1]!;
    evaluate(phi, params, buf);
    const v = buf[0]!;
    const dlnV = buf[1]! / v;
    const d2lnV = buf[2]! / v - dlnV * dlnV;
    const dphi = u - dlnV;
    dy[0] = dphi;
    dy[1] = -(3 - 0.5 * dphi * dphi) * u + d2lnV * dphi;
  };
}

/**
 * createBackgroundRhs with a generated potential's statements written in (they declare V, dV and
 * d2V: PreparedPotential.code): no call and no buffer between the potential and the equations,
 * ~6% of a fast point (measured 2026-12-04). The same operations in the same order, so the two
 * agree to the bit (tests/shared/physics/background/inlinedRhs.test.ts); keep them in step.
 * Only codegen.ts output reaches `code` (see portable.ts), never user text.
 */
export function inlinedBackgroundRhs(code: string): (params: Float64Array) => Rhs {
  return new Function('p', `"use strict";
return (_n, y, dy) => {
  const phi = y[0];
  const u = y[1];
${code}
  const dlnV = dV / V;
  const d2lnV = d2V / V - dlnV * dlnV;
  const dphi = u - dlnV;
  dy[0] = dphi;
  dy[1] = -(3 - 0.5 * dphi * dphi) * u + d2lnV * dphi;
};`) as (params: Float64Array) => Rhs;
}

/**
 * phi' and its next two N-derivatives at one state, exact: phi'' = -(3 - eps1) u and
 * phi''' = eps1' u - (3 - eps1) u', with eps1' = phi' phi'' and u' from the equations above.
 */
export function fieldDerivatives(evaluate: PotentialEvaluator, params: Float64Array, phi: number, u: number, buf: Float64Array): [number, number, number] {
  evaluate(phi, params, buf);
  const v = buf[0]!;
  const dlnV = buf[1]! / v;
  const d2lnV = buf[2]! / v - dlnV * dlnV;
  const dphi = u - dlnV;
  const friction = 3 - 0.5 * dphi * dphi;
  const ddphi = -friction * u;
  const du = -friction * u + d2lnV * dphi;
  return [dphi, ddphi, dphi * ddphi * u - friction * du];
}

/** Below this, eps2 and d eps2/dN are taken as the integration's rounding noise (see flowState). */
const FLOW_NOISE = 1e-10;

/** Hubble-flow parameters and H^2 at one background state. */
export interface FlowState {
  V: number;
  dphi: number;
  eps1: number;
  eps2: number;
  eps3: number;
  /** The product, d eps2/dN, which the observables use (see flowState). */
  eps2eps3: number;
  H2: number;
}

/**
 * eps1 = phi'^2/2, eps2 = d ln eps1/dN = 2 phi''/phi' = -2(3 - eps1) u/phi',
 * eps3 = d ln eps2/dN, from the analytic derivative of eps2 (no finite differences):
 *   eps2 eps3 = -(2/phi') [ (3 - eps1) u' - u (eps1 eps2 + (3 - eps1) eps2/2) ].
 * The observables take the product eps2 eps3 = d eps2/dN, finite where eps2 crosses zero (where
 * the ratio eps3 is large, as it truly is). When eps2 and its derivative both vanish (power-law
 * inflation) the hierarchy stops and eps3 is reported as 0: what the integration leaves of them
 * there (~1e-16) is rounding noise decaying with the attractor, whose ratio comes out as ~-3.
 */
export function flowState(
  evaluate: PotentialEvaluator,
  params: Float64Array,
  phi: number,
  u: number,
  buf: Float64Array = new Float64Array(3),
): FlowState {
  evaluate(phi, params, buf);
  const v = buf[0]!;
  const dlnV = buf[1]! / v;
  const d2lnV = buf[2]! / v - dlnV * dlnV;
  const dphi = u - dlnV;
  const eps1 = 0.5 * dphi * dphi;
  const du = -(3 - eps1) * u + d2lnV * dphi;
  const eps2 = (-2 * (3 - eps1) * u) / dphi;
  const eps2eps3 = (-2 / dphi) * ((3 - eps1) * du - u * (eps1 * eps2 + 0.5 * (3 - eps1) * eps2));
  const eps3 = Math.max(Math.abs(eps2), Math.abs(eps2eps3)) < FLOW_NOISE ? 0 : eps2eps3 / eps2;
  return { V: v, dphi, eps1, eps2, eps3, eps2eps3, H2: v / (3 - eps1) };
}
