import { InvalidInputError } from '../../errors.ts';
import type { PointRequest } from '../../plan/pointRequest.ts';
import { DEFAULT_TARGET_AMPLITUDE } from '../bounds/boundSet.ts';
import { inlinedBackgroundRhs } from '../background/equations.ts';
import type { Rhs } from '../ode/integrate.ts';
import { DEFAULT_PRECISION } from '../precision.ts';
import { resolveParameters } from '../potential/parameters.ts';
import type { PreparedPotential } from '../potential/portable.ts';
import type { PointInput } from './types.ts';

/**
 * One compiled background right-hand side per potential code, however often the potential is
 * prepared: building it is a `new Function`, and each one is a function of its own to V8, so
 * odex's call site stays monomorphic (and the right-hand side inlined) only while few exist.
 */
const inlinedRhs = new Map<string, (params: Float64Array) => Rhs>();
const INLINED_RHS_LIMIT = 32;

function backgroundRhsFor(prepared: PreparedPotential, params: Float64Array): Rhs | undefined {
  if (prepared.code === undefined) return undefined;
  let build = inlinedRhs.get(prepared.code);
  if (!build) {
    if (inlinedRhs.size >= INLINED_RHS_LIMIT) inlinedRhs.delete(inlinedRhs.keys().next().value!);
    inlinedRhs.set(prepared.code, (build = inlinedBackgroundRhs(prepared.code)));
  }
  return build(params);
}

/**
 * Turns a validated request and its prepared potential into the physics core's input; throws
 * InvalidInputError naming the field. Free of the expression compiler, so compute threads use it.
 */
export function toPointInput(request: PointRequest, prepared: PreparedPotential): PointInput {
  const { potential, defaults } = prepared;
  const params = resolveParameters(potential.parameterNames, defaults, request.params, 'params');
  prepared.positive.forEach((name) => {
    const value = params[potential.parameterNames.indexOf(name)]!;
    if (!(value > 0)) {
      throw new InvalidInputError(`params.${name}: must be > 0 for the "${request.potential.family}" family; got ${value}`, `params.${name}`, 'invalid_parameter');
    }
  });
  if (prepared.needsEndPhi && request.endPhi === undefined) {
    throw new InvalidInputError(`potential.family: "${request.potential.family}" never ends inflation by itself; give endPhi (--end-phi)`, 'endPhi', 'missing_end_phi');
  }
  const domain = request.fieldRange ? { min: request.fieldRange[0], max: request.fieldRange[1] } : prepared.fieldDomain(params);
  const backgroundRhs = backgroundRhsFor(prepared, params);
  return {
    evaluate: potential.evaluate,
    params,
    ...(backgroundRhs ? { backgroundRhs } : {}),
    domain,
    end: request.endPhi === undefined ? { kind: 'eps1' } : { kind: 'field', phiEnd: request.endPhi },
    ...(request.phi0 === undefined ? {} : { phi0: request.phi0 }),
    pivot: 'efolds' in request.pivot ? { kind: 'efolds', efolds: request.pivot.efolds } : { kind: 'reheating', history: request.pivot.reheating },
    targetAs: request.targetAs ?? DEFAULT_TARGET_AMPLITUDE,
    exact: request.exact,
    precision: { ...DEFAULT_PRECISION, ...request.precision },
  };
}
