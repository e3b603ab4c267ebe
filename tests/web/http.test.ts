import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, request, setUnauthorizedHandler } from '../../web/src/api/http.ts';

afterEach(() => {
  vi.unstubAllGlobals();
  setUnauthorizedHandler(undefined);
});

const respond = (status: number, body: unknown) => vi.stubGlobal('fetch', vi.fn(async () => new Response(body === undefined ? null : typeof body === 'string' ? body : JSON.stringify(body), { status })));

describe('web API request', () => {
  it('parses a response with the shared schema', async () => {
    respond(200, { id: 3 });
    await expect(request('GET', '/x', { schema: z.object({ id: z.number() }) })).resolves.toEqual({ id: 3 });
  });

  it('sends JSON bodies with their content type, under /api/v1, with the session cookie', async () => {
    const fetch = vi.fn(async () => new Response(null, { status: 204 }));
    vi.stubGlobal('fetch', fetch);
    await request('POST', '/tokens', { body: { name: 'n' } });
    expect(fetch).toHaveBeenCalledWith('/api/v1/tokens', expect.objectContaining({
      method: 'POST', body: '{"name":"n"}', credentials: 'same-origin', headers: expect.objectContaining({ 'content-type': 'application/json' }),
    }));
  });

  it('turns an error body into an ApiError with its field and plan issues', async () => {
    respond(400, { error: { code: 'invalid_plan', message: 'bad plan', field: 'axes', issues: [{ path: 'axes[0].count', message: 'must be a whole number' }] } });
    const error = await request('POST', '/scans', { body: {} }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 400, code: 'invalid_plan', field: 'axes', issues: [{ path: 'axes[0].count' }] });
  });

  it('reports an error page that is not JSON by its status, not as a parse failure', async () => {
    respond(502, '<html>Bad gateway</html>');
    await expect(request('GET', '/scans')).rejects.toMatchObject({ status: 502, code: 'http_502' });
  });

  it('reports an answer that does not fit the schema as a bad response naming the field', async () => {
    respond(200, { id: 'three' });
    const error = await request('GET', '/scans/3', { schema: z.object({ id: z.number() }) }).catch((e: unknown) => e);
    expect(error).toMatchObject({ code: 'bad_response' });
    expect((error as Error).message).toMatch(/GET \/scans\/3.*id/);
  });

  it('reports an unreachable server as a network error', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => { throw new TypeError('fetch failed'); }));
    await expect(request('GET', '/x')).rejects.toMatchObject({ status: 0, code: 'network' });
  });

  it('tells the session about a 401 mid-visit, but not for sign-in or the session check', async () => {
    const expired = vi.fn();
    setUnauthorizedHandler(expired);
    respond(401, { error: { code: 'unauthenticated', message: 'sign in' } });
    await expect(request('GET', '/scans')).rejects.toMatchObject({ status: 401 });
    expect(expired).toHaveBeenCalledWith('/scans');
    expired.mockClear();
    await expect(request('POST', '/auth/login', { body: {} })).rejects.toMatchObject({ status: 401 });
    await expect(request('GET', '/auth/me')).rejects.toMatchObject({ status: 401 });
    expect(expired).not.toHaveBeenCalled();
  });
});
