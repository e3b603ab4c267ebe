import { describe, expect, it } from 'vitest';
import { plotInk } from '../../../web/src/components/plots/palette.ts';
import { buildSpectraOption, buildTrajectoryOption } from '../../../web/src/components/plots/pointOptions.ts';
import { svgOf } from '../../../web/src/composables/useChartExport.ts';

const ink = plotInk(false);
const trajectory = { N: [0, 30, 55, 60, 65], phi: [6, 5, 3.2, 2, 0.9], eps1: [1e-4, 3e-4, 1e-3, 0.02, 1], eps2: [0.01, 0.02, 0.04, 0.3, 2.4], pivotN: 10, nEnd: 65 };

describe('point detail plots', () => {
  it('stacks phi, eps1 (log) and eps2 over one N axis, marking the pivot and the end', () => {
    const option = buildTrajectoryOption(trajectory, ink, 'T');
    const y = option.yAxis as { type: string; name: string }[];
    expect(y.map((a) => [a.name, a.type])).toEqual([['phi', 'value'], ['eps1', 'log'], ['eps2', 'value']]);
    const series = option.series as { data: number[][]; markLine: { data: { xAxis: number }[] } }[];
    expect(series[1]!.data).toEqual(trajectory.N.map((n, i) => [n, trajectory.eps1[i]]));
    expect(series[0]!.markLine.data.map((m) => m.xAxis)).toEqual([10, 65]);
    expect((option.xAxis as { max: number }[]).every((a) => a.max === 65)).toBe(true);
    const noPivot = buildTrajectoryOption({ ...trajectory, pivotN: null }, ink, 'T');
    expect((noPivot.series as { markLine: { data: unknown[] } }[])[0]!.markLine.data).toHaveLength(1);
  });

  it('draws both spectra on a log axis against ln(k/k_*) and exports as SVG', () => {
    const spectra = { samples: [-1, 0, 1].map((lnK) => ({ lnK, scalar: 2.1e-9 * Math.exp(-0.035 * lnK), tensor: 2e-11 })), failures: [] };
    const option = buildSpectraOption(spectra, ink, 'Spectra check');
    expect((option.yAxis as { type: string }).type).toBe('log');
    const series = option.series as { name: string; data: number[][] }[];
    expect(series.map((s) => s.name)).toEqual(['scalar P_R', 'tensor P_t']);
    expect(series[0]!.data[1]).toEqual([0, 2.1e-9]);
    expect(svgOf(option, 500, 300)).toContain('Spectra check');
  });
});
