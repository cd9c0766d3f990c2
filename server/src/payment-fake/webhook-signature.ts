import { createHmac } from 'node:crypto';

/**
 * The signature header a webhook carries: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<payload>">` under the
 * endpoint's signing secret, the scheme the provider's SDK checks in `webhooks.constructEvent`.
 *
 * @example
 * signWebhookPayload('{"id":"evt_1"}', 'whsec_x', 1767225600); // 't=1767225600,v1=5d41…'
 */
export function signWebhookPayload(payload: string, secret: string, timestampSeconds: number): string {
  const signature = createHmac('sha256', secret)
    .update(`${timestampSeconds}.${payload}`, 'utf8')
    .digest('hex');
  return `t=${timestampSeconds},v1=${signature}`;
}
