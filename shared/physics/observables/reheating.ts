import { CMB_TEMPERATURE_GEV, ENTROPY_DOF_TODAY, INVERSE_MPC_GEV, REDUCED_PLANCK_MASS_GEV } from './constants.ts';

/**
 * How the pivot is placed when it follows from reheating: a phase with constant equation of
 * state w from the end of inflation until the energy density rho_reh, then radiation with
 * g_reh relativistic degrees of freedom (entropy and energy counted alike).
 */
export interface ReheatingHistory {
  w: number;
  /** Energy density at the end of reheating, as rho_reh^(1/4) in GeV; or give tReh. */
  rhoRehQuarterGeV?: number;
  /** Temperature at the end of reheating in GeV. */
  tRehGeV?: number;
  /** Relativistic degrees of freedom at reheating (106.75: Standard Model above the electroweak scale, common practice). */
  gReh?: number;
  /** Pivot scale in Mpc^-1. */
  kPivotMpc?: number;
}

export const DEFAULT_K_PIVOT_MPC = 0.05;
export const DEFAULT_G_REH = 106.75;

/** rho_reh in M_pl^4 from whichever of rho_reh^(1/4) or T_reh the history gives. */
export function reheatingDensity(history: ReheatingHistory): number {
  const g = history.gReh ?? DEFAULT_G_REH;
  if (history.rhoRehQuarterGeV !== undefined) return (history.rhoRehQuarterGeV / REDUCED_PLANCK_MASS_GEV) ** 4;
  if (history.tRehGeV !== undefined) return ((Math.PI * Math.PI) / 30) * g * (history.tRehGeV / REDUCED_PLANCK_MASS_GEV) ** 4;
  throw new Error('a reheating history needs rhoRehQuarterGeV or tRehGeV');
}

/**
 * The matching equation for the e-folds between the pivot's horizon exit and the end of inflation
 * (Liddle & Leach 2003, PRD 68, 103503; Planck Collaboration 2020, A&A 641, A10, eq. 47), written
 * without H0 by following a_0/a from today back through radiation (entropy conservation) and the
 * reheating phase (rho ∝ a^(-3(1+w))):
 *   N_* = ln(H_* / (k_* / a_0)) - ln(T_reh/T_0) - (1/3) ln(g_reh/g_s0) - ln(rho_end/rho_reh)/(3(1+w)).
 * All densities in M_pl^4, H_* in M_pl; inputs are for the normalised potential.
 */
export function pivotEfoldsFromReheating(hubblePivot: number, rhoEnd: number, history: ReheatingHistory): number {
  const g = history.gReh ?? DEFAULT_G_REH;
  const rhoReh = Math.min(reheatingDensity(history), rhoEnd);
  const tReh = ((30 * rhoReh) / (Math.PI * Math.PI * g)) ** 0.25;
  const kPivot = ((history.kPivotMpc ?? DEFAULT_K_PIVOT_MPC) * INVERSE_MPC_GEV) / REDUCED_PLANCK_MASS_GEV;
  const t0 = CMB_TEMPERATURE_GEV / REDUCED_PLANCK_MASS_GEV;
  return (
    Math.log(hubblePivot / kPivot) -
    Math.log(tReh / t0) -
    Math.log(g / ENTROPY_DOF_TODAY) / 3 -
    Math.log(rhoEnd / rhoReh) / (3 * (1 + history.w))
  );
}
