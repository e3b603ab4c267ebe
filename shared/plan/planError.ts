import { InvalidInputError } from '../errors.ts';

export interface PlanIssue {
  /** Where the problem is, e.g. `axes[1].count`; empty for the plan as a whole or its text. */
  path: string;
  message: string;
}

/** The message lists at most this many problems, so a list of 100000 bad values stays readable. */
const MAX_LISTED = 50;

export function formatIssue(issue: PlanIssue): string {
  return issue.path === '' ? issue.message : `${issue.path}: ${issue.message}`;
}

/**
 * Every problem of a plan at once (a user fixes them in one pass, not one per submit). `field` is
 * the first problem's path, so the API's `{ error: { code, message, field } }` still points somewhere.
 */
export class PlanValidationError extends InvalidInputError {
  readonly issues: readonly PlanIssue[];

  constructor(issues: readonly PlanIssue[]) {
    const listed = issues.slice(0, MAX_LISTED).map(formatIssue);
    if (issues.length > MAX_LISTED) listed.push(`… and ${issues.length - MAX_LISTED} more problems`);
    const head = issues.length === 1 ? 'The scan plan has 1 problem:' : `The scan plan has ${issues.length} problems:`;
    super(`${head}\n${listed.join('\n')}`, issues[0]?.path || undefined, 'invalid_plan');
    this.name = 'PlanValidationError';
    this.issues = issues;
  }

  override toJSON(): { code: string; message: string; field?: string; issues: PlanIssue[] } {
    return { ...super.toJSON(), issues: [...this.issues] };
  }
}
