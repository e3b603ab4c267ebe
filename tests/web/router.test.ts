import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { returnPath, router } from '../../web/src/router/index.ts';

const meAs = (role: string) => ({ user: { id: 1, email: 'u@example.org', name: 'U', role }, groups: [], quota: null, auth: { kind: 'session', scopes: null, expiresAt: '2031-01-01T00:00:00.000Z' } });
const answer = (status: number, body: unknown) => vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify(body), { status })));

beforeEach(async () => {
  setActivePinia(createPinia());
});
afterEach(() => vi.unstubAllGlobals());

// The views themselves are not under test: resolve every lazy route to an empty component.
for (const record of router.getRoutes()) if (record.components) record.components.default = { render: () => null };

describe('router guard', () => {
  it('sends a signed-out visitor to sign in, remembering where they were going', async () => {
    answer(401, { error: { code: 'unauthenticated', message: 'sign in' } });
    await router.push('/scans/12?tab=plan');
    expect(router.currentRoute.value.name).toBe('sign-in');
    expect(router.currentRoute.value.query.next).toBe('/scans/12?tab=plan');
  });

  it('keeps collaborators out of New scan and non-admins out of Admin', async () => {
    answer(200, meAs('collaborator'));
    await router.push('/scans/new');
    expect(router.currentRoute.value.name).toBe('scans');
    await router.push('/admin');
    expect(router.currentRoute.value.name).toBe('scans');
    await router.push('/tokens');
    expect(router.currentRoute.value.name).toBe('tokens');
  });

  it('lets researchers plan scans and admins administer', async () => {
    answer(200, meAs('researcher'));
    await router.push('/scans/new');
    expect(router.currentRoute.value.name).toBe('new-scan');
    setActivePinia(createPinia());
    answer(200, meAs('admin'));
    await router.push('/admin');
    expect(router.currentRoute.value.name).toBe('admin');
  });

  it('sends a signed-in user away from the sign-in page to where they were going', async () => {
    answer(200, meAs('researcher'));
    await router.push('/sign-in?next=/compare?ids=1,2');
    expect(router.currentRoute.value.fullPath).toBe('/compare?ids=1,2');
  });

  it('returns only to paths of this app', () => {
    expect(returnPath('/scans/3')).toBe('/scans/3');
    for (const bad of ['//evil.example', 'https://evil.example', 'scans', undefined, ['/a']]) expect(returnPath(bad)).toBe('/scans');
  });
});
