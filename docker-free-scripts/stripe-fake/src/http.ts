import { createHash, timingSafeEqual } from 'node:crypto';
import express, { type Express, type NextFunction, type Request, type Response } from 'express';
import type Stripe from 'stripe';
import { FakeError, invalid } from './errors.js';
import { API_VERSION, type Cause, type FakeState } from './fake.js';
import { newId, PREFIX } from './ids.js';
import type { LineItemInput } from './objects.js';
import { notFoundPage, payPage } from './page.js';
import { amount, bool, currency, expandList, int, metadata, obj, range, str, type Params } from './params.js';

interface Remembered {
  fingerprint: string;
  status: number;
  body: unknown;
}

type Handler = (p: Params, req: Request, cause: Cause) => { status?: number; body: object };

const REFUND_REASONS = ['duplicate', 'fraudulent', 'requested_by_customer'] as const;

/** Builds the fake's HTTP face: the v1 API the SDK calls, the hosted payment page, and test controls. */
export function createFakeApp(state: FakeState): Express {
  const app = express();
  const idempotency = new Map<string, Remembered>();
  app.disable('x-powered-by');
  app.set('query parser', 'extended');
  app.set('etag', false);

  app.use((req, res, next) => {
    res.setHeader('Request-Id', newId(PREFIX.request));
    res.setHeader('Stripe-Version', String(req.get('Stripe-Version') ?? API_VERSION));
    next();
  });
  app.use(express.urlencoded({ extended: true, limit: '1mb', parameterLimit: 5000 }));
  app.use(express.json({ limit: '1mb' }));

  app.get('/health', (_req, res) => {
    res.json({ status: 'ok' });
  });

  // --- the hosted payment page (stands in for the processor's; no auth, the session id is the link) --
  app.get('/pay/:session', (req, res) => {
    state.expireDueSessions();
    const s = state.sessions.get(req.params.session);
    res.setHeader('Cache-Control', 'no-store');
    if (!s) return void res.status(404).type('html').send(notFoundPage());
    res.type('html').send(payPage(s, state.sessionLineItems(s.id), state.sessionLastError(s.id)));
  });
  app.post('/pay/:session', (req, res) => {
    const s = state.sessions.get(req.params.session);
    res.setHeader('Cache-Control', 'no-store');
    if (!s) return void res.status(404).type('html').send(notFoundPage());
    const body = (req.body ?? {}) as Params;
    if (body.action === 'cancel') {
      // The session stays open, as the processor's does, until it expires or is paid.
      if (s.status === 'open' && s.cancel_url) return void res.redirect(303, s.cancel_url);
      return void res.type('html').send(payPage(s, state.sessionLineItems(s.id), null));
    }
    const card = typeof body.card === 'string' ? body.card : '';
    const problem = cardFormProblem(card, body.expiry, body.cvc);
    if (problem) return void res.status(422).type('html').send(payPage(s, state.sessionLineItems(s.id), problem, card));
    const result = state.payOnPage(s.id, card);
    if (result.ok) {
      const to = (result.session.success_url ?? '').replace('{CHECKOUT_SESSION_ID}', s.id);
      if (to) return void res.redirect(303, to);
      return void res.type('html').send(payPage(result.session, [], null));
    }
    res.status(402).type('html').send(payPage(state.session(s.id), state.sessionLineItems(s.id), result.reason, card));
  });

  // --- authentication for the API and the controls ------------------------------------------------
  const expected = Buffer.from(state.opts.apiKey);
  // Bearer, as the SDK sends it, or Basic with the key as the user name (curl -u sk_test_…:).
  const keyOf = (header: string): string => {
    const bearer = /^Bearer\s+(\S+)$/.exec(header);
    if (bearer) return bearer[1]!;
    const basic = /^Basic\s+([A-Za-z0-9+/=]+)$/.exec(header);
    return basic ? Buffer.from(basic[1]!, 'base64').toString('utf8').split(':')[0]! : header;
  };
  const authenticate = (req: Request, _res: Response, next: NextFunction) => {
    const header = req.get('Authorization') ?? '';
    if (!header) return next(new FakeError(401, 'authentication_error', 'You did not provide an API key. Send it as a Bearer token in the Authorization header.'));
    const key = keyOf(header);
    const got = Buffer.from(key);
    if (got.length !== expected.length || !timingSafeEqual(got, expected)) {
      return next(new FakeError(401, 'authentication_error', `Invalid API Key provided: ${key.slice(0, 8)}${'*'.repeat(Math.max(0, key.length - 12))}${key.slice(-4)}`));
    }
    next();
  };
  app.use('/v1', authenticate);
  app.use('/control', authenticate);

  /**
   * One API route: parameters from the query (GET) or the form body (POST), `expand` applied to the
   * answer, and POSTs remembered under their Idempotency-Key so a retry gets the first answer.
   */
  const route = (handler: Handler) => (req: Request, res: Response) => {
    state.expireDueSessions();
    const p = ((req.method === 'GET' ? req.query : req.body) ?? {}) as Params;
    const key = req.method === 'POST' ? req.get('Idempotency-Key') : undefined;
    const cause: Cause = { requestId: String(res.getHeader('Request-Id')), idempotencyKey: key ?? null };
    let fingerprint = '';
    if (key !== undefined) {
      if (key.length === 0 || key.length > 255) throw invalid('Idempotency-Key', 'Idempotency keys must be between 1 and 255 characters long.');
      fingerprint = createHash('sha256').update(`${req.method} ${req.path} ${canonical(p)}`).digest('hex');
      const seen = idempotency.get(key);
      if (seen) {
        if (seen.fingerprint !== fingerprint) {
          throw new FakeError(400, 'idempotency_error', `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`);
        }
        res.setHeader('Idempotent-Replayed', 'true');
        res.setHeader('Idempotency-Key', key);
        return void res.status(seen.status).json(seen.body);
      }
    }
    let status: number;
    let body: unknown;
    try {
      const out = handler(p, req, cause);
      status = out.status ?? 200;
      body = expandObject(state, out.body, expandList(p));
    } catch (err) {
      if (!(err instanceof FakeError)) throw err;
      status = err.status;
      body = err.body();
    }
    if (key !== undefined) {
      idempotency.set(key, { fingerprint, status, body });
      res.setHeader('Idempotency-Key', key);
    }
    res.status(status).json(body);
  };

  const listOf = <T extends { id: string }>(rows: T[], p: Params, url: string) => ({ body: page(rows, p, url) });

  // --- customers ----------------------------------------------------------------------------------
  app.post('/v1/customers', route((p) => ({ body: state.createCustomer({ email: str(p, 'email'), name: str(p, 'name'), description: str(p, 'description'), metadata: metadata(p) ?? {} }) })));
  app.get('/v1/customers/:id', route((_p, req) => ({ body: state.customer(String(req.params.id)) })));

  // --- checkout sessions --------------------------------------------------------------------------
  app.post(
    '/v1/checkout/sessions',
    route((p) => {
      const mode = str(p, 'mode', true);
      if (mode !== 'payment') throw invalid('mode', `The fake supports mode=payment only, not ${mode}.`);
      const items = lineItems(p);
      const pid = obj(p, 'payment_intent_data') ?? {};
      return {
        body: state.createSession({
          currency: items[0]!.currency,
          lineItems: items,
          successUrl: url(p, 'success_url', true),
          cancelUrl: url(p, 'cancel_url'),
          customer: str(p, 'customer'),
          customerEmail: str(p, 'customer_email'),
          clientReferenceId: str(p, 'client_reference_id'),
          metadata: metadata(p) ?? {},
          piMetadata: metadata(pid, 'metadata') ?? {},
          piDescription: str(pid, 'description'),
          expiresAt: int(p, 'expires_at'),
        }),
      };
    }),
  );
  app.get('/v1/checkout/sessions/:id', route((_p, req) => ({ body: state.session(String(req.params.id)) })));
  app.post('/v1/checkout/sessions/:id/expire', route((_p, req, cause) => ({ body: state.expireSession(String(req.params.id), cause) })));
  app.get('/v1/checkout/sessions/:id/line_items', route((p, req) => listOf(state.sessionLineItems(String(req.params.id)), p, `/v1/checkout/sessions/${req.params.id}/line_items`)));

  // --- payment intents ----------------------------------------------------------------------------
  app.post(
    '/v1/payment_intents',
    route((p, _req, cause) => ({
      body: state.createPaymentIntent(
        {
          amount: amount(p, 'amount', true),
          currency: currency(p),
          customer: str(p, 'customer'),
          description: str(p, 'description'),
          metadata: metadata(p) ?? {},
          receiptEmail: str(p, 'receipt_email'),
          paymentMethod: str(p, 'payment_method'),
          confirm: bool(p, 'confirm'),
        },
        cause,
      ),
    })),
  );
  app.get('/v1/payment_intents/:id', route((_p, req) => ({ body: state.paymentIntent(String(req.params.id)) })));
  app.post(
    '/v1/payment_intents/:id',
    route((p, req) => ({
      body: state.updatePaymentIntent(String(req.params.id), {
        amount: amount(p, 'amount') ?? undefined,
        description: p.description === undefined ? undefined : str(p, 'description'),
        receiptEmail: p.receipt_email === undefined ? undefined : str(p, 'receipt_email'),
        metadata: (metadata(p) as Record<string, string> | null) ?? undefined,
      }),
    })),
  );
  app.post('/v1/payment_intents/:id/confirm', route((p, req, cause) => ({ body: state.confirmPaymentIntent(String(req.params.id), { paymentMethod: str(p, 'payment_method') }, cause) })));
  app.post(
    '/v1/payment_intents/:id/cancel',
    route((p, req, cause) => {
      const reason = str(p, 'cancellation_reason');
      const allowed = ['duplicate', 'fraudulent', 'requested_by_customer', 'abandoned'];
      if (reason !== null && !allowed.includes(reason)) throw invalid('cancellation_reason', `cancellation_reason must be one of ${allowed.join(', ')}.`);
      return { body: state.cancelPaymentIntent(String(req.params.id), reason as Stripe.PaymentIntent.CancellationReason | null, cause) };
    }),
  );

  // --- charges, refunds ---------------------------------------------------------------------------
  app.get('/v1/charges/:id', route((_p, req) => ({ body: state.charge(String(req.params.id)) })));
  app.post(
    '/v1/refunds',
    route((p, _req, cause) => {
      const reason = str(p, 'reason');
      if (reason !== null && !(REFUND_REASONS as readonly string[]).includes(reason)) throw invalid('reason', `reason must be one of ${REFUND_REASONS.join(', ')}.`);
      return {
        body: state.createRefund(
          { paymentIntent: str(p, 'payment_intent'), charge: str(p, 'charge'), amount: amount(p, 'amount'), reason: reason as Stripe.Refund.Reason | null, metadata: metadata(p) ?? {} },
          cause,
        ),
      };
    }),
  );
  app.get('/v1/refunds/:id', route((_p, req) => ({ body: state.refund(String(req.params.id)) })));

  // --- balance transactions, payouts, events ------------------------------------------------------
  app.get(
    '/v1/balance_transactions',
    route((p) => {
      const payout = str(p, 'payout');
      const type = str(p, 'type');
      const source = str(p, 'source');
      const cur = p.currency === undefined ? null : currency(p);
      const created = range(p, 'created');
      if (payout) state.payout(payout);
      const rows = state
        .allBalanceTransactions()
        .filter((t) => (!payout || state.payoutOf.get(t.id) === payout) && (!type || t.type === type) && (!source || t.source === source) && (!cur || t.currency === cur) && (!created || created(t.created)));
      return listOf(rows, p, '/v1/balance_transactions');
    }),
  );
  app.get('/v1/balance_transactions/:id', route((_p, req) => ({ body: state.balanceTransaction(String(req.params.id)) })));
  app.get(
    '/v1/payouts',
    route((p) => {
      const status = str(p, 'status');
      const created = range(p, 'created');
      const arrival = range(p, 'arrival_date');
      const rows = state.payouts.newestFirst().filter((po) => (!status || po.status === status) && (!created || created(po.created)) && (!arrival || arrival(po.arrival_date)));
      return listOf(rows, p, '/v1/payouts');
    }),
  );
  app.get('/v1/payouts/:id', route((_p, req) => ({ body: state.payout(String(req.params.id)) })));
  app.get(
    '/v1/events',
    route((p) => {
      const type = str(p, 'type');
      const created = range(p, 'created');
      const matches = (t: string) => !type || (type.endsWith('.*') ? t.startsWith(type.slice(0, -1)) : t === type);
      return listOf(state.events.newestFirst().filter((e) => matches(e.type) && (!created || created(e.created))), p, '/v1/events');
    }),
  );
  app.get('/v1/events/:id', route((_p, req) => ({ body: state.event(String(req.params.id)) })));

  // --- controls for tests and demos (outside /v1: the real processor has none of these) -----------
  app.post('/control/reset', (_req, res) => {
    idempotency.clear();
    state.reset();
    res.json({ reset: true });
  });
  app.post('/control/clock', (req, res) => {
    const seconds = int((req.body ?? {}) as Params, 'advance_seconds', true);
    if (seconds < 0) throw invalid('advance_seconds', 'The clock only moves forward.');
    state.advanceClock(seconds);
    res.json({ now: state.now() });
  });
  app.post('/control/payouts/run', route(() => ({ body: { object: 'list', data: state.runPayouts() } })));
  app.post('/control/events/:id/resend', route((_p, req) => ({ body: state.resendEvent(String(req.params.id)) })));
  app.get('/control/deliveries', (req, res) => {
    const event = typeof req.query.event === 'string' ? req.query.event : null;
    res.json({ object: 'list', data: state.deliverer.attempts.filter((a) => !event || a.eventId === event) });
  });

  app.use((req, res) => {
    res.status(404).json(new FakeError(404, 'invalid_request_error', `Unrecognized request URL (${req.method}: ${req.path}). The fake implements only what Wingstage uses.`).body());
  });
  app.use((err: unknown, _req: Request, res: Response, _next: NextFunction) => {
    if (err instanceof FakeError) return void res.status(err.status).json(err.body());
    const e = err as { type?: string; status?: number; message?: string };
    if (e?.type === 'entity.parse.failed' || e?.type === 'entity.too.large' || (typeof e?.status === 'number' && e.status < 500)) {
      return void res.status(400).json(new FakeError(400, 'invalid_request_error', 'The request body could not be read.').body());
    }
    res.status(500).json(new FakeError(500, 'api_error', `The fake failed: ${e?.message ?? String(err)}`).body());
  });
  return app;
}

function url(p: Params, name: string): string | null;
function url(p: Params, name: string, required: true): string;
function url(p: Params, name: string, required = false): string | null {
  const v = required ? str(p, name, true) : str(p, name);
  if (v === null) return null;
  // The placeholder is allowed in the URL, as the processor allows it.
  if (!URL.canParse(v.replace('{CHECKOUT_SESSION_ID}', 'x')) || !/^https?:\/\//.test(v)) throw invalid(name, `Not a valid URL: ${name}.`);
  return v;
}

function lineItems(p: Params): LineItemInput[] {
  const raw = p.line_items;
  const list = Array.isArray(raw) ? raw : raw && typeof raw === 'object' ? Object.values(raw) : [];
  if (list.length === 0) throw invalid('line_items', 'line_items is required in payment mode.');
  const items = list.map((entry, i) => {
    const li = (entry ?? {}) as Params;
    const at = `line_items[${i}]`;
    if (li.price !== undefined) throw invalid(`${at}[price]`, 'The fake takes price_data only, not saved prices.');
    const pd = obj(li, 'price_data');
    if (!pd) throw invalid(`${at}[price_data]`, `Missing required param: ${at}[price_data].`);
    const product = obj(pd, 'product_data');
    if (!product) throw invalid(`${at}[price_data][product_data]`, `Missing required param: ${at}[price_data][product_data].`);
    const quantity = int(li, 'quantity', true);
    if (quantity < 1 || quantity > 999) throw invalid(`${at}[quantity]`, 'quantity must be between 1 and 999.');
    return { currency: currency(pd), unitAmount: amount(pd, 'unit_amount', true), quantity, name: str(product, 'name', true), description: str(product, 'description') };
  });
  if (new Set(items.map((i) => i.currency)).size > 1) throw invalid('line_items', 'All line items must use the same currency.');
  return items;
}

/** A list page, newest first: `limit` (1–100, default 10), `starting_after` / `ending_before`. */
function page<T extends { id: string }>(rows: T[], p: Params, url: string) {
  const limit = int(p, 'limit') ?? 10;
  if (limit < 1 || limit > 100) throw invalid('limit', 'limit must be between 1 and 100.');
  const after = str(p, 'starting_after');
  const before = str(p, 'ending_before');
  let from = 0;
  let to = rows.length;
  if (after) {
    const i = rows.findIndex((r) => r.id === after);
    if (i < 0) throw invalid('starting_after', `No such object: '${after}'`);
    from = i + 1;
  }
  if (before) {
    const i = rows.findIndex((r) => r.id === before);
    if (i < 0) throw invalid('ending_before', `No such object: '${before}'`);
    to = i;
    from = Math.max(from, to - limit);
  }
  const data = rows.slice(from, Math.min(to, from + limit));
  const hasMore = before ? from > 0 : from + limit < to;
  return { object: 'list', data, has_more: hasMore, url };
}

/** Replaces an id with its object along each dotted path (`data.` walks into a list's items). */
function expandObject(state: FakeState, body: object, paths: string[]): unknown {
  const out = structuredClone(body) as Record<string, unknown>;
  for (const path of paths) walk(state, out, path.split('.'), path);
  return out;
}

function walk(state: FakeState, node: Record<string, unknown>, parts: string[], path: string): void {
  const [head, ...rest] = parts;
  if (!head) return;
  if (head === 'data' && Array.isArray(node.data)) {
    for (const item of node.data) walk(state, item as Record<string, unknown>, rest, path);
    return;
  }
  if (!(head in node)) throw invalid('expand', `This property cannot be expanded (${path}).`);
  let value = node[head];
  if (typeof value === 'string') {
    const found = lookup(state, value);
    if (!found) throw invalid('expand', `This property cannot be expanded (${path}).`);
    value = node[head] = structuredClone(found);
  }
  if (rest.length && value && typeof value === 'object') walk(state, value as Record<string, unknown>, rest, path);
}

function lookup(state: FakeState, id: string): object | undefined {
  if (id.startsWith(PREFIX.customer)) return state.customers.get(id);
  if (id.startsWith(PREFIX.checkoutSession)) return state.sessions.get(id);
  if (id.startsWith(PREFIX.paymentIntent)) return state.paymentIntents.get(id);
  if (id.startsWith(PREFIX.charge)) return state.charges.get(id);
  if (id.startsWith(PREFIX.refund)) return state.refunds.get(id);
  if (id.startsWith(PREFIX.balanceTransaction)) return state.balanceTransactions.has(id) ? state.balanceTransaction(id) : undefined;
  if (id.startsWith(PREFIX.payout)) return state.payouts.get(id);
  if (id.startsWith(PREFIX.event)) return state.events.get(id);
  return undefined;
}

/** JSON with sorted keys: the same parameters fingerprint the same whatever their order. */
function canonical(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`;
  if (v && typeof v === 'object') {
    return `{${Object.keys(v)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(v ?? null);
}

function cardFormProblem(card: string, expiry: unknown, cvc: unknown): string | null {
  if (!/^[\d\s-]{12,23}$/.test(card)) return 'Enter the card number: 16 digits, spaces allowed.';
  const m = typeof expiry === 'string' ? /^\s*(\d{2})\s*\/\s*(\d{2})\s*$/.exec(expiry) : null;
  if (!m || Number(m[1]) < 1 || Number(m[1]) > 12) return 'Enter the expiry date as MM/YY, for example 12/34.';
  const now = new Date();
  const year = 2000 + Number(m[2]);
  if (year < now.getUTCFullYear() || (year === now.getUTCFullYear() && Number(m[1]) < now.getUTCMonth() + 1)) return 'That expiry date has passed; use a future one.';
  if (typeof cvc !== 'string' || !/^\d{3,4}$/.test(cvc.trim())) return 'Enter the security code: three or four digits.';
  return null;
}
