import express, { type Express, type NextFunction, type Request, type Response } from 'express';
import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Logger } from 'pino';
import { escapeHtml } from '../mail/escape-html';
import { signWebhookPayload } from './webhook-signature';

/** A checkout session as the fake keeps it: the fields of the provider's object the app reads. */
export interface FakeCheckoutSession {
  id: string;
  object: 'checkout.session';
  mode: string;
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_total: number;
  currency: string;
  client_reference_id: string | null;
  customer_email: string | null;
  metadata: Record<string, string>;
  success_url: string;
  cancel_url: string | null;
  url: string | null;
  payment_intent: string | null;
  created: number;
  livemode: false;
  line_items_summary: { name: string; quantity: number; amount: number }[];
  refunded: number;
}

export interface PaymentFakeOptions {
  secretKey: string;
  webhookSecret: string;
  /** Where approved and declined checkouts are posted as signed events. */
  webhookUrl: string;
  /** The fake's own address as a browser reaches it, for checkout page links. */
  publicBase: () => string;
  logger: Logger;
  /** Unix seconds; the system clock by default. */
  nowSeconds?: () => number;
}

export interface PaymentFake {
  app: Express;
  sessions: Map<string, FakeCheckoutSession>;
}

// 3 tries, 0.5 s apart, then the event is dropped with a log line: enough for a local app that is starting (our choice)
const webhookTries = 3;
const webhookRetryMs = 500;

function newId(prefix: string): string {
  return `${prefix}_${randomBytes(12).toString('hex')}`;
}

/** An error in the provider's shape, which the SDK turns into its own typed errors. */
function providerError(res: Response, status: number, type: string, message: string, param?: string): void {
  res.status(status).json({ error: { type, message, ...(param ? { param } : {}) } });
}

function int(value: unknown): number | null {
  if (typeof value !== 'string' && typeof value !== 'number') return null;
  const n = Number(value);
  return Number.isInteger(n) && n >= 0 ? n : null;
}

function asRecord(value: unknown): Record<string, unknown> {
  return typeof value === 'object' && value !== null ? (value as Record<string, unknown>) : {};
}

function asList(value: unknown): unknown[] {
  if (Array.isArray(value)) return value;
  if (typeof value === 'object' && value !== null) return Object.values(value);
  return [];
}

/**
 * A local stand-in for the payment provider's HTTP API: the part the official SDK uses here (create, retrieve and
 * expire checkout sessions; refunds, replayed by Idempotency-Key), a checkout page that approves or declines, and signed webhooks to the app. It keeps its
 * sessions in memory; it is for development and tests, never for money.
 *
 * @example
 * const { app } = createPaymentFakeApp({ secretKey, webhookSecret, webhookUrl, publicBase: () => url, logger });
 */
export function createPaymentFakeApp(options: PaymentFakeOptions): PaymentFake {
  const nowSeconds = options.nowSeconds ?? (() => Math.floor(Date.now() / 1000));
  const sessions = new Map<string, FakeCheckoutSession>();
  const app = express();
  app.disable('x-powered-by');
  app.use(express.urlencoded({ extended: true, limit: '1mb' }));

  const authorised = (req: Request, res: Response, next: NextFunction) => {
    const header = req.get('authorization') ?? '';
    const given = Buffer.from(header.replace(/^Bearer\s+/i, ''));
    const expected = Buffer.from(options.secretKey);
    if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
      providerError(res, 401, 'invalid_request_error', 'Invalid API key provided.');
      return;
    }
    next();
  };

  async function deliver(type: string, object: unknown): Promise<void> {
    const event = {
      id: newId('evt'),
      object: 'event',
      type,
      created: nowSeconds(),
      livemode: false,
      api_version: null,
      data: { object },
    };
    const payload = JSON.stringify(event);
    for (let attempt = 1; attempt <= webhookTries; attempt++) {
      try {
        const res = await fetch(options.webhookUrl, {
          method: 'POST',
          headers: {
            'content-type': 'application/json; charset=utf-8',
            'stripe-signature': signWebhookPayload(payload, options.webhookSecret, nowSeconds()),
          },
          body: payload,
        });
        if (res.ok) return;
        options.logger.warn({ status: res.status, type, attempt }, 'the app refused a payment event');
      } catch (err) {
        options.logger.warn({ err, type, attempt }, 'could not post a payment event to the app');
      }
      await new Promise((r) => setTimeout(r, webhookRetryMs));
    }
    options.logger.error({ eventId: event.id, type }, 'gave up posting a payment event');
  }

  app.post('/v1/checkout/sessions', authorised, (req, res) => {
    const body = asRecord(req.body);
    const successUrl = typeof body['success_url'] === 'string' ? body['success_url'] : null;
    if (!successUrl)
      return providerError(
        res,
        400,
        'invalid_request_error',
        'Missing required param: success_url.',
        'success_url',
      );
    const items = asList(body['line_items']).map((raw) => {
      const item = asRecord(raw);
      const price = asRecord(item['price_data']);
      return {
        name: String(asRecord(price['product_data'])['name'] ?? 'Item'),
        currency: String(price['currency'] ?? '').toLowerCase(),
        amount: int(price['unit_amount']),
        quantity: int(item['quantity'] ?? '1'),
      };
    });
    if (!items.length)
      return providerError(
        res,
        400,
        'invalid_request_error',
        'Missing required param: line_items.',
        'line_items',
      );
    const bad = items.findIndex(
      (i) => i.amount === null || i.quantity === null || !/^[a-z]{3}$/.test(i.currency),
    );
    if (bad >= 0) {
      return providerError(
        res,
        400,
        'invalid_request_error',
        `Invalid line_items[${bad}].`,
        `line_items[${bad}]`,
      );
    }
    const currencies = new Set(items.map((i) => i.currency));
    if (currencies.size !== 1)
      return providerError(res, 400, 'invalid_request_error', 'All line items must share one currency.');
    const id = newId('cs_test');
    const session: FakeCheckoutSession = {
      id,
      object: 'checkout.session',
      mode: String(body['mode'] ?? 'payment'),
      status: 'open',
      payment_status: 'unpaid',
      amount_total: items.reduce((sum, i) => sum + i.amount! * i.quantity!, 0),
      currency: [...currencies][0]!,
      client_reference_id:
        typeof body['client_reference_id'] === 'string' ? body['client_reference_id'] : null,
      customer_email: typeof body['customer_email'] === 'string' ? body['customer_email'] : null,
      metadata: Object.fromEntries(
        Object.entries(asRecord(body['metadata'])).map(([k, v]) => [k, String(v)]),
      ),
      success_url: successUrl,
      cancel_url: typeof body['cancel_url'] === 'string' ? body['cancel_url'] : null,
      url: `${options.publicBase()}/checkout/${id}`,
      payment_intent: null,
      created: nowSeconds(),
      livemode: false,
      line_items_summary: items.map((i) => ({ name: i.name, quantity: i.quantity!, amount: i.amount! })),
      refunded: 0,
    };
    sessions.set(id, session);
    res.json(session);
  });

  app.get('/v1/checkout/sessions/:id', authorised, (req, res) => {
    const session = sessions.get(String(req.params['id']));
    if (!session)
      return providerError(
        res,
        404,
        'invalid_request_error',
        `No such checkout.session: '${req.params['id']}'`,
        'id',
      );
    res.json(session);
  });

  app.post('/v1/checkout/sessions/:id/expire', authorised, (req, res) => {
    const session = sessions.get(String(req.params['id']));
    if (!session)
      return providerError(
        res,
        404,
        'invalid_request_error',
        `No such checkout.session: '${req.params['id']}'`,
        'id',
      );
    if (session.status !== 'open') {
      return providerError(
        res,
        400,
        'invalid_request_error',
        `Only Checkout Sessions with a status in ["open"] can be expired; this one is ${session.status}.`,
      );
    }
    session.status = 'expired';
    session.url = null;
    void deliver('checkout.session.expired', session);
    res.json(session);
  });

  // answers already given to an Idempotency-Key, replayed as the provider does for a request sent again
  const refundAnswers = new Map<string, { status: number; body: unknown }>();

  app.post('/v1/refunds', authorised, (req, res) => {
    const key = req.get('idempotency-key');
    const known = key ? refundAnswers.get(key) : undefined;
    if (known) return void res.status(known.status).json(known.body);
    if (key) {
      const json = res.json.bind(res);
      res.json = (body: unknown) => {
        refundAnswers.set(key, { status: res.statusCode, body });
        return json(body);
      };
    }
    const body = asRecord(req.body);
    const intent = String(body['payment_intent'] ?? '');
    const session = [...sessions.values()].find(
      (s) => s.payment_intent !== null && s.payment_intent === intent,
    );
    if (!session)
      return providerError(
        res,
        404,
        'invalid_request_error',
        `No such payment_intent: '${intent}'`,
        'payment_intent',
      );
    const left = session.amount_total - session.refunded;
    const amount = body['amount'] === undefined ? left : int(body['amount']);
    if (amount === null || amount <= 0 || amount > left) {
      return providerError(
        res,
        400,
        'invalid_request_error',
        `Refund amount must be between 1 and ${left}.`,
        'amount',
      );
    }
    session.refunded += amount;
    const refund = {
      id: newId('re'),
      object: 'refund',
      amount,
      currency: session.currency,
      payment_intent: intent,
      status: 'succeeded',
      created: nowSeconds(),
    };
    void deliver('refund.created', refund);
    res.json(refund);
  });

  app.get('/checkout/:id', (req, res) => {
    const session = sessions.get(String(req.params['id']));
    if (!session) return void res.status(404).type('text/plain').send('No such checkout.');
    const money = (minor: number) => `${(minor / 100).toFixed(2)} ${session.currency.toUpperCase()}`;
    const rows = session.line_items_summary
      .map(
        (i) =>
          `<tr><td>${escapeHtml(i.name)}</td><td>${i.quantity}</td><td>${money(i.amount * i.quantity)}</td></tr>`,
      )
      .join('');
    const open = session.status === 'open';
    res.type('html').send(`<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Test checkout</title>
<style>body{font-family:sans-serif;max-width:520px;margin:40px auto;color:#222}td{padding:4px 12px 4px 0}
button{font-size:16px;padding:10px 20px;margin-right:12px}.note{background:#fff4d6;padding:8px 12px}</style></head>
<body><p class="note">Local test checkout: no money moves.</p>
<h1>Pay ${money(session.amount_total)}</h1>
<table>${rows}</table>
${
  open
    ? `<form method="post" action="/checkout/${session.id}/approve"><button type="submit" data-testid="fake-approve">Approve payment</button></form>
<form method="post" action="/checkout/${session.id}/decline"><button type="submit" data-testid="fake-decline">Decline</button></form>`
    : `<p data-testid="fake-status">This checkout is ${session.status}.</p>`
}
</body></html>`);
  });

  const finish = (outcome: 'approve' | 'decline') => async (req: Request, res: Response) => {
    const session = sessions.get(String(req.params['id']));
    if (!session) return void res.status(404).type('text/plain').send('No such checkout.');
    if (session.status !== 'open') return void res.redirect(303, `/checkout/${session.id}`);
    if (outcome === 'approve') {
      session.status = 'complete';
      session.payment_status = 'paid';
      session.payment_intent = newId('pi');
      await deliver('checkout.session.completed', session);
      res.redirect(303, session.success_url.replace('{CHECKOUT_SESSION_ID}', session.id));
    } else {
      session.status = 'expired';
      session.url = null;
      await deliver('checkout.session.expired', session);
      res.redirect(
        303,
        (session.cancel_url ?? session.success_url).replace('{CHECKOUT_SESSION_ID}', session.id),
      );
    }
  };
  app.post('/checkout/:id/approve', finish('approve'));
  app.post('/checkout/:id/decline', finish('decline'));

  app.use((_req, res) => providerError(res, 404, 'invalid_request_error', 'Unrecognized request URL.'));
  return { app, sessions };
}
