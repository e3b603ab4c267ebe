import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useSessionStore } from '../../web/src/stores/session.ts';

const me = (role: 'admin' | 'researcher' | 'collaborator') => ({
  user: { id: 4, email: 'iris@example.org', name: 'Iris', role },
  groups: [{ id: 1, name: 'Group', memberCount: 3 }],
  quota: role === 'collaborator' ? null : { monthlyPoints: 1000, usedPoints: 10, remainingPoints: 990, resetsAt: '2031-05-01T00:00:00.000Z', maxRunning: 2, running: 0 },
  auth: { kind: 'session', scopes: null, expiresAt: '2031-04-02T00:00:00.000Z' },
});
const json = (status: number, body?: unknown) => new Response(body === undefined ? null : JSON.stringify(body), { status });

/** A fake server answering by method and path; records every request. */
function serve(routes: Record<string, () => Response | Promise<Response>>) {
  const calls: string[] = [];
  vi.stubGlobal('fetch', vi.fn(async (url: string, init: RequestInit) => {
    const key = `${init.method} ${url.replace('/api/v1', '')}`;
    calls.push(key);
    const route = routes[key];
    if (!route) throw new Error(`unexpected request ${key}`);
    return route();
  }));
  return calls;
}

beforeEach(() => setActivePinia(createPinia()));
afterEach(() => vi.unstubAllGlobals());

describe('session store', () => {
  it('knows a signed-in researcher: may submit, is not admin', async () => {
    serve({ 'GET /auth/me': () => json(200, me('researcher')) });
    const session = useSessionStore();
    expect(session.status).toBe('unknown');
    await session.load();
    expect(session.status).toBe('signedIn');
    expect(session.user?.email).toBe('iris@example.org');
    expect([session.canSubmit, session.isAdmin]).toEqual([true, false]);
  });

  it('lets collaborators browse but not submit, and admins do both', async () => {
    serve({ 'GET /auth/me': () => json(200, me('collaborator')) });
    const session = useSessionStore();
    await session.load();
    expect([session.canSubmit, session.isAdmin]).toEqual([false, false]);
    serve({ 'GET /auth/me': () => json(200, me('admin')) });
    await session.load(true);
    expect([session.canSubmit, session.isAdmin]).toEqual([true, true]);
  });

  it('reads 401 as signed out, anything else as a failed check with its error', async () => {
    serve({ 'GET /auth/me': () => json(401, { error: { code: 'unauthenticated', message: 'sign in first' } }) });
    const session = useSessionStore();
    await session.load();
    expect(session.status).toBe('signedOut');
    expect(session.error).toBeNull();
    vi.stubGlobal('fetch', vi.fn(async () => { throw new TypeError('fetch failed'); }));
    await session.load(true);
    expect(session.status).toBe('error');
    expect(session.error).toMatchObject({ code: 'network' });
    expect(session.user).toBeNull();
  });

  it('checks once for concurrent callers, and again after a failed check', async () => {
    const calls = serve({ 'GET /auth/me': () => json(503, { error: { code: 'unavailable', message: 'starting' } }) });
    const session = useSessionStore();
    await Promise.all([session.load(), session.load(), session.load()]);
    expect(calls).toEqual(['GET /auth/me']);
    expect(session.status).toBe('error');
    await session.load(); // a failed check is not remembered as an answer
    expect(calls).toHaveLength(2);
  });

  it('signs in, then reads who it is', async () => {
    const calls = serve({
      'POST /auth/login': () => json(200, { user: me('researcher').user, expiresAt: '2031-04-02T00:00:00.000Z' }),
      'GET /auth/me': () => json(200, me('researcher')),
    });
    const session = useSessionStore();
    await session.signIn('iris@example.org', 'correct horse');
    expect(calls).toEqual(['POST /auth/login', 'GET /auth/me']);
    expect(session.status).toBe('signedIn');
  });

  it('reads the new session after signing in even while an older check is still on its way', async () => {
    // The first check leaves before the sign-in and answers after it, with the old "signed out".
    let signedIn = false;
    let answerFirst!: () => void;
    const first = new Promise<void>((resolve) => (answerFirst = resolve));
    let checks = 0;
    serve({
      'POST /auth/login': () => {
        signedIn = true;
        return json(200, { user: me('researcher').user, expiresAt: '2031-04-02T00:00:00.000Z' });
      },
      'GET /auth/me': async () => {
        const before = !signedIn;
        if (++checks === 1) await first;
        return before ? json(401, { error: { code: 'unauthenticated', message: 'sign in' } }) : json(200, me('researcher'));
      },
    });
    const session = useSessionStore();
    const early = session.load();
    const signing = session.signIn('iris@example.org', 'correct horse');
    await new Promise((r) => setTimeout(r, 10));
    answerFirst();
    await Promise.all([early, signing]);
    expect(session.status).toBe('signedIn');
    expect(checks).toBe(2);
  });

  it('keeps the user signed out after a refused sign-in', async () => {
    serve({ 'POST /auth/login': () => json(401, { error: { code: 'bad_credentials', message: 'no' } }) });
    const session = useSessionStore();
    await expect(session.signIn('a@b.org', 'x')).rejects.toMatchObject({ status: 401 });
    expect(session.user).toBeNull();
  });

  it('forgets the user on sign-out even when the server cannot be reached', async () => {
    serve({ 'GET /auth/me': () => json(200, me('admin')), 'POST /auth/logout': () => { throw new TypeError('offline'); } });
    const session = useSessionStore();
    await session.load();
    await expect(session.signOut()).rejects.toMatchObject({ code: 'network' });
    expect(session.status).toBe('signedOut');
    expect(session.isAdmin).toBe(false);
  });
});
