import { InvalidInputError } from '../../errors.ts';
import type { PointRequest, PotentialSpec } from '../../plan/pointRequest.ts';
import { DEFAULT_TARGET_AMPLITUDE } from '../bounds/boundSet.ts';
import { DEFAULT_PRECISION } from '../precision.ts';
import { compileExpression } from '../potential/expression.ts';
import { compileFamily } from '../potential/families.ts';
import { resolveParameters } from '../potential/parameters.ts';
import { compileTabulatedPotential, parseTabulatedPotential } from '../potential/tabulated.ts';
import type { CompiledPotential } from '../potential/types.ts';
import type { PointInput } from './types.ts';

/** Field interval searched for phi0 when neither the family nor the request says otherwise. */
const DEFAULT_FIELD_RANGE = { min: 0, max: 100 } as const;

export interface PreparedPotential {
  potential: CompiledPotential;
  defaults: Readonly<Record<string, number>>;
  fieldDomain: (params: Float64Array) => { min: number; max: number };
  needsEndPhi: boolean;
}

/** Compiles the potential a request names; parameter names of an expression come from the given values. */
export function preparePotential(spec: PotentialSpec, parameterNames: readonly string[]): PreparedPotential {
  if (spec.family !== undefined) {
    const family = compileFamily(spec.family);
    return { potential: family, defaults: family.defaults, fieldDomain: (p) => family.evaluateFieldDomain(p), needsEndPhi: family.family.needsEndPhi === true };
  }
  const potential = spec.expression !== undefined
    ? compileExpression(spec.expression, parameterNames.filter((n) => n !== 'V0'), 'potential.expression')
    : compileTabulatedPotential(parseTabulatedPotential(spec.table ?? '', 'potential.table'));
  return { potential, defaults: { V0: 1 }, fieldDomain: () => ({ ...DEFAULT_FIELD_RANGE }), needsEndPhi: false };
}

/** Turns a validated request into the physics core's input; throws InvalidInputError naming the field. */
export function preparePoint(request: PointRequest, prepared = preparePotential(request.potential, Object.keys(request.params))): PointInput {
  const { potential, defaults } = prepared;
  const params = resolveParameters(potential.parameterNames, defaults, request.params, 'params');
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
