import type { Heatmap } from '../../../../shared/api/results.ts';
import { formatNumber } from '../../utils/format.ts';
import { barLabel, colorScale, type ColorScale } from './colorScale.ts';
import type { PlotOption } from './echartsSetup.ts';
import { edgeSegment, regionEdges, type CellEdge } from './heatmapRegions.ts';
import { MISSING_COLOUR, SEQUENTIAL, type PlotInk } from './palette.ts';

/** A heatmap of one aggregate over two parameters, with the 68% and 95% regions outlined. */

export interface HeatmapOptionInput {
  heatmap: Heatmap;
  x: string;
  y: string;
  /** What the colour shows, e.g. "mean ns" or "count". */
  valueLabel: string;
  /** The column for number formatting (ns, r, …). */
  valueColumn: string;
  ink: PlotInk;
  title: string;
}

/** Heatmap rows: [ix, iy, colour-bar position, value]. */
export type HeatmapDatum = [number, number, number | null, number | null];

export interface HeatmapOptionResult {
  option: PlotOption;
  scale: ColorScale;
  edges: { inside68: CellEdge[]; inside95: CellEdge[] };
  notes: string[];
}

function outlineSeries(name: string, edges: CellEdge[], stroke: string, width: number, dash: number[] | undefined) {
  return {
    type: 'custom' as const,
    name,
    silent: true,
    z: 3,
    color: stroke,
    data: edges,
    renderItem: (_params: unknown, api: { value: (d: number) => number; coord: (p: number[]) => number[]; size: (p: number[]) => number[] }) => {
      const side = edges[(_params as { dataIndex: number }).dataIndex]![2];
      const center = api.coord([api.value(0), api.value(1)]) as [number, number];
      const size = api.size([1, 1]) as [number, number];
      return { type: 'line', shape: edgeSegment(center, size, side), style: { stroke, lineWidth: width, lineDash: dash } };
    },
    encode: { x: 0, y: 1 },
  };
}

export function buildHeatmapOption({ heatmap, x, y, valueLabel, valueColumn, ink, title }: HeatmapOptionInput): HeatmapOptionResult {
  const flat: (number | null)[] = [];
  const cells: [number, number][] = [];
  heatmap.values.forEach((row, iy) => row.forEach((v, ix) => {
    if (v === null) return;
    flat.push(v);
    cells.push([ix, iy]);
  }));
  const scale = colorScale(flat, valueLabel);
  const data: HeatmapDatum[] = cells.map(([ix, iy], i) => [ix, iy, scale.mapped[i] ?? null, flat[i] ?? null]);
  const edges = { inside68: regionEdges(heatmap.region, 'inside68'), inside95: regionEdges(heatmap.region, 'inside95') };
  const notes: string[] = [];
  if (cells.length === 0) notes.push('no cell has an ok point with this value');
  if (edges.inside95.length === 0 && cells.length > 0) notes.push('no cell reaches the 95% region');
  const axisStyle = { axisLabel: { color: ink.muted }, axisLine: { lineStyle: { color: ink.axis } }, nameTextStyle: { color: ink.text } };
  const option: PlotOption = {
    animation: false,
    backgroundColor: ink.background,
    textStyle: { fontFamily: 'IBM Plex Sans, system-ui, sans-serif', color: ink.text },
    title: { text: title, subtext: notes.join(' · '), left: 8, top: 4, textStyle: { fontSize: 14, color: ink.text }, subtextStyle: { color: ink.muted } },
    grid: { left: 80, right: 120, top: 64, bottom: 64 },
    legend: { top: 30, right: 120, textStyle: { color: ink.text }, data: ['68% region', '95% region'] },
    tooltip: {
      trigger: 'item',
      formatter: (p: unknown) => {
        const { value, seriesType } = p as { value: HeatmapDatum; seriesType: string };
        if (seriesType !== 'heatmap') return '';
        return [`${x} = ${formatNumber(heatmap.x[value[0]])}`, `${y} = ${formatNumber(heatmap.y[value[1]])}`, `${valueLabel} = ${formatNumber(value[3], valueColumn)}`,
          `region: ${heatmap.region[value[1]]?.[value[0]] ?? 'not scored'}`].join('<br>');
      },
    },
    xAxis: { type: 'category', name: x, nameLocation: 'middle', nameGap: 36, data: heatmap.x.map((v) => formatNumber(v, '', 4)), splitArea: { show: false }, ...axisStyle },
    yAxis: { type: 'category', name: y, nameLocation: 'middle', nameGap: 60, data: heatmap.y.map((v) => formatNumber(v, '', 4)), ...axisStyle },
    series: [
      { type: 'heatmap', name: valueLabel, data, encode: { x: 0, y: 1, value: 2 }, progressive: 20_000, emphasis: { itemStyle: { borderColor: ink.text, borderWidth: 1 } } },
      outlineSeries('95% region', edges.inside95, ink.region95.stroke, 2, [5, 3]),
      outlineSeries('68% region', edges.inside68, ink.region68.stroke, 2.5, undefined),
    ] as PlotOption['series'],
  };
  if (scale.min !== null && scale.max !== null) {
    option.visualMap = {
      type: 'continuous', dimension: 2, seriesIndex: 0, min: scale.min, max: scale.max === scale.min ? scale.min + 1 : scale.max,
      inRange: { color: [...SEQUENTIAL] }, outOfRange: { color: MISSING_COLOUR }, calculable: true, right: 8, top: 'middle',
      text: [scale.label, ''], textStyle: { color: ink.text }, formatter: (v: unknown) => barLabel(scale, Number(v), valueColumn),
    };
  }
  return { option, scale, edges, notes };
}
