import { init } from 'echarts/core';
import type { PlotOption } from '../components/plots/echartsSetup.ts';
import '../components/plots/echartsSetup.ts';

/** What PNG export needs of a chart on the page (vue-echarts' exposed method). */
export interface PngSource {
  getDataURL(opts: { type: 'png'; pixelRatio?: number; backgroundColor?: string }): string;
}

/**
 * The same option drawn by ECharts' SVG renderer in an off-screen instance (no DOM: server-side
 * rendering mode), so the SVG matches the plot on the page at the page's size.
 */
export function svgOf(option: PlotOption, width: number, height: number): string {
  const chart = init(null, undefined, { renderer: 'svg', ssr: true, width, height });
  try {
    chart.setOption(option);
    return chart.renderToSVGString();
  } finally {
    chart.dispose();
  }
}

function save(href: string, filename: string): void {
  const link = document.createElement('a');
  link.href = href;
  link.download = filename;
  link.rel = 'noopener';
  document.body.append(link);
  link.click();
  link.remove();
}

/** PNG from the canvas on the page, SVG from the option: one file per click, named after the plot. */
export function useChartExport() {
  return {
    png(chart: PngSource, name: string, backgroundColor: string): void {
      save(chart.getDataURL({ type: 'png', pixelRatio: 2, backgroundColor }), `${name}.png`);
    },
    svg(option: PlotOption, size: { width: number; height: number }, name: string): void {
      const url = URL.createObjectURL(new Blob([svgOf(option, size.width, size.height)], { type: 'image/svg+xml' }));
      save(url, `${name}.svg`);
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
    },
  };
}
