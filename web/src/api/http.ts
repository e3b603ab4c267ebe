import type { z } from 'zod';

/** An API error as the server reports it: `{ error: { code, message, field? } }` with its HTTP status. */
/** `issues`: every problem of an invalid plan, each with the path of its field. */
export interface ApiIssue { path: string; message: string }

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly field?: string,
    readonly issues: ApiIssue[] = [],
  ) {
    super(message);
  }
}

const API = '/api/v1';

/**
 * One request to the API, parsed with the shared zod schema when given. The session travels in its
 * httpOnly cookie, so no credential is ever handled by page scripts.
 */
export async function request<T>(method: string, path: string, options: { body?: unknown; form?: FormData; schema?: z.ZodType<T> } = {}): Promise<T> {
  const init: RequestInit = { method, credentials: 'same-origin', headers: { accept: 'application/json' } };
  if (options.form) init.body = options.form;
  else if (options.body !== undefined) {
    init.body = JSON.stringify(options.body);
    (init.headers as Record<string, string>)['content-type'] = 'application/json';
  }
  let res: Response;
  try {
    res = await fetch(API + path, init);
  } catch {
    throw new ApiError(0, 'network', 'The server cannot be reached; check your connection and try again.');
  }
  if (res.status === 204 || res.status === 202) return undefined as T;
  const text = await res.text();
  const data: unknown = text ? JSON.parse(text) : undefined;
  if (!res.ok) {
    const error = (data as { error?: { code?: string; message?: string; field?: string; issues?: ApiIssue[] } } | undefined)?.error;
    throw new ApiError(res.status, error?.code ?? 'http_' + res.status, error?.message ?? res.statusText, error?.field, error?.issues ?? []);
  }
  return options.schema ? options.schema.parse(data) : (data as T);
}
