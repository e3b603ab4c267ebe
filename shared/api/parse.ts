import type { z } from 'zod';
import { InvalidInputError } from '../errors.ts';

/** Validates data with a shared schema; the first problem becomes an error naming its path. */
export function parseRequest<S extends z.ZodType>(schema: S, data: unknown): z.infer<S> {
  const parsed = schema.safeParse(data);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0]!;
  const path = issue.path.join('.');
  throw new InvalidInputError(path ? `${path}: ${issue.message}` : issue.message, path || undefined);
}
