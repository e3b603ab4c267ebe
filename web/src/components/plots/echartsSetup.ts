import { CustomChart, HeatmapChart, LineChart, ScatterChart } from 'echarts/charts';
import type { CustomSeriesOption, HeatmapSeriesOption, LineSeriesOption, ScatterSeriesOption } from 'echarts/charts';
import {
  GridComponent, LegendComponent, MarkLineComponent, TitleComponent, TooltipComponent, VisualMapComponent,
  type GridComponentOption, type LegendComponentOption, type MarkLineComponentOption, type TitleComponentOption,
  type TooltipComponentOption, type VisualMapComponentOption,
} from 'echarts/components';
import { use, type ComposeOption } from 'echarts/core';
import { CanvasRenderer, SVGRenderer } from 'echarts/renderers';

/**
 * The only place ECharts parts are registered: the chart types and components our plots use, the
 * canvas renderer for the page and the SVG renderer for SVG export. Importing this module is enough.
 */
use([
  ScatterChart, HeatmapChart, LineChart, CustomChart,
  GridComponent, LegendComponent, MarkLineComponent, TitleComponent, TooltipComponent, VisualMapComponent,
  CanvasRenderer, SVGRenderer,
]);

export type PlotOption = ComposeOption<
  | ScatterSeriesOption | HeatmapSeriesOption | LineSeriesOption | CustomSeriesOption
  | GridComponentOption | LegendComponentOption | MarkLineComponentOption | TitleComponentOption | TooltipComponentOption | VisualMapComponentOption
>;
