import type { EndCondition } from '../background/integrateBackground.ts';
import type { FieldDomain } from '../background/initialField.ts';
import type { ReheatingHistory } from '../observables/reheating.ts';
import type { Precision } from '../precision.ts';
import type { Rhs } from '../ode/integrate.ts';
import type { PotentialEvaluator } from '../potential/types.ts';

export type PointStatus = 'ok' | 'no_inflation' | 'too_few_efolds' | 'never_ends' | 'negative_potential' | 'solver_failed';

export type PivotRule = { kind: 'efolds'; efolds: number } | { kind: 'reheating'; history: ReheatingHistory };

export interface PointInput {
  evaluate: PotentialEvaluator;
  params: Float64Array;
  /** The background equations for these params with a generated potential written in (inlinedBackgroundRhs); absent: built on `evaluate`. */
  backgroundRhs?: Rhs;
  /** Where the automatic initial-field search looks (ignored when phi0 is given). */
  domain: FieldDomain;
  end: EndCondition;
  phi0?: number;
  pivot: PivotRule;
  /** Target scalar amplitude P_R(k_*) that fixes the overall scale of V. */
  targetAs: number;
  exact: boolean;
  precision: Precision;
}

export interface ExactObservables {
  ns: number;
  r: number;
  nt: number;
  alphaS: number;
  /** P_R(k_*) for V as given. */
  As: number;
  /** Factor on V that brings P_R(k_*) to the target. */
  amplitude: number;
}

/** One point's outcome; observables are NaN unless status is ok. */
export interface PointResult {
  status: PointStatus;
  reason: string;
  nTotal: number;
  /** e-folds from the pivot's horizon exit to the end of inflation (given or solved from reheating). */
  nPivot: number;
  phiStart: number;
  phiEnd: number;
  phiPivot: number;
  deltaPhi: number;
  eps1: number;
  eps2: number;
  eps3: number;
  ns: number;
  r: number;
  nt: number;
  alphaS: number;
  /** Scalar amplitude at the pivot for V as given (Hubble-flow, next-to-leading order). */
  As: number;
  /** Factor on V that gives the target A_s. */
  amplitude: number;
  /** V_*^(1/4) of the normalised potential, in GeV. */
  energyScaleGeV: number;
  /** H_* of the normalised potential, in GeV. */
  hubbleGeV: number;
  /** Right-hand-side evaluations spent, a machine-independent cost measure. */
  evaluations: number;
  exact?: ExactObservables;
}
