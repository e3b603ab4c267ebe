import type { SampledTrajectory } from '../../../../shared/physics/point/trajectory.ts';
import type { PointResult } from '../../../../shared/physics/point/types.ts';
import type { TrajectorySamples } from '../../../../shared/api/plots.ts';
import type { PlotOption } from '../plots/echartsSetup.ts';
import { SCAN_COLOURS, type PlotInk } from '../plots/palette.ts';
import type { PotentialCurve } from '../../workers/pointProtocol.ts';

/** The trajectory in the shape the point-detail plots take (pivotN null rather than NaN). */
export function toTrajectorySamples(t: SampledTrajectory): TrajectorySamples {
  return { N: t.N, phi: t.phi, eps1: t.eps1, eps2: t.eps2, pivotN: Number.isFinite(t.pivotN) ? t.pivotN : null, nEnd: t.nEnd };
}

/** V(phi) with the start, the pivot and the end of the sample point's roll marked. */
export function buildPotentialOption(curve: PotentialCurve, result: PointResult, ink: PlotInk): PlotOption {
  const marks = [
    // Start and pivot are often close: one label above the plot, one inside it.
    { xAxis: result.phiStart, label: { formatter: 'start', color: ink.muted, position: 'insideEndBottom' } },
    { xAxis: result.phiPivot, label: { formatter: 'pivot', color: ink.muted, position: 'end' } },
    { xAxis: result.phiEnd, label: { formatter: 'end', color: ink.muted, position: 'end' } },
  ].filter((m) => Number.isFinite(m.xAxis));
  const axis = { axisLabel: { color: ink.muted }, axisLine: { lineStyle: { color: ink.axis } }, splitLine: { lineStyle: { color: ink.split } }, nameTextStyle: { color: ink.text } };
  return {
    animation: false,
    backgroundColor: ink.background,
    textStyle: { fontFamily: 'IBM Plex Sans, system-ui, sans-serif', color: ink.text },
    title: { text: 'V(phi) as given', left: 8, top: 4, textStyle: { fontSize: 14, color: ink.text } },
    tooltip: { trigger: 'axis' },
    grid: { left: 72, right: 24, top: 40, bottom: 48 },
    xAxis: { type: 'value', name: 'phi (M_pl)', nameLocation: 'middle', nameGap: 28, min: 'dataMin', max: 'dataMax', ...axis },
    yAxis: { type: 'value', name: 'V', nameLocation: 'middle', nameGap: 56, scale: true, ...axis },
    series: [{
      type: 'line', name: 'V', showSymbol: false, color: SCAN_COLOURS[0], data: curve.phi.map((phi, i) => [phi, curve.V[i] ?? null]),
      markLine: { silent: true, symbol: 'none', lineStyle: { color: ink.axis, type: 'dashed' }, data: marks },
    }],
  } as PlotOption;
}
