import type { z } from 'zod';
import { ApiError } from '../api/http.ts';

export type FieldErrors = Record<string, string>;

/** First message per top-level field, from the same zod schema the server checks with. */
export function zodFieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const field = String(issue.path[0] ?? '');
    out[field] ??= issue.message;
  }
  return out;
}

/** Checks a form with a shared schema: the parsed body, or the errors to show beside each field. */
export function checkForm<S extends z.ZodType>(schema: S, input: unknown): { ok: true; value: z.output<S> } | { ok: false; errors: FieldErrors } {
  const parsed = schema.safeParse(input);
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, errors: zodFieldErrors(parsed.error) };
}

/** An API error placed beside its field when the server named one that the form shows, else at the form. */
export function placeApiError(error: unknown, fields: readonly string[]): { fields: FieldErrors; form?: string } {
  const message = error instanceof Error ? error.message : String(error);
  if (error instanceof ApiError && error.field && fields.includes(error.field)) return { fields: { [error.field]: message } };
  return { fields: {}, form: message };
}
