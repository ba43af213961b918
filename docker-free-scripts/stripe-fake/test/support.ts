import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { startStripeFake, type RunningFake, type StartOptions } from '../src/index.js';

export const KEY = 'sk_test_contract0123456789';
export const WEBHOOK_SECRET = 'whsec_contract_secret_0123456789';

/** A webhook endpoint that verifies each delivery with the SDK and can refuse the first N. */
export interface Receiver {
  url: string;
  received: { event: Stripe.Event; raw: string; header: string }[];
  refuseNext(n: number): void;
  close(): Promise<void>;
}

export async function startReceiver(secret = WEBHOOK_SECRET): Promise<Receiver> {
  const sdk = new Stripe(KEY);
  const received: Receiver['received'] = [];
  let refuse = 0;
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const raw = Buffer.concat(chunks).toString('utf8');
      const header = String(req.headers['stripe-signature'] ?? '');
      if (refuse > 0) {
        refuse -= 1;
        res.writeHead(503).end();
        return;
      }
      try {
        const event = sdk.webhooks.constructEvent(raw, header, secret);
        received.push({ event, raw, header });
        res.writeHead(200, { 'Content-Type': 'application/json' }).end('{"received":true}');
      } catch {
        res.writeHead(400).end();
      }
    });
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}/hook`,
    received,
    refuseNext: (n) => {
      refuse = n;
    },
    close: () => new Promise((r) => server.close(() => r())),
  };
}

export interface Rig {
  fake: RunningFake;
  stripe: Stripe;
  receiver: Receiver;
  close(): Promise<void>;
}

export async function startRig(over: Partial<StartOptions> = {}): Promise<Rig> {
  const receiver = await startReceiver();
  const fake = await startStripeFake({ apiKey: KEY, port: 0, webhookUrl: receiver.url, webhookSecret: WEBHOOK_SECRET, retryDelaysMs: [20, 40, 80], ...over });
  const stripe = new Stripe(KEY, fake.sdkOptions);
  return {
    fake,
    stripe,
    receiver,
    close: async () => {
      await fake.stop();
      await receiver.close();
    },
  };
}

export function sessionParams(unitAmount: number, over: Partial<Stripe.Checkout.SessionCreateParams> = {}): Stripe.Checkout.SessionCreateParams {
  return {
    mode: 'payment',
    success_url: 'http://127.0.0.1:9/jobs/J-1?paid={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://127.0.0.1:9/jobs/J-1',
    line_items: [{ quantity: 1, price_data: { currency: 'gbp', unit_amount: unitAmount, product_data: { name: 'Deposit: propeller overhaul ordered' } } }],
    metadata: { depositRequest: 'dr-1' },
    payment_intent_data: { metadata: { depositRequest: 'dr-1' } },
    ...over,
  };
}

/** The hosted page's form, posted as a browser would. */
export function payOnPage(url: string, card: string, extra: Record<string, string> = {}) {
  return fetch(url, {
    method: 'POST',
    body: new URLSearchParams({ card, expiry: '12/34', cvc: '123', action: 'pay', ...extra }),
    redirect: 'manual',
  });
}

export const SUCCESS_CARD = '4242 4242 4242 4242';
export const DECLINE_CARD = '4000 0000 0000 0002';
