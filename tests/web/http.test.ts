import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, request } from '../../web/src/api/http.ts';

afterEach(() => vi.unstubAllGlobals());

const respond = (status: number, body: unknown) => vi.stubGlobal('fetch', vi.fn(async () => new Response(body === undefined ? null : JSON.stringify(body), { status })));

describe('web API request', () => {
  it('parses a response with the shared schema', async () => {
    respond(200, { id: 3 });
    await expect(request('GET', '/x', { schema: z.object({ id: z.number() }) })).resolves.toEqual({ id: 3 });
  });

  it('turns an error body into an ApiError with its field and plan issues', async () => {
    respond(400, { error: { code: 'invalid_plan', message: 'bad plan', field: 'axes', issues: [{ path: 'axes[0].count', message: 'must be a whole number' }] } });
    const error = await request('POST', '/scans', { body: {} }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 400, code: 'invalid_plan', field: 'axes', issues: [{ path: 'axes[0].count' }] });
  });

  it('reports an unreachable server as a network error', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => { throw new TypeError('fetch failed'); }));
    await expect(request('GET', '/x')).rejects.toMatchObject({ status: 0, code: 'network' });
  });
});
