import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent } from 'vue';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { ScanView } from '../../shared/api/scans.ts';
import { vuetify } from '../../web/src/plugins/vuetify.ts';
import ScansView from '../../web/src/views/ScansView.vue';
import SignInView from '../../web/src/views/SignInView.vue';

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

const json = (status: number, body?: unknown) => new Response(body === undefined ? null : JSON.stringify(body), { status });
const user = { id: 7, email: 'iris@example.org', name: 'Iris', role: 'researcher' as const };
const me = { user, groups: [], quota: null, auth: { kind: 'session', scopes: null, expiresAt: '2031-01-01T00:00:00.000Z' } };

/** A fake API answering by "METHOD /path"; every request is recorded with its JSON body. */
function stubApi(routes: Record<string, (body: unknown) => Response>) {
  const calls: { key: string; body: unknown }[] = [];
  vi.stubGlobal('fetch', vi.fn(async (url: string, init: RequestInit = {}) => {
    const key = `${init.method ?? 'GET'} ${url.replace('/api/v1', '')}`;
    const body = init.body ? JSON.parse(String(init.body)) : undefined;
    calls.push({ key, body });
    return routes[key]?.(body) ?? json(404, { error: { code: 'not_found', message: `no route ${key}` } });
  }));
  return calls;
}

async function mountAt(path: string, component: object) {
  const pinia = createPinia();
  setActivePinia(pinia);
  const blank = defineComponent({ template: '<div />' });
  const router = createRouter({ history: createMemoryHistory(), routes: [
    { path: '/sign-in', name: 'sign-in', component },
    { path: '/forgot-password', name: 'forgot-password', component: blank },
    { path: '/scans', name: 'scans', component },
    { path: '/scans/new', name: 'new-scan', component: blank },
    { path: '/scans/:id', name: 'scan', component: blank },
  ] });
  await router.push(path);
  const wrapper = mount(component, { global: { plugins: [vuetify, router, pinia] }, attachTo: document.body });
  await flushPromises();
  return { wrapper, router };
}
const input = (wrapper: ReturnType<typeof mount>, label: string) => {
  const id = wrapper.findAll('label').map((l) => (l.text() === label ? l.attributes('for') : undefined)).find(Boolean);
  if (!id) throw new Error(`no input labelled ${label}`);
  return wrapper.find(`#${id}`);
};

describe('sign-in page', () => {
  it('says the same thing for any refused login and keeps what was typed', async () => {
    stubApi({ 'POST /auth/login': () => json(401, { error: { code: 'bad_credentials', message: 'unknown e-mail' } }) });
    const { wrapper } = await mountAt('/sign-in', SignInView);
    await input(wrapper, 'E-mail').setValue('nobody@example.org');
    await input(wrapper, 'Password').setValue('wrong');
    await wrapper.find('form').trigger('submit');
    await flushPromises();
    expect(wrapper.find('.v-alert').text()).toBe('That e-mail and password do not match an active account.');
    expect(wrapper.text()).not.toContain('unknown e-mail');
    expect((input(wrapper, 'E-mail').element as HTMLInputElement).value).toBe('nobody@example.org');
  });

  it('signs in and returns to the page asked for, but never to another site', async () => {
    const calls = stubApi({
      'POST /auth/login': () => json(200, { user, expiresAt: '2031-01-01T00:00:00.000Z' }),
      'GET /auth/me': () => json(200, me),
    });
    const { wrapper, router } = await mountAt('/sign-in?next=%2F%2Fevil.example%2Fx', SignInView);
    await input(wrapper, 'E-mail').setValue(' iris@example.org ');
    await input(wrapper, 'Password').setValue('correct horse battery');
    await wrapper.find('form').trigger('submit');
    await flushPromises();
    expect(calls[0]).toEqual({ key: 'POST /auth/login', body: { email: 'iris@example.org', password: 'correct horse battery' } });
    expect(router.currentRoute.value.fullPath).toBe('/scans');
  });
});

let nextId = 1;
const scan = (title: string, state: ScanView['state'], ownerId: number): ScanView => ({
  id: nextId++, title, notes: '', state, pointCount: 100, pointsDone: state === 'completed' ? 100 : 40, pointsFailed: 0, pointsPerSecond: null, etaSeconds: null,
  planHash: 'h', physicsVersion: '1', basedOnScanId: null, owner: { id: ownerId, name: `Owner ${ownerId}`, email: `o${ownerId}@example.org` },
  group: { id: 1, name: 'Saltmarsh' }, computeSeconds: 0, error: null, createdAt: `2031-04-0${nextId}T00:00:00.000Z`, startedAt: null, finishedAt: null,
});

describe('scans page', () => {
  it('lists scans with state, points and owner, and narrows them by the search', async () => {
    const scans = [scan('Plateau survey', 'completed', 7), scan('Hilltop grid', 'cancelled', 9)];
    stubApi({ 'GET /scans': () => json(200, { scans }) });
    const { wrapper } = await mountAt('/scans', ScansView);
    const rows = () => wrapper.findAll('tbody tr').map((r) => r.text());
    expect(rows()).toHaveLength(2);
    expect(rows().find((r) => r.includes('Plateau survey'))).toMatch(/Done.*100 \/ 100.*Owner 7.*Saltmarsh/);
    expect(rows().find((r) => r.includes('Hilltop grid'))).toMatch(/Stopped.*40 \/ 100/);
    await input(wrapper, 'Search titles').setValue('hill');
    await flushPromises();
    expect(rows()).toHaveLength(1);
    expect(rows()[0]).toContain('Hilltop grid');
    await input(wrapper, 'Search titles').setValue('nothing like it');
    await flushPromises();
    expect(wrapper.text()).toContain('No scan matches the search and filters.');
  });

  it('says when there are no scans yet, and when they cannot be loaded', async () => {
    stubApi({ 'GET /scans': () => json(200, { scans: [] }) });
    const empty = await mountAt('/scans', ScansView);
    expect(empty.wrapper.text()).toContain('No scans yet');
    empty.wrapper.unmount();
    stubApi({ 'GET /scans': () => json(500, { error: { code: 'internal', message: 'internal server error' } }) });
    const broken = await mountAt('/scans', ScansView);
    expect(broken.wrapper.find('.v-alert').text()).toContain('The scans could not be loaded: internal server error');
  });
});
