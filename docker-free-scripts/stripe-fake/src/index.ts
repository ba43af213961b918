import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import type Stripe from 'stripe';
import { FakeState, type FakeOptions } from './fake.js';
import { createFakeApp } from './http.js';
import type { DeliveryAttempt } from './webhooks.js';

export { API_VERSION, FakeState, type FakeOptions } from './fake.js';
export { cardFee, UK_STANDARD_CARD_FEE, type FeeSchedule } from './fees.js';
export { signatureHeader, type DeliveryAttempt } from './webhooks.js';
export { TEST_CARDS, TEST_PAYMENT_METHODS } from './cards.js';
export { formatMinor } from './page.js';

export interface StartOptions extends FakeOptions {
  /** 0 picks a free port (tests). */
  port: number;
  host?: string;
}

export interface RunningFake {
  url: string;
  host: string;
  port: number;
  state: FakeState;
  /** Options for `new Stripe(key, …)` that point the SDK at this fake. */
  sdkOptions: { host: string; port: number; protocol: 'http'; maxNetworkRetries: 0; telemetry: false };
  /** Resolves when no webhook delivery is running or waiting to retry. */
  idle(): Promise<void>;
  deliveries(eventId?: string): DeliveryAttempt[];
  event(id: string): Stripe.Event;
  stop(): Promise<void>;
}

/** Starts the fake in this process (tests use port 0) and on loopback only. */
export async function startStripeFake(opts: StartOptions): Promise<RunningFake> {
  const state = new FakeState(opts);
  const host = opts.host ?? '127.0.0.1';
  const app = createFakeApp(state);
  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(opts.port, host, (err?: Error) => (err ? reject(err) : resolve(s)));
    s.once('error', reject);
  });
  const { port } = server.address() as AddressInfo;
  const url = `http://${host}:${port}`;
  state.payBaseUrl = url;
  return {
    url,
    host,
    port,
    state,
    sdkOptions: { host, port, protocol: 'http', maxNetworkRetries: 0, telemetry: false },
    idle: () => state.deliverer.idle(),
    deliveries: (eventId) => state.deliverer.attempts.filter((a) => !eventId || a.eventId === eventId),
    event: (id) => state.event(id),
    stop: async () => {
      state.deliverer.stop();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
