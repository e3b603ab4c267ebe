/**
 * Numerical settings of the physics core, in one place. Merge user values with `??` so that an
 * explicit 0 is never mistaken for "unset".
 */
export interface Precision {
  /** Relative tolerance of the background and mode integrations. */
  rtol: number;
  /** Absolute tolerance floor; tiny because u = phi' + V'/V is itself small on the attractor. */
  atol: number;
  /** Extra e-folds above N_* that the automatic initial-field search aims for. */
  efoldMargin: number;
  /** Give up (status never_ends) after this many e-folds without the end condition. */
  maxEfolds: number;
  /** Mode start: k/aH at which each mode is set up in the adiabatic vacuum. */
  modeStartRatio: number;
  /** Mode stop: k/aH at which each mode is read off, well outside its own horizon. */
  modeEndRatio: number;
  /** Half-width in ln k of the three-point stencil for n_s and alpha_s from the spectra. */
  spectralStep: number;
}

export const DEFAULT_PRECISION: Readonly<Precision> = Object.freeze({
  rtol: 1e-8,
  atol: 1e-16,
  efoldMargin: 10,
  maxEfolds: 5000,
  modeStartRatio: 100,
  modeEndRatio: 1e-4,
  spectralStep: 0.1,
});
