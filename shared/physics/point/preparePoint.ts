import type { PointRequest, PotentialSpec } from '../../plan/pointRequest.ts';
import { compileExpression } from '../potential/expression.ts';
import { compileFamily } from '../potential/families.ts';
import { fromPortable, type PortablePotential, type PreparedPotential } from '../potential/portable.ts';
import { parseTabulatedPotential } from '../potential/tabulated.ts';
import { toPointInput } from './pointInput.ts';
import type { PointInput } from './types.ts';

export type { PreparedPotential } from '../potential/portable.ts';

/**
 * Compiles the potential a request names into plain data (generated code or table samples);
 * parameter names of an expression come from the given values. This is the step that needs
 * mathjs: a scan does it once, in the server, and sends the result to its compute threads.
 */
export function portablePotential(spec: PotentialSpec, parameterNames: readonly string[]): PortablePotential {
  if (spec.family !== undefined) {
    const family = compileFamily(spec.family);
    return {
      kind: 'generated', code: family.code, parameterNames: family.parameterNames, defaults: family.defaults,
      needsEndPhi: family.family.needsEndPhi === true, formula: family.formula, domainCode: family.domainCode,
      positive: family.positive,
    };
  }
  const common = { defaults: { V0: 1 }, needsEndPhi: false } as const;
  if (spec.expression !== undefined) {
    const compiled = compileExpression(spec.expression, parameterNames.filter((n) => n !== 'V0'), 'potential.expression');
    return { ...common, kind: 'generated', code: compiled.code, parameterNames: compiled.parameterNames, formula: compiled.formula };
  }
  return { ...common, kind: 'table', table: parseTabulatedPotential(spec.table ?? '', 'potential.table') };
}

/** The potential ready for the integrator, by the same path compute threads take. */
export function preparePotential(spec: PotentialSpec, parameterNames: readonly string[]): PreparedPotential {
  return fromPortable(portablePotential(spec, parameterNames));
}

/** Turns a validated request into the physics core's input; throws InvalidInputError naming the field. */
export function preparePoint(request: PointRequest, prepared = preparePotential(request.potential, Object.keys(request.params))): PointInput {
  return toPointInput(request, prepared);
}
