import type { Response } from 'express';

/** Resolves on 'drain', or on 'close' when the client has gone (a drain would never come). */
const drained = (res: Response): Promise<void> =>
  new Promise((resolve) => {
    if (res.destroyed) return resolve();
    const done = () => {
      res.off('drain', done);
      res.off('close', done);
      resolve();
    };
    res.on('drain', done);
    res.on('close', done);
  });

/**
 * Writes chunks as they are produced, waiting for the socket whenever its buffer is full, so a
 * download of any size holds about one chunk in memory. The next chunk is asked for only while
 * the client is still there: a client that disconnects stops the producer before its next page
 * query. A failure after the headers are out cannot become a JSON error any more: the response
 * is destroyed, so the client sees a broken transfer rather than a file that looks complete.
 */
export async function writeChunks(res: Response, chunks: AsyncIterable<string>): Promise<void> {
  const iterator = chunks[Symbol.asyncIterator]();
  try {
    while (!res.destroyed) {
      const next = await iterator.next();
      if (next.done) {
        res.end();
        return;
      }
      if (!res.write(next.value)) await drained(res);
    }
    await iterator.return?.();
  } catch (error) {
    if (!res.headersSent) throw error;
    res.req.log?.error({ err: error }, 'download failed after the response started');
    res.destroy(error instanceof Error ? error : new Error(String(error)));
  }
}
