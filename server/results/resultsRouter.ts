import { Router } from 'express';
import { parsePlaneQuery, parsePointIndex } from '../../shared/api/plots.ts';
import { parseDownloadQuery, parseHeatmapQuery, parseResultsQuery } from '../../shared/api/results.ts';
import type { Database } from '../db/client.ts';
import { scanId } from '../scans/scansRouter.ts';
import { createPlotsService } from './plotsService.ts';
import { createResultsService } from './resultsService.ts';
import { writeChunks } from './writeChunks.ts';

/** Results of one scan, mounted under /api/v1/scans (see AppDeps.scanFeatures). */
export function resultsRouter(db: Database): Router {
  const service = createResultsService(db);
  const plots = createPlotsService(db);
  const router = Router();
  router.get('/:id/results', async (req, res) => {
    res.json(await service.page(scanId(req.params.id), parseResultsQuery(req.query)));
  });
  router.get('/:id/summary', async (req, res) => {
    res.json(await service.summary(scanId(req.params.id)));
  });
  router.get('/:id/heatmap', async (req, res) => {
    res.json(await service.heatmap(scanId(req.params.id), parseHeatmapQuery(req.query)));
  });
  router.get('/:id/plane', async (req, res) => {
    res.json(await plots.plane(scanId(req.params.id), parsePlaneQuery(req.query)));
  });
  router.get('/:id/points/:index', async (req, res) => {
    res.json(await plots.point(scanId(req.params.id), parsePointIndex(req.params.index)));
  });
  // Streamed: headers go out once the scan and query are checked, then one write per page.
  router.get('/:id/download', async (req, res) => {
    const download = await service.download(scanId(req.params.id), parseDownloadQuery(req.query));
    res.attachment(download.filename).type(download.contentType);
    await writeChunks(res, download.chunks);
  });
  return router;
}
