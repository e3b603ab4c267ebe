import type { ErrorRequestHandler, RequestHandler } from 'express';
import { RollwayError } from '../../shared/errors.ts';

/** Unknown routes under the API answer in JSON, like every other error. */
export const notFound: RequestHandler = (req, res) => {
  res.status(404).json({ error: { code: 'not_found', message: `no route ${req.method} ${req.path}` } });
};

/**
 * The one place errors become responses: typed errors keep their status and field; body-parser
 * errors (bad JSON, too large) are the client's fault; anything else is logged and a 500.
 */
export const errorHandler: ErrorRequestHandler = (error: unknown, req, res, _next) => {
  // A stream (download, events) that fails midway cannot change its status any more: cut it.
  if (res.headersSent) {
    req.log?.error({ err: error }, 'error after the response started');
    res.destroy();
    return;
  }
  if (error instanceof RollwayError) {
    res.status(error.status).json({ error: error.toJSON() });
    return;
  }
  const status = typeof error === 'object' && error !== null && 'status' in error ? Number((error as { status: unknown }).status) : 500;
  if (status >= 400 && status < 500) {
    const message = error instanceof Error ? error.message : 'bad request';
    res.status(status).json({ error: { code: status === 413 ? 'too_large' : 'bad_request', message } });
    return;
  }
  req.log?.error({ err: error }, 'unhandled error');
  res.status(500).json({ error: { code: 'internal', message: 'internal server error' } });
};
