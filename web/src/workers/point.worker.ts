/// <reference lib="webworker" />
import { handlePreview, type PreviewRequest } from './pointProtocol.ts';

/** The physics core off the page's thread: one preview per message, replies in order. */
self.onmessage = (event: MessageEvent<PreviewRequest>) => {
  self.postMessage(handlePreview(event.data));
};
