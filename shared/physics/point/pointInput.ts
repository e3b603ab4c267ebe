import { InvalidInputError } from '../../errors.ts';
import type { PointRequest } from '../../plan/pointRequest.ts';
import { DEFAULT_TARGET_AMPLITUDE } from '../bounds/boundSet.ts';
import { DEFAULT_PRECISION } from '../precision.ts';
import { resolveParameters } from '../potential/parameters.ts';
import type { PreparedPotential } from '../potential/portable.ts';
import type { PointInput } from './types.ts';

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
  return {
    evaluate: potential.evaluate,
    params,
    domain,
    end: request.endPhi === undefined ? { kind: 'eps1' } : { kind: 'field', phiEnd: request.endPhi },
    ...(request.phi0 === undefined ? {} : { phi0: request.phi0 }),
    pivot: 'efolds' in request.pivot ? { kind: 'efolds', efolds: request.pivot.efolds } : { kind: 'reheating', history: request.pivot.reheating },
    targetAs: request.targetAs ?? DEFAULT_TARGET_AMPLITUDE,
    exact: request.exact,
    precision: { ...DEFAULT_PRECISION, ...request.precision },
  };
}
