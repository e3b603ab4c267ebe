/**
 * The one shape every potential takes before it reaches the integrator, whatever its source
 * (built-in family, custom expression or tabulated samples): a function that writes V, V' and V''
 * for a parameter vector. Writing into a caller's buffer keeps the integrator's hot loop free of
 * allocations.
 */
export type PotentialEvaluator = (phi: number, params: Float64Array, out: Float64Array) => void;

export interface CompiledPotential {
  /** Parameter names in the order `params` is read; always includes the overall scale `V0`. */
  readonly parameterNames: readonly string[];
  /** out[0] = V, out[1] = dV/dphi, out[2] = d2V/dphi2 at phi. */
  readonly evaluate: PotentialEvaluator;
  /** Human-readable V(phi) and its derivatives, for provenance and the web app. */
  readonly formula: { readonly V: string; readonly dV: string; readonly d2V: string };
}
