import { Router } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { parseRequest } from '../../shared/api/parse.ts';
import { submitScanSchema, TERMINAL_STATES } from '../../shared/api/scans.ts';
import { InvalidInputError } from '../../shared/errors.ts';
import { MAX_PLAN_TEXT } from '../../shared/plan/planText.ts';
import { actorOf } from '../auth/actor.ts';
import type { ScanEvents } from './scanEvents.ts';
import type { ScansService } from './scansService.ts';

const idSchema = z.coerce.number().int().positive();
const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_PLAN_TEXT, files: 1 } });

export const scanId = (raw: unknown): number => {
  const parsed = idSchema.safeParse(raw);
  if (!parsed.success) throw new InvalidInputError(`id: "${String(raw)}" is not a scan id (a positive whole number)`, 'id');
  return parsed.data;
};

/** The plan as a JSON body, or as an uploaded YAML/JSON file in the multipart field "plan". */
function submission(req: { file?: Express.Multer.File; body: unknown }) {
  if (req.file) {
    const format = /\.json$/i.test(req.file.originalname) ? 'json' : /\.ya?ml$/i.test(req.file.originalname) ? 'yaml' : undefined;
    return parseRequest(submitScanSchema, { planText: req.file.buffer.toString('utf8'), ...(format ? { format } : {}) });
  }
  return parseRequest(submitScanSchema, req.body ?? {});
}

export function scansRouter(service: ScansService, events: ScanEvents): Router {
  const router = Router();
  router.post('/', upload.single('plan'), async (req, res) => {
    res.status(201).json(await service.submit(submission(req), actorOf(req)));
  });
  router.get('/', async (req, res) => {
    res.json({ scans: await service.list(actorOf(req)) });
  });
  router.get('/:id', async (req, res) => {
    res.json(await service.get(scanId(req.params.id)));
  });
  router.post('/:id/cancel', async (req, res) => {
    res.json(await service.cancel(scanId(req.params.id)));
  });
  router.post('/:id/clone', async (req, res) => {
    res.status(201).json(await service.clone(scanId(req.params.id), actorOf(req)));
  });
  router.delete('/:id', async (req, res) => {
    await service.remove(scanId(req.params.id));
    res.status(204).end();
  });
  // Server-sent events: the current state at once, then one event per stored batch, until done.
  router.get('/:id/events', async (req, res) => {
    const first = await service.view(scanId(req.params.id));
    res.writeHead(200, { 'content-type': 'text/event-stream', 'cache-control': 'no-cache', connection: 'keep-alive' });
    // Progress published by the dispatcher carries no names; they do not change, so keep the first ones.
    const send = (view: typeof first) => {
      res.write(`event: progress\ndata: ${JSON.stringify({ ...view, owner: first.owner, group: first.group })}\n\n`);
      if (TERMINAL_STATES.has(view.state)) res.end();
    };
    send(first);
    if (TERMINAL_STATES.has(first.state)) return;
    const unsubscribe = events.subscribe(first.id, send);
    const keepAlive = setInterval(() => res.write(': keep-alive\n\n'), 15_000);
    res.on('close', () => {
      unsubscribe();
      clearInterval(keepAlive);
    });
  });
  return router;
}
