import type { z } from 'zod';

export { ApiError, type ApiIssue } from '../../../shared/api/apiError.ts';
import { ApiError, type ApiIssue } from '../../../shared/api/apiError.ts';

export const API = '/api/v1';

type UnauthorizedHandler = (path: string) => void;
let onUnauthorized: UnauthorizedHandler | undefined;
/**
 * Called when a request answers 401 (the session ended or expired while the page was open), so the
 * session store can send the user to sign in. Sign-in and the session check report 401 themselves.
 */
export function setUnauthorizedHandler(handler: UnauthorizedHandler | undefined): void {
  onUnauthorized = handler;
}
const QUIET_401 = ['/auth/login', '/auth/me', '/auth/link'];

function parseBody(text: string): unknown {
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined; // e.g. a proxy's HTML error page; the status still tells what happened
  }
}

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
  const data = parseBody(await res.text());
  if (!res.ok) {
    if (res.status === 401 && !QUIET_401.some((p) => path.startsWith(p))) onUnauthorized?.(path);
    const error = (data as { error?: { code?: string; message?: string; field?: string; issues?: ApiIssue[] } } | undefined)?.error;
    const message = error?.message ?? (res.statusText || `The server answered ${res.status}.`);
    throw new ApiError(res.status, error?.code ?? 'http_' + res.status, message, error?.field, error?.issues ?? []);
  }
  if (!options.schema) return data as T;
  const parsed = options.schema.safeParse(data);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new ApiError(res.status, 'bad_response', `The server's answer to ${method} ${path} was not understood (${issue?.path.join('.') ?? ''}: ${issue?.message ?? 'invalid'}).`);
  }
  return parsed.data;
}
