import { compileTabulatedPotential, type PotentialTable } from './tabulated.ts';
import type { CompiledPotential, PotentialEvaluator } from './types.ts';

/**
 * A compiled potential as plain data that crosses to a compute thread (structured clone): the
 * function bodies codegen.ts generated from a checked tree, or a table's samples. Rebuilding it
 * needs no parser and no symbolic algebra, so compute threads never load mathjs (~30 MB of heap
 * each, measured with v8.getHeapStatistics).
 */
export type PortablePotential = {
  readonly defaults: Readonly<Record<string, number>>;
  readonly needsEndPhi: boolean;
  /** Parameters a family only defines for values > 0; absent: none. */
  readonly positive?: readonly string[];
  /** Generated statements of the family's field-domain bounds (V is the bound); absent: the default range. */
  readonly domainCode?: { readonly min: string; readonly max: string };
} & (
  | { readonly kind: 'generated'; readonly code: string; readonly parameterNames: readonly string[]; readonly formula: CompiledPotential['formula'] }
  | { readonly kind: 'table'; readonly table: PotentialTable }
);

/** Field interval searched for phi0 when neither the family nor the request says otherwise. */
export const DEFAULT_FIELD_RANGE = { min: 0, max: 100 } as const;

/** What the physics core needs of a potential, once per scan or request, whatever its source. */
export interface PreparedPotential {
  potential: CompiledPotential;
  defaults: Readonly<Record<string, number>>;
  fieldDomain: (params: Float64Array) => { min: number; max: number };
  needsEndPhi: boolean;
  positive: readonly string[];
  /** The generated statements (declaring V, dV, d2V) when the potential is generated code, for the inlined background equations. */
  code?: string;
}

/** The locals the generated statements declare (codegen.ts, generateStatements): V, V', V''. */
export const POTENTIAL_LOCALS = ['V', 'dV', 'd2V'] as const;

/**
 * The evaluator around generated statements. Only codegen.ts output reaches this
 * (PortablePotential is made by portablePotential in point/preparePoint.ts from a checked tree,
 * never from user text), so this is not evaluating what a user wrote.
 */
export function evaluatorFromCode(code: string): PotentialEvaluator {
  return new Function('phi', 'p', 'out', `"use strict";\n${code}\nout[0] = V;\nout[1] = dV;\nout[2] = d2V;`) as unknown as PotentialEvaluator;
}

export function fromPortable(portable: PortablePotential): PreparedPotential {
  const potential: CompiledPotential = portable.kind === 'table'
    ? compileTabulatedPotential(portable.table)
    : { parameterNames: portable.parameterNames, evaluate: evaluatorFromCode(portable.code), formula: portable.formula };
  let fieldDomain: PreparedPotential['fieldDomain'] = () => ({ ...DEFAULT_FIELD_RANGE });
  if (portable.domainCode) {
    const [min, max] = [evaluatorFromCode(portable.domainCode.min), evaluatorFromCode(portable.domainCode.max)];
    const out = new Float64Array(3);
    fieldDomain = (params) => {
      min(0, params, out);
      const lower = out[0]!;
      max(0, params, out);
      return { min: lower, max: out[0]! };
    };
  }
  return {
    potential, defaults: portable.defaults, fieldDomain, needsEndPhi: portable.needsEndPhi, positive: portable.positive ?? [],
    ...(portable.kind === 'generated' ? { code: portable.code } : {}),
  };
}
