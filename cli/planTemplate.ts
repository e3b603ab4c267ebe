import type { FamilyParameter, PotentialFamily } from '../shared/physics/potential/families.ts';
import { PIVOT_AXIS } from '../shared/plan/scanPlan.ts';

/**
 * The commented starter plan of `rollway plan new`: every shape parameter of the family over its
 * suggested range, N_* over three values, the fast preset. Pure text, so a test can check that
 * every family's starter passes validation.
 */

const AXIS_COUNT = 10;
const PIVOT_VALUES = [50, 55, 60];

function axis(p: FamilyParameter): string {
  const [from, to] = p.range;
  const spec = p.scale === 'log' ? `logRange: { from: ${from}, to: ${to}, count: ${AXIS_COUNT} }` : `range: { from: ${from}, to: ${to}, count: ${AXIS_COUNT} }`;
  return `  - name: ${p.name}\n    # ${p.description} (default ${p.default})\n    ${spec}`;
}

export function starterPlan(family: PotentialFamily): string {
  const shape = family.parameters.filter((p) => p.name !== 'V0');
  const points = AXIS_COUNT ** shape.length * PIVOT_VALUES.length;
  const sizes = [...shape.map(() => String(AXIS_COUNT)), String(PIVOT_VALUES.length)].join(' × ');
  const lines = [
    `# Starter scan plan: ${family.label}, V(phi) = ${family.expression}`,
    `# ${family.description}`,
    `# Reference: ${family.reference}`,
    '# Check it with `rollway plan check FILE`, send it with `rollway submit FILE --watch`.',
    `title: ${family.label} scan`,
    '# notes: free text kept with the scan',
    '',
    'potential:',
    `  family: ${family.id}`,
    '',
    '# One axis per scanned name: range (linear steps), logRange (geometric steps, bounds > 0) or',
    `# values (a list). Up to 6 axes; ${PIVOT_AXIS} scans N_*, the e-folds from the pivot to the end.`,
    'axes:',
    ...shape.map(axis),
    `  - name: ${PIVOT_AXIS}`,
    `    values: [${PIVOT_VALUES.join(', ')}]`,
    '',
    `# grid: every combination (${sizes} = ${points} points); zip: value i of each axis together.`,
    'combine: grid',
    '',
    '# V0 only sets the scale of V: the amplitude is normalised to targetAs afterwards.',
    '# fixed: { V0: 1 }',
    ...(family.needsEndPhi
      ? ['', '# This potential never ends inflation by itself (eps1 < 1 everywhere): end it at this field value.', 'endPhi: 10']
      : []),
    '',
    'precision:',
    '  preset: fast   # fast: second-order Hubble-flow observables; exact: Mukhanov–Sasaki spectra (slower)',
    '',
    '# targetAs: 2.1e-9   # scalar amplitude the normalisation aims for',
    '# boundSet: the observational bounds on n_s and r each point is scored against (default preset)',
    '',
  ];
  return lines.join('\n');
}
