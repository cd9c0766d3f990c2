import type { IncomingMessage } from 'node:http';

/** Where the payment provider posts its signed events. */
export const paymentWebhookPath = '/api/payments/webhook';

const rawBodies = new WeakMap<IncomingMessage, Buffer>();

/**
 * The JSON parser's `verify` hook: keeps the exact bytes of a payment event, since its signature is over those bytes
 * and not over any re-serialisation of the parsed body.
 *
 * @example
 * app.use('/api', express.json({ verify: keepRawBody }));
 */
export function keepRawBody(req: IncomingMessage, _res: unknown, body: Buffer): void {
  const url = (req as IncomingMessage & { originalUrl?: string }).originalUrl ?? req.url ?? '';
  if (url.split('?')[0] === paymentWebhookPath) rawBodies.set(req, body);
}

/** The bytes keepRawBody kept for this request, if any. */
export function rawBodyOf(req: IncomingMessage): Buffer | undefined {
  return rawBodies.get(req);
}
