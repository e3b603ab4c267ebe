import { PlanValidationError, type PlanIssue } from '../../../../shared/plan/planError.ts';
import { readPlanText, type PlanFormat } from '../../../../shared/plan/planText.ts';
import { validatePlan } from '../../../../shared/plan/validatePlan.ts';
import { planToForm, type PlanForm } from './planForm.ts';

export type UploadOutcome =
  /** The text could not be read as YAML/JSON: nothing goes into the form. */
  | { ok: false; issues: PlanIssue[] }
  /** The form shows what could be read; `issues` are the document's own problems (unknown fields included). */
  | { ok: true; form: PlanForm; issues: PlanIssue[] };

export function formatFromName(name: string): PlanFormat | undefined {
  return /\.json$/i.test(name) ? 'json' : /\.ya?ml$/i.test(name) ? 'yaml' : undefined;
}

/** Reads an uploaded plan file's text the way the server does (planText.ts) and turns it into the form. */
export function readUploadedPlan(text: string, fileName: string): UploadOutcome {
  let data: unknown;
  try {
    data = readPlanText(text, formatFromName(fileName));
  } catch (err) {
    if (err instanceof PlanValidationError) return { ok: false, issues: [...err.issues] };
    throw err;
  }
  let issues: PlanIssue[] = [];
  try {
    validatePlan(data);
  } catch (err) {
    if (!(err instanceof PlanValidationError)) throw err;
    issues = [...err.issues];
  }
  if (typeof data !== 'object' || data === null || Array.isArray(data)) return { ok: false, issues };
  return { ok: true, form: planToForm(data), issues };
}
