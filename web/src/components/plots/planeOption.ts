import type { Plane } from '../../../../shared/api/plots.ts';
import type { BoundSet } from '../../../../shared/physics/bounds/boundSet.ts';
import { formatCount, formatNumber } from '../../utils/format.ts';
import { barLabel, colorScale, type ColorScale } from './colorScale.ts';
import type { PlotOption } from './echartsSetup.ts';
import { MISSING_COLOUR, SEQUENTIAL, scanColour, type PlotInk } from './palette.ts';
import { regionBox, regionPolygons, type PlaneBox, type RegionPolygon } from './planeRegions.ts';

/** The n_s–r plane as an ECharts option: one scan coloured by a column, or several scans overlaid. */

export interface PlaneLayer {
  /** Scan id: the series id, so a click knows whose point it is. */
  scanId: number;
  name: string;
  plane: Plane;
}

export interface PlaneOptionInput {
  layers: PlaneLayer[];
  /** Log axis for r (points with r <= 0 cannot be drawn on it and are counted in the notes). */
  logR: boolean;
  ink: PlotInk;
  title: string;
}

export interface PlaneOptionResult {
  option: PlotOption;
  /** Plain sentences shown beside the plot and in its exported subtitle. */
  notes: string[];
  box: PlaneBox;
  regions: RegionPolygon[];
  /** Set only for a single coloured layer. */
  scale: ColorScale | null;
}

/** Scatter rows: [n_s, r, colour-bar position, point index, colour value]. */
export type PlaneDatum = [number, number, number | null, number, number | null];

const LARGE_THRESHOLD = 2000;
const pad = (lo: number, hi: number, share: number): [number, number] => {
  const span = hi - lo || Math.abs(hi) || 1;
  return [lo - span * share, hi + span * share];
};

/** The extent of the plot: all drawn points plus the whole 95% region, with a margin. */
export function planeBox(layers: readonly PlaneLayer[], set: BoundSet, logR: boolean): PlaneBox {
  let nsLo = Infinity;
  let nsHi = -Infinity;
  let rLo = Infinity;
  let rHi = -Infinity;
  for (const { plane } of layers) {
    plane.ns.forEach((ns, i) => {
      const r = plane.r[i]!;
      if (logR && !(r > 0)) return;
      nsLo = Math.min(nsLo, ns);
      nsHi = Math.max(nsHi, ns);
      rLo = Math.min(rLo, r);
      rHi = Math.max(rHi, r);
    });
  }
  const region = regionBox(set);
  if (region.ns) {
    nsLo = Math.min(nsLo, region.ns[0]);
    nsHi = Math.max(nsHi, region.ns[1]);
  }
  if (region.rMax !== null && region.rMax > 0) rHi = Math.max(rHi, region.rMax);
  if (!Number.isFinite(nsLo)) [nsLo, nsHi] = [0.94, 0.99];
  if (!Number.isFinite(rHi)) rHi = 0.1;
  const [nsMin, nsMax] = pad(nsLo, nsHi, 0.04);
  if (!logR) return { nsMin, nsMax, rMin: Math.min(0, rLo), rMax: pad(Math.min(0, rLo), rHi, 0.06)[1] };
  // Three decades below the 95% edge when no point is lower, so the region reads as a region.
  const floor = Number.isFinite(rLo) ? Math.min(rLo, rHi / 1e3) : rHi / 1e3;
  return { nsMin, nsMax, rMin: floor / 1.5, rMax: rHi * 1.5 };
}

function layerData(plane: Plane, mapped: readonly (number | null)[], logR: boolean): { data: PlaneDatum[]; hidden: number } {
  const data: PlaneDatum[] = [];
  let hidden = 0;
  for (let i = 0; i < plane.ns.length; i++) {
    const r = plane.r[i]!;
    if (logR && !(r > 0)) {
      hidden++;
      continue;
    }
    data.push([plane.ns[i]!, r, mapped[i] ?? null, plane.pointIndex[i]!, plane.color[i] ?? null]);
  }
  return { data, hidden };
}

const ordinal = (n: number) => `${n}${n % 10 === 1 && n % 100 !== 11 ? 'st' : n % 10 === 2 && n % 100 !== 12 ? 'nd' : n % 10 === 3 && n % 100 !== 13 ? 'rd' : 'th'}`;
const columnOf = (colorBy: string | null) => (colorBy ?? '').replace(/^param\./, '');

export function planeNotes(layers: readonly PlaneLayer[], hidden: readonly number[], set: BoundSet): string[] {
  const notes: string[] = [];
  const multi = layers.length > 1;
  layers.forEach(({ name, plane }, i) => {
    const who = multi ? `${name}: ` : '';
    if (plane.downsampled) {
      notes.push(`${who}showing ${formatCount(plane.ns.length)} of ${formatCount(plane.total)} points (every ${ordinal(plane.stride)} in point order)`);
    }
    const n = hidden[i]!;
    if (n > 0) notes.push(`${who}${formatCount(n)} ${n === 1 ? 'point with r ≤ 0 is' : 'points with r ≤ 0 are'} not on the log axis`);
    if (plane.total === 0) notes.push(`${who}no ok points with n_s and r yet`);
  });
  const others = set.constraints.filter((c) => c.observable !== 'ns' && c.observable !== 'r').map((c) => c.observable);
  if (others.length > 0) notes.push(`regions are the slice of ${set.label} with ${others.join(', ')} at their best values`);
  return notes;
}

const regionName = (level: RegionPolygon['level'], set: BoundSet) => `${level === 'inside68' ? '68%' : '95%'} region (${set.label})`;

function regionSeries(regions: RegionPolygon[], ink: PlotInk, set: BoundSet): PlotOption['series'] {
  return regions.map((region) => {
    const style = region.level === 'inside68' ? ink.region68 : ink.region95;
    return {
      type: 'custom' as const,
      name: regionName(region.level, set),
      silent: true,
      clip: true,
      z: 1,
      color: style.stroke,
      data: [region.points[0]!],
      renderItem: (_params: unknown, api: { coord: (p: number[]) => number[] }) => ({
        type: 'polygon',
        shape: { points: region.points.map((p) => api.coord(p)) },
        style: { fill: style.fill, stroke: style.stroke, lineWidth: 1.5 },
      }),
    };
  }) as PlotOption['series'];
}

export function buildPlaneOption({ layers, logR, ink, title }: PlaneOptionInput): PlaneOptionResult {
  const set = layers[0]?.plane.boundSet;
  if (!set) throw new Error('buildPlaneOption needs at least one layer');
  const single = layers.length === 1 && layers[0]!.plane.colorBy !== null ? layers[0]! : null;
  const scale = single ? colorScale(single.plane.color, columnOf(single.plane.colorBy)) : null;
  const box = planeBox(layers, set, logR);
  const regions = regionPolygons(set, box);
  const hidden: number[] = [];
  const scatter = layers.map((layer, i) => {
    const { data, hidden: h } = layerData(layer.plane, scale?.mapped ?? [], logR);
    hidden.push(h);
    return {
      type: 'scatter' as const,
      id: String(layer.scanId),
      name: layer.name,
      data,
      // Few points read better large; many must not cover each other.
      symbolSize: data.length > LARGE_THRESHOLD ? 4 : 8,
      // Large mode draws all points as one path: 10^5 points stay interactive.
      large: true,
      largeThreshold: LARGE_THRESHOLD,
      progressive: 20_000,
      z: 2,
      itemStyle: single ? { opacity: 0.9 } : { color: scanColour(i), opacity: 0.75 },
      encode: { x: 0, y: 1 },
    };
  });
  const notes = planeNotes(layers, hidden, set);
  const colorColumn = columnOf(single?.plane.colorBy ?? null);
  const option: PlotOption = {
    animation: false,
    backgroundColor: ink.background,
    textStyle: { fontFamily: 'IBM Plex Sans, system-ui, sans-serif', color: ink.text },
    title: { text: title, subtext: notes.join(' · '), left: 8, top: 4, textStyle: { fontSize: 14, color: ink.text }, subtextStyle: { color: ink.muted } },
    grid: { left: 72, right: scale ? 110 : 24, top: notes.length > 0 ? 78 : 58, bottom: 56 },
    // A coloured single scan takes its colours from the bar, so only the regions go in the legend.
    legend: {
      top: notes.length > 0 ? 50 : 30, right: scale ? 110 : 24, textStyle: { color: ink.text },
      ...(single ? { data: regions.map((r) => regionName(r.level, set)) } : {}),
    },
    tooltip: {
      trigger: 'item',
      formatter: (p: unknown) => {
        const { value, seriesName } = p as { value: PlaneDatum; seriesName: string };
        const lines = [`${layers.length > 1 ? `${seriesName} · ` : ''}point ${value[3]}`, `n_s = ${formatNumber(value[0], 'ns')}`, `r = ${formatNumber(value[1], 'r')}`];
        if (single) lines.push(`${colorColumn} = ${formatNumber(value[4], colorColumn)}`);
        return lines.join('<br>');
      },
    },
    xAxis: {
      type: 'value', name: 'n_s', nameLocation: 'middle', nameGap: 30, min: box.nsMin, max: box.nsMax,
      // The ends are the padded extent, not round numbers: their labels would crowd the ticks.
      axisLabel: { color: ink.muted, showMinLabel: false, showMaxLabel: false, formatter: (v: number) => formatNumber(v, 'ns', 4) },
      axisLine: { lineStyle: { color: ink.axis } }, splitLine: { lineStyle: { color: ink.split } },
    },
    yAxis: {
      type: logR ? 'log' : 'value', logBase: 10, name: logR ? 'r (log scale)' : 'r', nameLocation: 'middle', nameGap: 56,
      min: box.rMin, max: box.rMax,
      axisLabel: { color: ink.muted, showMinLabel: false, showMaxLabel: false, formatter: (v: number) => formatNumber(v, 'r', 2) },
      axisLine: { lineStyle: { color: ink.axis } }, splitLine: { lineStyle: { color: ink.split } },
    },
    series: [...(regionSeries(regions, ink, set) as object[]), ...scatter] as PlotOption['series'],
  };
  if (scale && scale.min !== null && scale.max !== null) {
    option.visualMap = {
      type: 'continuous', dimension: 2, seriesIndex: scatter.map((_, i) => regions.length + i),
      min: scale.min, max: scale.max === scale.min ? scale.min + 1 : scale.max,
      inRange: { color: [...SEQUENTIAL] }, outOfRange: { color: MISSING_COLOUR },
      calculable: true, right: 8, top: 'middle', text: [scale.label, ''], textStyle: { color: ink.text },
      formatter: (v: unknown) => barLabel(scale, Number(v), colorColumn),
    };
  }
  return { option, notes, box, regions, scale };
}
