import { flushPromises, mount } from '@vue/test-utils';
import { createPinia } from 'pinia';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent } from 'vue';
import { createMemoryHistory, createRouter } from 'vue-router';
import { vuetify } from '../../../web/src/plugins/vuetify.ts';
import NewScanView from '../../../web/src/views/NewScanView.vue';
import { VALIDATION_DELAY_MS } from '../../../web/src/composables/usePlanForm.ts';

afterEach(() => vi.unstubAllGlobals());

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });

/** The API as a server without accounts answers it, and a scan submit that the server refuses. */
function stubApi(submit: () => Response) {
  const calls: { method: string; url: string; body: unknown }[] = [];
  vi.stubGlobal('fetch', vi.fn(async (url: string, init: RequestInit = {}) => {
    const method = init.method ?? 'GET';
    calls.push({ method, url, body: init.body ? JSON.parse(String(init.body)) : undefined });
    if (method === 'POST' && url === '/api/v1/scans') return submit();
    return json(404, { error: { code: 'not_found', message: 'no such route' } });
  }));
  return calls;
}

async function mountView() {
  const router = createRouter({ history: createMemoryHistory(), routes: [
    { path: '/scans/new', component: NewScanView },
    { path: '/scans/:id', name: 'scan', component: defineComponent({ template: '<div>scan page</div>' }) },
  ] });
  await router.push('/scans/new');
  // The trial point needs a Web Worker, which happy-dom lacks; the worker has its own tests.
  const wrapper = mount(NewScanView, { global: { plugins: [vuetify, router, createPinia()], stubs: { PreviewPanel: true } }, attachTo: document.body });
  await flushPromises();
  return { wrapper, router };
}

const settle = async () => {
  await new Promise((r) => setTimeout(r, VALIDATION_DELAY_MS + 50));
  await flushPromises();
};

describe('NewScanView', () => {
  it('builds the plan from the inputs, submits it as YAML and shows the server\'s problems next to their fields, keeping what was typed', async () => {
    const calls = stubApi(() => json(400, { error: { code: 'invalid_plan', message: 'The scan plan has 1 problem', field: 'axes[0].logRange.count', issues: [{ path: 'axes[0].logRange.count', message: 'too many points for your quota' }] } }));
    const { wrapper, router } = await mountView();
    expect(wrapper.find('[data-test="quota"]').text()).toMatch(/no accounts/);

    await wrapper.find('[data-test="title"] input').setValue('Quadratic V0 scan');
    // Quadratic is the family shown first; "Scan" turns its V0 into a log axis of suggested range.
    await wrapper.find('[data-test="scan-V0"]').trigger('click');
    await flushPromises();
    expect((wrapper.find('[data-test="axis-from-0"] input').element as HTMLInputElement).value).toBe('1e-16');
    await wrapper.find('[data-test="axis-count-0"] input').setValue('11');
    await settle();
    expect(wrapper.find('[data-test="point-count"]').text()).toBe('11');

    await wrapper.find('[data-test="submit"]').trigger('click');
    await flushPromises();
    const post = calls.find((c) => c.method === 'POST');
    expect(post?.body).toMatchObject({ format: 'yaml' });
    expect((post?.body as { planText: string }).planText).toContain('name: V0');
    expect(wrapper.find('[data-test="axis-count-0"]').text()).toContain('too many points for your quota');
    expect((wrapper.find('[data-test="axis-count-0"] input').element as HTMLInputElement).value).toBe('11');
    expect((wrapper.find('[data-test="title"] input').element as HTMLInputElement).value).toBe('Quadratic V0 scan');
    expect(router.currentRoute.value.path).toBe('/scans/new');
    wrapper.unmount();
  });

  it('does not submit while the form has problems, and says where they are', async () => {
    const calls = stubApi(() => json(201, {}));
    const { wrapper } = await mountView();
    await wrapper.find('[data-test="submit"]').trigger('click');
    await flushPromises();
    expect(calls.some((c) => c.method === 'POST')).toBe(false);
    expect(wrapper.find('[data-test="problem-count"]').text()).toMatch(/problems? to fix/);
    expect(wrapper.find('[data-test="title"]').text()).toContain('must not be blank');
    expect(wrapper.find('[data-test="axes-error"]').text()).toMatch(/must list 1 to 6 axes/);
    wrapper.unmount();
  });
});
