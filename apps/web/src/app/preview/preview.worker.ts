import type { PreviewRequest } from './preview-messages';
import { createPreviewHandler } from './preview-handler';

// The preview worker: every message goes through the pure handler, every answer back with its buffers transferred.
const handle = createPreviewHandler();

addEventListener('message', (event: MessageEvent<PreviewRequest>) => {
  const { reply, transfer } = handle(event.data);
  postMessage(reply, { transfer });
});
