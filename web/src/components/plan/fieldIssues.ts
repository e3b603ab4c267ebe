import type { PlanIssue } from '../../../../shared/plan/planError.ts';
import { TOLERANCE_FIELDS, type PlanForm } from './planForm.ts';

export const REHEATING_FIELDS = ['w', 'tRehGeV', 'rhoRehQuarterGeV', 'gReh', 'kPivotMpc'] as const;

/**
 * Which plan issues belong to which input. A leaf field also takes the issues below it
 * (`axes[0].values` shows `axes[0].values[3]`); a container (`axes`, `pivot`) only its own, so an
 * issue is shown once, next to the input closest to it.
 */
export interface FieldRef {
  path: string;
  /** Also claims issues whose path continues below this one. */
  below: boolean;
}

const leaf = (path: string): FieldRef => ({ path, below: true });
const own = (path: string): FieldRef => ({ path, below: false });

export function claims(field: FieldRef, issuePath: string): boolean {
  if (issuePath === field.path) return true;
  return field.below && (issuePath.startsWith(`${field.path}.`) || issuePath.startsWith(`${field.path}[`));
}

export function messagesAt(issues: readonly PlanIssue[], field: FieldRef): string[] {
  return issues.filter((i) => claims(field, i.path)).map((i) => i.message);
}

export const fields = {
  leaf,
  own,
  axis: (i: number, kind: string, key: string) => leaf(`axes[${i}].${kind}.${key}`),
};

/** Every input the form shows for its current state, as the view lays them out. */
export function formFields(form: PlanForm, parameterNames: readonly string[]): FieldRef[] {
  const out: FieldRef[] = [leaf('title'), leaf('notes'), own('potential'), leaf('potential.family'), leaf('potential.expression'),
    leaf('potential.parameters'), leaf('potential.table'), own('fixed'), own('axes'), leaf('combine'), own('pivot'), leaf('pivot.efolds'),
    own('pivot.reheating'), leaf('endPhi'), leaf('phi0'), leaf('fieldRange'), own('precision'), leaf('precision.preset'), leaf('targetAs'),
    leaf('boundSet')];
  for (const key of REHEATING_FIELDS) out.push(leaf(`pivot.reheating.${key}`));
  for (const name of new Set([...parameterNames, ...Object.keys(form.fixed)])) out.push(leaf(`fixed.${name}`));
  form.axes.forEach((axis, i) => {
    out.push(own(`axes[${i}]`), leaf(`axes[${i}].name`), own(`axes[${i}].${axis.kind}`));
    if (axis.kind === 'values') out.push(leaf(`axes[${i}].values`));
    else for (const key of ['from', 'to', 'count']) out.push(fields.axis(i, axis.kind, key));
  });
  for (const key of TOLERANCE_FIELDS) out.push(leaf(`precision.${key}`));
  return out;
}

/** Issues no input of the form claims (shown in the form's summary so none is hidden). */
export function unclaimedIssues(issues: readonly PlanIssue[], refs: readonly FieldRef[]): PlanIssue[] {
  return issues.filter((issue) => !refs.some((f) => claims(f, issue.path)));
}

const DECLARED = /^potential\.parameters\[(\d+)\]$/;

/**
 * "has no value" is reported at the declared name (potential.parameters[i]); the value belongs in
 * that parameter's own input, so the issue moves there.
 */
export function relocateIssues(issues: readonly PlanIssue[], declared: readonly string[]): PlanIssue[] {
  return issues.map((issue) => {
    const m = DECLARED.exec(issue.path);
    const name = m ? declared[Number(m[1])] : undefined;
    return name !== undefined && issue.message.includes('has no value') ? { ...issue, path: `fixed.${name}` } : issue;
  });
}
