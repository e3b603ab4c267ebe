import type { SpectraSamples, TrajectorySamples } from '../../../../shared/api/plots.ts';
import { formatNumber } from '../../utils/format.ts';
import type { PlotOption } from './echartsSetup.ts';
import { SCAN_COLOURS, type PlotInk } from './palette.ts';

/** Options of the point detail page: the trajectory's phi, eps1, eps2 over N, and the spectra around the pivot. */

const axisStyle = (ink: PlotInk) => ({
  axisLabel: { color: ink.muted }, axisLine: { lineStyle: { color: ink.axis } }, splitLine: { lineStyle: { color: ink.split } }, nameTextStyle: { color: ink.text },
});
const base = (ink: PlotInk, title: string) => ({
  animation: false,
  backgroundColor: ink.background,
  textStyle: { fontFamily: 'IBM Plex Sans, system-ui, sans-serif', color: ink.text },
  title: { text: title, left: 8, top: 4, textStyle: { fontSize: 14, color: ink.text } },
  tooltip: { trigger: 'axis' as const, valueFormatter: (v: unknown) => formatNumber(typeof v === 'number' ? v : null) },
});
const pairs = (xs: readonly number[], ys: readonly number[]) => xs.map((x, i) => [x, ys[i]!]);

/**
 * Three panels over one N axis: phi, eps1 (log: it climbs from ~1e-4 to 1 in the last e-folds)
 * and eps2, with the pivot's horizon exit and the end of inflation marked.
 */
export function buildTrajectoryOption(t: TrajectorySamples, ink: PlotInk, title: string): PlotOption {
  const rows = [
    { name: 'phi', data: pairs(t.N, t.phi), log: false },
    { name: 'eps1', data: pairs(t.N, t.eps1).filter(([, v]) => v! > 0), log: true },
    { name: 'eps2', data: pairs(t.N, t.eps2), log: false },
  ];
  const height = 26;
  const marks = [
    ...(t.pivotN === null ? [] : [{ xAxis: t.pivotN, name: 'pivot exit', label: { formatter: 'pivot', color: ink.muted } }]),
    { xAxis: t.nEnd, name: 'end', label: { formatter: 'end', color: ink.muted } },
  ];
  return {
    ...base(ink, title),
    axisPointer: { link: [{ xAxisIndex: 'all' }] },
    grid: rows.map((_, i) => ({ left: 72, right: 24, top: `${8 + i * (height + 5)}%`, height: `${height}%` })),
    xAxis: rows.map((_, i) => ({
      type: 'value' as const, gridIndex: i, min: 0, max: t.nEnd, name: i === rows.length - 1 ? 'N (e-folds from the start)' : '', nameLocation: 'middle' as const, nameGap: 28,
      ...axisStyle(ink), axisLabel: { show: i === rows.length - 1, color: ink.muted, showMaxLabel: false },
    })),
    yAxis: rows.map((row, i) => ({ type: row.log ? ('log' as const) : ('value' as const), gridIndex: i, name: row.name, nameLocation: 'middle' as const, nameGap: 50, scale: true, ...axisStyle(ink) })),
    series: rows.map((row, i) => ({
      type: 'line' as const, name: row.name, xAxisIndex: i, yAxisIndex: i, data: row.data, showSymbol: false, color: SCAN_COLOURS[i],
      markLine: { silent: true, symbol: 'none', lineStyle: { color: ink.axis, type: 'dashed' as const }, data: marks },
    })),
  } as PlotOption;
}

/** P_R and P_t against ln(k/k_*) on a log axis, pivot marked. */
export function buildSpectraOption(s: SpectraSamples, ink: PlotInk, title: string): PlotOption {
  const lnK = s.samples.map((p) => p.lnK);
  return {
    ...base(ink, title),
    legend: { top: 28, right: 24, textStyle: { color: ink.text } },
    grid: { left: 80, right: 24, top: 64, bottom: 56 },
    xAxis: { type: 'value', name: 'ln(k / k_*)', nameLocation: 'middle', nameGap: 30, ...axisStyle(ink) },
    yAxis: { type: 'log', name: 'power', nameLocation: 'middle', nameGap: 60, ...axisStyle(ink), axisLabel: { color: ink.muted, formatter: (v: number) => formatNumber(v, 'As', 2) } },
    series: [
      { type: 'line', name: 'scalar P_R', data: pairs(lnK, s.samples.map((p) => p.scalar)), color: SCAN_COLOURS[0], symbolSize: 6,
        markLine: { silent: true, symbol: 'none', lineStyle: { color: ink.axis, type: 'dashed' }, data: [{ xAxis: 0, label: { formatter: 'k_*', color: ink.muted } }] } },
      { type: 'line', name: 'tensor P_t', data: pairs(lnK, s.samples.map((p) => p.tensor)), color: SCAN_COLOURS[1], symbolSize: 6 },
    ],
  } as PlotOption;
}
