import { describe, expect, it } from 'vitest';
import type { Plane } from '../../../shared/api/plots.ts';
import { DEFAULT_BOUND_SET } from '../../../shared/physics/bounds/boundSet.ts';
import { colorScale, LOG_SPAN } from '../../../web/src/components/plots/colorScale.ts';
import { plotInk, scanColour } from '../../../web/src/components/plots/palette.ts';
import { buildPlaneOption, planeBox, type PlaneDatum } from '../../../web/src/components/plots/planeOption.ts';
import { svgOf } from '../../../web/src/composables/useChartExport.ts';

const ink = plotInk(false);
function plane(patch: Partial<Plane> = {}): Plane {
  return {
    scanId: 1, colorBy: 'param.alpha', total: 4, downsampled: false, stride: 1,
    ns: [0.955, 0.962, 0.967, 0.97], r: [0.02, 0.004, 0.0009, 0], color: [0.1, 1, 10, 100], pointIndex: [0, 3, 6, 9],
    region: ['inside95', 'inside68', 'inside68', 'outside'], boundSet: DEFAULT_BOUND_SET, ...patch,
  };
}
const series = (option: ReturnType<typeof buildPlaneOption>['option']) => option.series as Record<string, unknown>[];

describe('n_s–r plane option', () => {
  it('puts r on a log axis whose floor is below every drawn point, and counts the points it cannot draw', () => {
    const { option, notes, box } = buildPlaneOption({ layers: [{ scanId: 1, name: 'A', plane: plane() }], logR: true, ink, title: 'A' });
    expect((option.yAxis as { type: string }).type).toBe('log');
    expect(box.rMin).toBeGreaterThan(0);
    expect(box.rMin).toBeLessThan(0.0009);
    const scatter = series(option).find((s) => s.type === 'scatter')!;
    expect((scatter.data as PlaneDatum[]).map((d) => d[3])).toEqual([0, 3, 6]);
    expect(notes).toContain('1 point with r ≤ 0 is not on the log axis');
    const linear = buildPlaneOption({ layers: [{ scanId: 1, name: 'A', plane: plane() }], logR: false, ink, title: 'A' });
    expect((linear.option.yAxis as { type: string }).type).toBe('value');
    expect(linear.box.rMin).toBe(0);
    expect((series(linear.option).find((s) => s.type === 'scatter')!.data as unknown[]).length).toBe(4);
  });

  it('draws both regions under the points and keeps the scatter in large mode', () => {
    const { option, regions } = buildPlaneOption({ layers: [{ scanId: 1, name: 'A', plane: plane() }], logR: true, ink, title: 'A' });
    const all = series(option);
    expect(all.slice(0, 2).map((s) => s.type)).toEqual(['custom', 'custom']);
    expect(regions.map((r) => r.level)).toEqual(['inside95', 'inside68']);
    expect(all[0]!.name).toMatch(/^95% region/);
    const scatter = all[2]!;
    expect(scatter).toMatchObject({ type: 'scatter', large: true, id: '1' });
    expect(Number(scatter.largeThreshold)).toBeLessThanOrEqual(5000);
  });

  it('maps the colour column to a colour bar, in log10 when it spans decades', () => {
    const { option, scale } = buildPlaneOption({ layers: [{ scanId: 1, name: 'A', plane: plane() }], logR: true, ink, title: 'A' });
    expect(scale).toMatchObject({ log: true, min: -1, max: 2, label: 'log₁₀ alpha' });
    expect(option.visualMap).toMatchObject({ dimension: 2, min: -1, max: 2, seriesIndex: [2] });
    const scatter = series(option)[2]!;
    expect((scatter.data as PlaneDatum[]).map((d) => d[2])).toEqual([-1, 0, 1]);
    expect((scatter.data as PlaneDatum[]).map((d) => d[4])).toEqual([0.1, 1, 10]);
    const narrow = colorScale([50, 55, null, 60], 'pivotEfolds');
    expect(narrow).toMatchObject({ log: false, min: 50, max: 60, mapped: [50, 55, null, 60] });
    expect(colorScale([1, LOG_SPAN * 0.99], 'x').log).toBe(false);
    expect(colorScale([-1, 1e6], 'x').log).toBe(false);
    expect(colorScale([null], 'x')).toMatchObject({ min: null, max: null });
  });

  it('says when the server thinned the points', () => {
    const thinned = plane({ total: 150_000, downsampled: true, stride: 8 });
    const { notes, option } = buildPlaneOption({ layers: [{ scanId: 1, name: 'A', plane: thinned }], logR: true, ink, title: 'A' });
    expect(notes[0]).toBe('showing 4 of 150,000 points (every 8th in point order)');
    expect((option.title as { subtext: string }).subtext).toContain('150,000');
    const full = buildPlaneOption({ layers: [{ scanId: 1, name: 'A', plane: plane({ r: [0.1, 0.01, 0.001, 0.002] }) }], logR: true, ink, title: 'A' });
    expect(full.notes).toEqual([]);
  });

  it('overlays scans in one colour each, with a legend and no colour bar', () => {
    const layers = [
      { scanId: 4, name: '#4 first', plane: plane({ colorBy: null, color: [null, null, null, null] }) },
      { scanId: 9, name: '#9 second', plane: plane({ colorBy: null, color: [null, null, null, null], ns: [0.95, 0.951, 0.952, 0.953] }) },
    ];
    const { option } = buildPlaneOption({ layers, logR: true, ink, title: 'overlay' });
    const scatter = series(option).filter((s) => s.type === 'scatter');
    expect(scatter.map((s) => s.id)).toEqual(['4', '9']);
    expect(scatter.map((s) => (s.itemStyle as { color: string }).color)).toEqual([scanColour(0), scanColour(1)]);
    expect(scanColour(0)).not.toBe(scanColour(1));
    expect(option.visualMap).toBeUndefined();
    expect(option.legend).toBeDefined();
  });

  it('spans the whole 95% region even when the points sit elsewhere', () => {
    const far = plane({ ns: [0.99, 0.995], r: [0.2, 0.3], color: [1, 2], pointIndex: [0, 1], region: ['outside', 'outside'] });
    const box = planeBox([{ scanId: 1, name: 'A', plane: far }], DEFAULT_BOUND_SET, true);
    expect(box.nsMin).toBeLessThan(0.9649 - 0.0042 * Math.sqrt(5.99));
    expect(box.nsMax).toBeGreaterThan(0.995);
    expect(box.rMax).toBeGreaterThan(0.3);
  });

  it('exports the same option as SVG with the regions and points in it', () => {
    const { option } = buildPlaneOption({ layers: [{ scanId: 1, name: 'A', plane: plane() }], logR: true, ink, title: 'Export check' });
    const svg = svgOf(option, 640, 420);
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg).toContain('width="640"');
    expect(svg).toContain('Export check');
    expect(svg).toContain('n_s');
    // Region fills are drawn with their own colour.
    expect(svg).toContain(ink.region68.stroke);
  });
});
