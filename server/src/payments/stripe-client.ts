import Stripe from 'stripe';
import type { Config } from '../config/config.js';

/**
 * The one place the SDK client is made. With STRIPE_API_URL set it talks to that address (the local
 * fake in development and tests); without it, to Stripe's own API over https with the SDK's defaults.
 */
type StripeSettings = Pick<Config, 'STRIPE_SECRET_KEY' | 'NODE_ENV' | 'stripeApi'>;

const clients = new WeakMap<StripeSettings, Stripe>();

/** The client for these settings, made once (it keeps its own connection pool). */
export function stripeClient(config: StripeSettings): Stripe {
  let client = clients.get(config);
  if (!client) {
    client = createStripeClient(config);
    clients.set(config, client);
  }
  return client;
}

export function createStripeClient(config: StripeSettings): Stripe {
  const api = config.stripeApi;
  return new Stripe(config.STRIPE_SECRET_KEY, {
    ...(api ? { host: api.host, port: api.port, protocol: api.protocol } : {}),
    // Tests want one attempt and a clear failure; elsewhere the SDK's own retries (with its
    // idempotency keys) ride out a dropped connection.
    maxNetworkRetries: config.NODE_ENV === 'test' ? 0 : 2,
    timeout: 20_000,
    telemetry: false,
    appInfo: { name: 'Wingstage' },
  });
}
