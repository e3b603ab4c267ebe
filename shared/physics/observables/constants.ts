/** Physical constants used to express results in laboratory units. */

/** Reduced Planck mass in GeV (common practice; CODATA 2018 gives 2.435e18 GeV). */
export const REDUCED_PLANCK_MASS_GEV = 2.435e18;

/** Euler–Mascheroni constant. */
export const EULER_GAMMA = 0.5772156649015329;

/** C = gamma_E + ln 2 - 2, the constant of the second-order Hubble-flow expansion (Stewart & Lyth 1993, PLB 302, 171). */
export const FLOW_C = EULER_GAMMA + Math.LN2 - 2;

/** 1 Mpc^-1 in GeV: hbar c / Mpc = 1.97326980e-16 GeV m / 3.08567758e22 m (PDG 2022 constants). */
export const INVERSE_MPC_GEV = 1.97326980e-16 / 3.08567758e22;

/** Photon temperature today in GeV: T0 = 2.7255 K (Fixsen 2009, ApJ 707, 916) times k_B = 8.617333e-14 GeV/K. */
export const CMB_TEMPERATURE_GEV = 2.7255 * 8.617333262e-14;

/** Entropy degrees of freedom today, photons plus three neutrino species: 2 + 7/8 * 6 * 4/11 = 43/11. */
export const ENTROPY_DOF_TODAY = 43 / 11;
