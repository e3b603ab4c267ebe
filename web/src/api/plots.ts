import { planeSchema, pointDetailSchema } from '../../../shared/api/plots.ts';
import { heatmapSchema, resultsSummarySchema, type HeatmapValue } from '../../../shared/api/results.ts';
import { request } from './http.ts';

export interface PlaneParams { color?: string | undefined; max?: number | undefined }
export interface HeatmapParams { x: string; y: string; value?: HeatmapValue | undefined; agg: 'mean' | 'min' | 'max' | 'count' }

const query = (params: Record<string, string | number | undefined>) => {
  const q = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) if (value !== undefined) q.set(key, String(value));
  return q.toString();
};

/** Plot data of a scan (server/results/resultsRouter.ts: plane, heatmap, summary, point detail). */
export const plotsApi = {
  plane: (id: number, p: PlaneParams = {}) => request('GET', `/scans/${id}/plane?${query({ color: p.color, max: p.max })}`, { schema: planeSchema }),
  heatmap: (id: number, p: HeatmapParams) => request('GET', `/scans/${id}/heatmap?${query({ x: p.x, y: p.y, value: p.value, agg: p.agg })}`, { schema: heatmapSchema }),
  summary: (id: number) => request('GET', `/scans/${id}/summary`, { schema: resultsSummarySchema }),
  point: (id: number, index: number) => request('GET', `/scans/${id}/points/${index}`, { schema: pointDetailSchema }),
};
