import { z } from 'zod';
import { DOWNLOAD_FORMATS, resultsPageSchema } from '../../../shared/api/results.ts';
import { scanDetailSchema, scanViewSchema } from '../../../shared/api/scans.ts';
import { API, request } from './http.ts';

const scanListSchema = z.object({ scans: z.array(scanViewSchema) });
export type DownloadFormat = (typeof DOWNLOAD_FORMATS)[number];

/** Scans and their results (server/scans/scansRouter.ts, server/results/resultsRouter.ts). */
export const scansApi = {
  list: async () => (await request('GET', '/scans', { schema: scanListSchema })).scans,
  get: (id: number) => request('GET', `/scans/${id}`, { schema: scanDetailSchema }),
  cancel: (id: number) => request('POST', `/scans/${id}/cancel`, { schema: scanViewSchema }),
  clone: (id: number) => request('POST', `/scans/${id}/clone`, { schema: scanViewSchema }),
  /** One page of rows; `query` comes from resultsQuery.ts (sort, filters, paging). */
  results: (id: number, query: URLSearchParams) => request('GET', `/scans/${id}/results?${query}`, { schema: resultsPageSchema }),
  /** Plain links: the browser streams the file itself, with the session cookie. */
  downloadUrl: (id: number, format: DownloadFormat, query = new URLSearchParams()) => {
    const params = new URLSearchParams(query);
    params.set('format', format);
    return `${API}/scans/${id}/download?${params}`;
  },
  eventsUrl: (id: number) => `${API}/scans/${id}/events`,
};
