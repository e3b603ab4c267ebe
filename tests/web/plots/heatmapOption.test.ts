import { describe, expect, it } from 'vitest';
import type { Heatmap } from '../../../shared/api/results.ts';
import { createPointSource } from '../../../shared/plan/expandPlan.ts';
import { validatePlan } from '../../../shared/plan/validatePlan.ts';
import { cellPointIndex } from '../../../web/src/components/plots/cellPoint.ts';
import { parseCompareIds } from '../../../web/src/components/plots/compareIds.ts';
import { buildHeatmapOption, type HeatmapDatum } from '../../../web/src/components/plots/heatmapOption.ts';
import { edgeSegment, regionEdges } from '../../../web/src/components/plots/heatmapRegions.ts';
import { plotInk } from '../../../web/src/components/plots/palette.ts';

const ink = plotInk(true);
// y rows bottom to top; a 68% cell inside a ring of 95% cells, one empty cell.
const heatmap: Heatmap = {
  x: [1, 2, 3],
  y: [50, 55, 60],
  values: [[0.96, 0.962, null], [0.963, 0.965, 0.966], [0.967, 0.968, 0.97]],
  region: [['inside95', 'inside95', null], ['inside95', 'inside68', 'inside95'], ['outside', 'inside95', 'outside']],
};

describe('heatmap regions', () => {
  it('outlines a region along the edges between cells inside it and the rest', () => {
    const e68 = regionEdges(heatmap.region, 'inside68');
    expect(e68.sort()).toEqual([[1, 1, 'bottom'], [1, 1, 'left'], [1, 1, 'right'], [1, 1, 'top']].sort());
    const e95 = regionEdges(heatmap.region, 'inside95');
    // Inside 95% (68% counts too): (0,0) (1,0) (0,1) (1,1) (2,1) (1,2): 6 cells with 6 shared
    // sides, so the outline has 6 × 4 - 2 × 6 = 12 unit edges.
    expect(e95).toHaveLength(12);
    expect(e95).toContainEqual([0, 0, 'left']);
    expect(e95).toContainEqual([1, 0, 'right']);
    expect(e95).not.toContainEqual([0, 0, 'right']);
    expect(e95).toContainEqual([1, 2, 'top']);
  });

  it('places an edge on the cell side, with screen y growing downwards', () => {
    expect(edgeSegment([100, 50], [20, 10], 'left')).toEqual({ x1: 90, y1: 45, x2: 90, y2: 55 });
    expect(edgeSegment([100, 50], [20, 10], 'top')).toEqual({ x1: 90, y1: 45, x2: 110, y2: 45 });
    expect(edgeSegment([100, 50], [20, 10], 'bottom')).toEqual({ x1: 90, y1: 55, x2: 110, y2: 55 });
  });

  it('builds a heatmap of the non-empty cells on our colour scale, with both outlines', () => {
    const { option, edges, scale } = buildHeatmapOption({ heatmap, x: 'alpha', y: 'pivotEfolds', valueLabel: 'mean ns', valueColumn: 'ns', ink, title: 'T' });
    const [cells, outline95, outline68] = option.series as Record<string, unknown>[];
    expect((cells!.data as HeatmapDatum[]).length).toBe(8);
    expect(cells!.data).toContainEqual([2, 1, 0.966, 0.966]);
    expect(outline95).toMatchObject({ type: 'custom', name: '95% region' });
    expect((outline68!.data as unknown[]).length).toBe(edges.inside68.length);
    expect(scale).toMatchObject({ log: false, min: 0.96, max: 0.97 });
    expect(option.visualMap).toMatchObject({ min: 0.96, max: 0.97, dimension: 2 });
    expect((option.xAxis as { data: string[] }).data).toEqual(['1', '2', '3']);
  });
});

describe('a heatmap cell as a point', () => {
  const plan = validatePlan({
    title: 'cells', potential: { family: 'e-model' }, fixed: { V0: 1 },
    axes: [{ name: 'alpha', logRange: { from: 0.1, to: 10, count: 5 } }, { name: 'pivotEfolds', range: { from: 50, to: 60, count: 3 } }],
  });
  const source = createPointSource(plan);

  it('opens the one point of a two-axis grid cell, the same index the plan expands', () => {
    for (let i = 0; i < source.count; i++) {
      const v = source.valuesAt(i);
      expect(cellPointIndex(plan as unknown as Record<string, unknown>, 'alpha', 'pivotEfolds', v.alpha!, v.pivotEfolds!)).toBe(i);
      expect(cellPointIndex(plan as unknown as Record<string, unknown>, 'pivotEfolds', 'alpha', v.pivotEfolds!, v.alpha!)).toBe(i);
    }
  });

  it('finds the axis value when the browser expands a log range a bit differently from the server', () => {
    // Chromium gives exp(log(0.1) + 0.5 (log 100 - log 0.1)) = 3.1622776601683795, Node 3.16227766016838.
    const v = source.valuesAt(2 * 3 + 1);
    expect(cellPointIndex(plan as unknown as Record<string, unknown>, 'alpha', 'pivotEfolds', v.alpha! * (1 + 2 ** -52), v.pivotEfolds!)).toBe(7);
  });

  it('opens nothing when a cell holds several points or the value is not on the axis', () => {
    const three = validatePlan({ ...plan, fixed: {}, axes: [...plan.axes, { name: 'V0', values: [1, 2] }] });
    expect(cellPointIndex(three as unknown as Record<string, unknown>, 'alpha', 'pivotEfolds', 0.1, 50)).toBeNull();
    expect(cellPointIndex(plan as unknown as Record<string, unknown>, 'alpha', 'pivotEfolds', 0.2, 50)).toBeNull();
    expect(cellPointIndex(plan as unknown as Record<string, unknown>, 'alpha', 'pivotEfolds', 0.1 * (1 + 1e-7), 50)).toBeNull();
    expect(cellPointIndex({ ...plan, combine: 'zip' } as unknown as Record<string, unknown>, 'alpha', 'pivotEfolds', 0.1, 50)).toBeNull();
  });
});

describe('compare ids', () => {
  it('reads distinct ids and names the first bad one', () => {
    expect(parseCompareIds('3,1, 3')).toEqual({ ids: [3, 1] });
    expect(parseCompareIds(undefined)).toEqual({ ids: [] });
    expect(parseCompareIds('2,x').error).toBe('ids: "x" is not a scan id (a positive whole number)');
    expect(parseCompareIds('0').error).toMatch(/"0" is not a scan id/);
  });
});
