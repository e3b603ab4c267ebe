import { describe, expect, it } from 'vitest';
import { point } from '../../../helpers/point.ts';

/**
 * An exact background beyond slow roll from the Hamilton–Jacobi formulation (Salopek & Bond
 * 1990, PRD 42, 3936; Liddle, Parsons & Barrow 1994, PRD 50, 7222; references from memory):
 * choose H(phi), then V = 3 H^2 - 2 H'^2 (M_pl = 1) has the attractor phi' = dphi/dN = -2 H'/H,
 * on which eps1 = 2 (H'/H)^2 exactly. With H = exp(a phi + b phi^3/3), H'/H = g = a + b phi^2:
 *   eps1 = 2 g^2,  eps2 = d ln eps1/dN = -4 g' = -8 b phi,  eps2 eps3 = d eps2/dN = 16 b g,
 * inflation ends (eps1 = 1) at phi_e = -sqrt((1/sqrt 2 - a)/b), and N(phi) follows from
 * dN = dphi/(2g) in closed form. eps2 changes sign at phi = 0 and eps1 reaches 0.18 at the start,
 * so this checks the integration, the end, the pivot and the flow parameters where slow roll
 * does not hold. The run starts at phi0 = 5 on the slow-roll attractor (u = 0) and relaxes onto
 * the exact one within a few e-folds, long before the pivots checked here.
 */
const a = 0.05;
const b = 0.01;
const g = (phi: number) => a + b * phi * phi;
const phiEnd = -Math.sqrt((Math.SQRT1_2 - a) / b);
/** e-folds from phi to the end along the exact solution: ∫ dphi/(2g) = atan(phi sqrt(b/a))/(2 sqrt(ab)) + const. */
const efoldsToEnd = (phi: number) => (Math.atan(phi * Math.sqrt(b / a)) - Math.atan(phiEnd * Math.sqrt(b / a))) / (2 * Math.sqrt(a * b));
/** The field N e-folds before the end. */
const fieldAt = (n: number) => Math.tan(2 * Math.sqrt(a * b) * n + Math.atan(phiEnd * Math.sqrt(b / a))) / Math.sqrt(b / a);

const EXPRESSION = 'exp(2 * (a * phi + b * phi^3 / 3)) * (3 - 2 * (a + b * phi^2)^2)';

describe('Hamilton–Jacobi exact background (H = exp(a phi + b phi^3/3))', () => {
  // N_* = efoldsToEnd(0) puts the pivot where eps2 crosses zero.
  for (const efolds of [20, efoldsToEnd(0), 40]) {
    it(`N_* = ${efolds.toFixed(3)}`, () => {
      const result = point({ potential: { expression: EXPRESSION }, params: { a, b }, phi0: 5, pivot: { efolds } });
      expect(result.status).toBe('ok');
      expect(Math.abs(result.phiEnd - phiEnd)).toBeLessThan(1e-8);
      const phi = fieldAt(efolds);
      // dphi/dN = 2g ~ 0.1 here: 1e-7 in the field is ~1e-6 of an e-fold.
      expect(Math.abs(result.phiPivot - phi)).toBeLessThan(1e-7);
      const x = result.phiPivot;
      expect(Math.abs(result.eps1 / (2 * g(x) ** 2) - 1)).toBeLessThan(1e-8);
      expect(Math.abs(result.eps2 - -8 * b * x)).toBeLessThan(1e-8);
      expect(Math.abs((result.eps2 * result.eps3) / (16 * b * g(x)) - 1)).toBeLessThan(1e-6);
    });
  }
});
