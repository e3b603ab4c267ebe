import { z } from 'zod';
import {
  adminUserSchema, apiTokenSchema, createdTokenSchema, loginResponseSchema, meSchema, usageSchema,
  type createTokenSchema, type setQuotaSchema,
} from './accounts.ts';
import { resultsPageSchema, resultsSummarySchema, type FilterOp } from './results.ts';
import { scanDetailSchema, scanViewSchema, TERMINAL_STATES, type ScanView, type SubmitScan } from './scans.ts';

/**
 * A typed client of the Rollway API for the CLI and for scripts (fetch only, so it runs in Node 20
 * and in a browser alike). Every answer is parsed with the shared zod schema, so a server of
 * another version fails loudly here instead of somewhere downstream; every error becomes an
 * ApiError carrying the HTTP status (0 when no answer came at all).
 */

export { ApiError, type ApiIssue } from './apiError.ts';
import { ApiError, type ApiIssue } from './apiError.ts';

export interface ClientOptions {
  /** The server, e.g. http://127.0.0.1:4600 (a trailing /api/v1 is accepted too). */
  url: string;
  /** A session JWT or an API token `rwt_…`, sent as a Bearer credential. */
  token?: string;
  /** Seconds a plain request may take; streams (events, downloads) have no limit. */
  timeoutSeconds?: number;
  fetch?: typeof fetch;
}

export interface RowFilter { column: string; op: FilterOp; value: number }
export interface DownloadOptions {
  format?: 'csv' | 'json' | 'ndjson';
  sort?: string;
  order?: 'asc' | 'desc';
  status?: string;
  region?: string;
  filters?: readonly RowFilter[];
}

type Query = Record<string, string | number | undefined>;
interface Send { body?: unknown; query?: Query | URLSearchParams; stream?: boolean; signal?: AbortSignal }

export const apiBase = (url: string): string => `${url.replace(/\/+$/, '').replace(/\/api\/v1$/, '')}/api/v1`;

/** Why fetch gave no answer, in words (Node puts the system error code on `cause`). */
function networkReason(error: unknown, timeoutSeconds: number): string {
  const name = (error as { name?: string }).name;
  if (name === 'TimeoutError') return `no answer within ${timeoutSeconds} s`;
  const code = (error as { cause?: { code?: string } }).cause?.code;
  const reasons: Record<string, string> = {
    ECONNREFUSED: 'connection refused', ENOTFOUND: 'host not found', EAI_AGAIN: 'host not found',
    ECONNRESET: 'connection reset', ETIMEDOUT: 'connection timed out', EHOSTUNREACH: 'host unreachable',
  };
  return (code && reasons[code]) ?? (error instanceof Error ? error.message : String(error));
}

async function errorFrom(response: Response): Promise<ApiError> {
  const text = await response.text().catch(() => '');
  let error: { code?: string; message?: string; field?: string; issues?: ApiIssue[] } | undefined;
  try {
    error = (JSON.parse(text) as { error?: typeof error }).error;
  } catch {
    // Not our JSON (a proxy's HTML page, say): the status line is all there is.
  }
  const message = error?.message ?? `HTTP ${response.status} ${response.statusText}`.trim();
  return new ApiError(response.status, error?.code ?? `http_${response.status}`, message, error?.field, error?.issues ?? []);
}

/** Yields each `data:` of the events named `event` in a server-sent event stream. */
async function* eventData(body: ReadableStream<Uint8Array>, event: string): AsyncGenerator<string> {
  const decoder = new TextDecoder();
  let buffer = '';
  for await (const chunk of body as unknown as AsyncIterable<Uint8Array>) {
    buffer += decoder.decode(chunk, { stream: true }).replace(/\r\n?/g, '\n');
    let end: number;
    while ((end = buffer.indexOf('\n\n')) >= 0) {
      const lines = buffer.slice(0, end).split('\n');
      buffer = buffer.slice(end + 2);
      const name = lines.find((l) => l.startsWith('event:'))?.slice(6).trim() ?? 'message';
      const data = lines.filter((l) => l.startsWith('data:')).map((l) => l.slice(5).replace(/^ /, ''));
      if (name === event && data.length > 0) yield data.join('\n');
    }
  }
}

export function downloadQuery(options: DownloadOptions): URLSearchParams {
  const query = new URLSearchParams();
  for (const key of ['format', 'sort', 'order', 'status', 'region'] as const) {
    const value = options[key];
    if (value !== undefined) query.set(key, value);
  }
  for (const f of options.filters ?? []) query.append(`${f.column}.${f.op}`, String(f.value));
  return query;
}

export type ApiClient = ReturnType<typeof createApiClient>;

export function createApiClient(options: ClientOptions) {
  const base = apiBase(options.url);
  const timeoutSeconds = options.timeoutSeconds ?? 30;
  const doFetch = options.fetch ?? fetch;

  async function send(method: string, path: string, init: Send = {}): Promise<Response> {
    const headers: Record<string, string> = { accept: init.stream ? '*/*' : 'application/json' };
    if (options.token) headers.authorization = `Bearer ${options.token}`;
    if (init.body !== undefined) headers['content-type'] = 'application/json';
    const query = init.query instanceof URLSearchParams ? init.query
      : new URLSearchParams(Object.entries(init.query ?? {}).filter((e): e is [string, string] => e[1] !== undefined).map(([k, v]): [string, string] => [k, String(v)]));
    const search = query.size > 0 ? `?${query}` : '';
    let response: Response;
    try {
      response = await doFetch(`${base}${path}${search}`, {
        method, headers,
        body: init.body === undefined ? undefined : JSON.stringify(init.body),
        signal: init.signal ?? (init.stream ? undefined : AbortSignal.timeout(timeoutSeconds * 1000)),
      });
    } catch (error) {
      throw new ApiError(0, 'network', `cannot reach the server at ${options.url} (${networkReason(error, timeoutSeconds)})`);
    }
    if (!response.ok) throw await errorFrom(response);
    return response;
  }

  async function call<S extends z.ZodType>(schema: S, method: string, path: string, init?: Send): Promise<z.infer<S>> {
    const response = await send(method, path, init);
    const parsed = schema.safeParse(await response.json().catch(() => undefined));
    if (parsed.success) return parsed.data;
    const issue = parsed.error.issues[0];
    throw new ApiError(response.status, 'unexpected_response', `${method} ${path}: the server's answer does not match this client (${issue?.path.join('.') || 'body'}: ${issue?.message}); is it another Rollway version?`);
  }
  const none = async (method: string, path: string): Promise<void> => {
    await send(method, path);
  };

  /** The scan's state at once, then after every stored batch, until it reaches a final state. */
  async function* events(id: number, signal?: AbortSignal): AsyncGenerator<ScanView> {
    const response = await send('GET', `/scans/${id}/events`, { stream: true, signal });
    if (!response.body) return;
    try {
      for await (const data of eventData(response.body, 'progress')) {
        const view = scanViewSchema.parse(JSON.parse(data));
        yield view;
        if (TERMINAL_STATES.has(view.state)) return;
      }
    } catch (error) {
      if (error instanceof z.ZodError || error instanceof SyntaxError) throw new ApiError(200, 'unexpected_response', `the progress events of scan ${id} do not match this client`);
      if (signal?.aborted) throw error;
    }
    throw new ApiError(0, 'network', `the connection to ${options.url} was lost while following scan ${id}`);
  }

  return {
    url: options.url,
    login: (body: { email: string; password: string }) => call(loginResponseSchema, 'POST', '/auth/login', { body: { ...body, returnToken: true } }),
    logout: () => none('POST', '/auth/logout'),
    me: () => call(meSchema, 'GET', '/auth/me'),
    scans: {
      list: async () => (await call(z.object({ scans: z.array(scanViewSchema) }), 'GET', '/scans')).scans,
      get: (id: number) => call(scanDetailSchema, 'GET', `/scans/${id}`),
      submit: (body: SubmitScan) => call(scanDetailSchema, 'POST', '/scans', { body }),
      cancel: (id: number) => call(scanViewSchema, 'POST', `/scans/${id}/cancel`),
      clone: (id: number) => call(scanDetailSchema, 'POST', `/scans/${id}/clone`),
      remove: (id: number) => none('DELETE', `/scans/${id}`),
      events,
    },
    results: {
      page: (id: number, query: Query = {}) => call(resultsPageSchema, 'GET', `/scans/${id}/results`, { query }),
      summary: (id: number) => call(resultsSummarySchema, 'GET', `/scans/${id}/summary`),
      /** The streamed download; read `body` as it arrives. */
      download: async (id: number, query: DownloadOptions = {}, signal?: AbortSignal) =>
        (await send('GET', `/scans/${id}/download`, { query: downloadQuery(query), stream: true, signal })).body!,
    },
    tokens: {
      list: async () => (await call(z.object({ tokens: z.array(apiTokenSchema) }), 'GET', '/tokens')).tokens,
      create: (body: z.input<typeof createTokenSchema>) => call(createdTokenSchema, 'POST', '/tokens', { body }),
      revoke: (id: number) => none('DELETE', `/tokens/${id}`),
    },
    admin: {
      users: async () => (await call(z.object({ users: z.array(adminUserSchema) }), 'GET', '/admin/users')).users,
      setQuota: (userId: number, body: z.input<typeof setQuotaSchema>) => call(adminUserSchema, 'PUT', `/admin/users/${userId}/quota`, { body }),
      usage: (month?: string) => call(usageSchema, 'GET', '/admin/usage', { query: { month } }),
    },
  };
}
