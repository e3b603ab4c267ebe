import { flushPromises, mount } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { Plane } from '../../../shared/api/plots.ts';
import type { ScanDetail } from '../../../shared/api/scans.ts';
import { DEFAULT_BOUND_SET } from '../../../shared/physics/bounds/boundSet.ts';
import HeatmapPanel from '../../../web/src/components/plots/HeatmapPanel.vue';
import PlanePanel from '../../../web/src/components/plots/PlanePanel.vue';
import { vuetify } from '../../../web/src/plugins/vuetify.ts';

/** The chart itself needs a canvas, which happy-dom lacks: a stand-in keeps the option it was given. */
const charts: { option: Record<string, unknown>; click: (p: unknown) => void }[] = [];
const ChartStub = defineComponent({
  props: { option: { type: Object, required: true } },
  emits: ['click'],
  setup(props, { emit }) {
    charts.push({ get option() { return props.option as Record<string, unknown>; }, click: (p) => emit('click', p) });
    return () => h('div', { class: 'chart-stub' });
  },
});

const scan = (axes: { name: string; values: number[] }[]): ScanDetail => ({
  id: 7, title: 'Panel test', notes: '', state: 'completed', pointCount: 6, pointsDone: 6, pointsFailed: 0, pointsPerSecond: null, etaSeconds: null,
  planHash: 'h', physicsVersion: '1', basedOnScanId: null, owner: null, group: null, computeSeconds: 1, error: null,
  createdAt: '2026-01-01T00:00:00Z', startedAt: null, finishedAt: null, planText: '',
  plan: { title: 'Panel test', potential: { family: 'e-model' }, fixed: { V0: 1 }, axes, combine: 'grid', precision: { preset: 'fast' } },
});
const plane: Plane = {
  scanId: 7, colorBy: 'param.alpha', total: 30_000, downsampled: true, stride: 2, ns: [0.96, 0.965], r: [0.003, 0.01], color: [1, 2],
  pointIndex: [0, 4], region: ['inside68', 'inside95'], boundSet: DEFAULT_BOUND_SET,
};

let calls: string[];
beforeEach(() => {
  charts.length = 0;
  calls = [];
  vi.stubGlobal('fetch', vi.fn(async (url: string) => {
    calls.push(url);
    return new Response(JSON.stringify(plane), { status: 200, headers: { 'content-type': 'application/json' } });
  }));
});
afterEach(() => vi.unstubAllGlobals());

async function mountPanel(component: typeof PlanePanel | typeof HeatmapPanel, detail: ScanDetail) {
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/:p(.*)*', component: { render: () => null } }] });
  await router.push('/scans/7');
  const wrapper = mount(component, { props: { scan: detail }, global: { plugins: [vuetify, router], stubs: { Echarts: ChartStub } } });
  await flushPromises();
  return { wrapper, router };
}

describe('PlanePanel', () => {
  it('asks for the plane coloured by the first axis, draws it and says it was thinned', async () => {
    const { wrapper } = await mountPanel(PlanePanel, scan([{ name: 'alpha', values: [1, 2, 3] }, { name: 'pivotEfolds', values: [50, 60] }]));
    expect(calls).toEqual(['/api/v1/scans/7/plane?color=param.alpha']);
    expect(charts).toHaveLength(1);
    const series = charts[0]!.option.series as { type: string }[];
    expect(series.map((s) => s.type)).toEqual(['custom', 'custom', 'scatter']);
    expect(wrapper.find('[data-test="plot-note"]').text()).toBe('showing 2 of 30,000 points (every 2nd in point order)');
    expect(wrapper.find('[data-test="export-png"]').attributes('disabled')).toBeUndefined();
  });

  it('opens a point when one is clicked', async () => {
    const { router } = await mountPanel(PlanePanel, scan([{ name: 'alpha', values: [1, 2, 3] }]));
    charts[0]!.click({ seriesType: 'scatter', value: [0.965, 0.01, 0.3, 4, 2] });
    // Navigation resolves over a few ticks (lazy route records), so wait for it, bounded.
    await vi.waitFor(() => expect(router.currentRoute.value.path).toBe('/scans/7/points/4'), { timeout: 2000 });
  });
});

describe('HeatmapPanel', () => {
  it('says what it needs when the plan has one axis, and asks the server nothing', async () => {
    const { wrapper } = await mountPanel(HeatmapPanel, scan([{ name: 'alpha', values: [1, 2, 3] }]));
    expect(calls).toEqual([]);
    expect(wrapper.find('[data-test="plot-empty"]').text()).toMatch(/at least two axes/);
  });
});
