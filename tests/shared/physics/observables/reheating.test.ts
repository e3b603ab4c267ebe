import { describe, expect, it } from 'vitest';
import { pivotEfoldsFromReheating } from '../../../../shared/physics/observables/reheating.ts';
import { family, point } from '../../../helpers/point.ts';

const MPL = 2.435e18;
// A plateau-like pivot in M_pl units: H_* = 1.5e13 GeV, rho_end^(1/4) = 5e15 GeV.
const H = 1.5e13 / MPL;
const rhoEnd = (5e15 / MPL) ** 4;

describe('pivot from reheating (Liddle & Leach 2003, PRD 68, 103503)', () => {
  it('does not depend on rho_reh when reheating is radiation-like (w = 1/3)', () => {
    // With w = 1/3 reheating is indistinguishable from radiation: the (1-3w) factor vanishes.
    const a = pivotEfoldsFromReheating(H, rhoEnd, { w: 1 / 3, rhoRehQuarterGeV: 1e6 });
    const b = pivotEfoldsFromReheating(H, rhoEnd, { w: 1 / 3, rhoRehQuarterGeV: 1e14 });
    expect(Math.abs(a - b)).toBeLessThan(1e-12);
  });

  it('moves by (1 - 3w)/(12(1 + w)) per e-fold of rho_reh', () => {
    // dN_*/d ln rho_reh = (1 - 3w)/(12(1 + w)) (Planck Collaboration 2020, A&A 641, A10, eq. 47).
    for (const w of [0, 0.2, -0.2, 1]) {
      const at = (q: number) => pivotEfoldsFromReheating(H, rhoEnd, { w, rhoRehQuarterGeV: q });
      const slope = (at(1e10 * Math.exp(0.25)) - at(1e10)) / 1;
      expect(Math.abs(slope - (1 - 3 * w) / (12 * (1 + w)))).toBeLessThan(1e-10);
    }
  });

  it('agrees with the rounded-constant form of the Planck analysis', () => {
    // N_* ≈ 67 - ln(k_*/(a0 H0)) + (1/4) ln(V_*^2/(M_pl^4 rho_end)) + (1-3w)/(12(1+w)) ln(rho_reh/rho_end)
    //       - (1/12) ln(g_reh)   (Planck Collaboration 2020, A&A 641, A10, eq. 47; from memory, with
    // h = 0.67). The constant 67 rounds T0, g_s0 and factors of order one, so agreement is to a few
    // tenths of an e-fold.
    const vStar = 3 * H * H; // V_* ≈ 3 H_*^2 in slow roll
    const rhoReh = (1e9 / MPL) ** 4;
    const ours = pivotEfoldsFromReheating(H, rhoEnd, { w: 0, rhoRehQuarterGeV: 1e9 });
    const a0H0 = 0.67 / 2997.92458; // Mpc^-1
    const theirs = 67 - Math.log(0.05 / a0H0) + Math.log(vStar ** 2 / rhoEnd) / 4
      + Math.log(rhoReh / rhoEnd) / 12 - Math.log(106.75) / 12;
    expect(Math.abs(ours - theirs)).toBeLessThan(0.3);
  });

  it('is solved self-consistently inside a point', () => {
    const viaReheating = point({ ...family('starobinsky'), pivot: { reheating: { w: 0, tRehGeV: 1e9 } } });
    expect(viaReheating.status).toBe('ok');
    // Plateau models with matter-like reheating to 1e9 GeV: N_* in the low 50s (common practice).
    expect(viaReheating.nPivot).toBeGreaterThan(48);
    expect(viaReheating.nPivot).toBeLessThan(56);
    const fixed = point({ ...family('starobinsky'), pivot: { efolds: viaReheating.nPivot } });
    // The two runs start from different phi0 (the search aims at different N_*), so they agree to
    // the integration accuracy at the default rtol (measured ~3e-10 in n_s), not to the last bit.
    expect(Math.abs(fixed.ns - viaReheating.ns)).toBeLessThan(1e-8);
  });
});
