import { FLOW_C } from './constants.ts';

export interface FlowParameters {
  eps1: number;
  eps2: number;
  /** d eps2/dN: finite where eps2 crosses zero, where eps3 = eps2eps3/eps2 is not. */
  eps2eps3: number;
}

export interface FastObservables {
  ns: number;
  r: number;
  nt: number;
  alphaS: number;
}

/**
 * Second-order Hubble-flow expressions at the pivot (Gong & Stewart 2001, PLB 510, 1;
 * Schwarz, Terrero-Escalante & Garcia 2001, PLB 517, 243), with C = gamma_E + ln 2 - 2:
 *   n_s - 1 = -2e1 - e2 - 2e1^2 - (2C+3) e1 e2 - C e2 e3
 *   r       = 16 e1 (1 + C e2)
 *   n_t     = -2e1 - 2e1^2 - 2(C+1) e1 e2
 *   alpha_s = -2 e1 e2 - e2 e3
 */
export function fastObservables({ eps1: e1, eps2: e2, eps2eps3: e2e3 }: FlowParameters): FastObservables {
  return {
    ns: 1 - 2 * e1 - e2 - 2 * e1 * e1 - (2 * FLOW_C + 3) * e1 * e2 - FLOW_C * e2e3,
    r: 16 * e1 * (1 + FLOW_C * e2),
    nt: -2 * e1 - 2 * e1 * e1 - 2 * (FLOW_C + 1) * e1 * e2,
    alphaS: -2 * e1 * e2 - e2e3,
  };
}

/**
 * Scalar amplitude at leading order, A_s = H^2 / (8 pi^2 eps1) (M_pl = 1). The second-order
 * correction factor is [1 - 2(C+1) e1 - C e2] (same references), applied here so the
 * normalisation is consistent with n_s and r.
 */
export function scalarAmplitude(H2: number, { eps1: e1, eps2: e2 }: FlowParameters): number {
  return (H2 / (8 * Math.PI * Math.PI * e1)) * (1 - 2 * (FLOW_C + 1) * e1 - FLOW_C * e2);
}
