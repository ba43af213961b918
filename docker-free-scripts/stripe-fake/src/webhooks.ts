import { createHmac } from 'node:crypto';
import type Stripe from 'stripe';
import { newId, PREFIX } from './ids.js';

/** `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<raw body>">`, as the processor signs. */
export function signatureHeader(payload: string, secret: string, timestamp: number): string {
  const v1 = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${v1}`;
}

export interface DeliveryAttempt {
  id: string;
  eventId: string;
  eventType: string;
  attempt: number;
  url: string;
  /** Unix ms when the attempt started. */
  at: number;
  /** The app's HTTP status, or null when it could not be reached. */
  status: number | null;
  error: string | null;
  ok: boolean;
  durationMs: number;
}

export interface DelivererOptions {
  url: string | null;
  secret: string | null;
  /** Waits before the 2nd, 3rd, … attempt; its length + 1 is the most attempts an event gets. */
  retryDelaysMs: number[];
  timeoutMs: number;
}

/**
 * Posts each event to the app, signed, and retries a non-2xx or an unreachable app after the given
 * waits. Every attempt is recorded. Events are sent one at a time in the order they happened, as a
 * single endpoint usually sees them; a retry goes back into the line after its wait.
 */
export class WebhookDeliverer {
  readonly attempts: DeliveryAttempt[] = [];
  private chain: Promise<void> = Promise.resolve();
  private pending = 0;
  private waiters: (() => void)[] = [];
  private timers = new Set<NodeJS.Timeout>();
  private stopped = false;

  constructor(private opts: DelivererOptions) {}

  get enabled(): boolean {
    return Boolean(this.opts.url && this.opts.secret);
  }

  send(event: Stripe.Event, attempt = 1): void {
    if (!this.enabled || this.stopped) return;
    this.pending += 1;
    this.chain = this.chain.then(() => this.attempt(event, attempt)).catch(() => undefined);
  }

  private async attempt(event: Stripe.Event, attempt: number): Promise<void> {
    const url = this.opts.url!;
    const payload = JSON.stringify(event, null, 2);
    const started = Date.now();
    const record: DeliveryAttempt = { id: newId(PREFIX.delivery), eventId: event.id, eventType: event.type, attempt, url, at: started, status: null, error: null, ok: false, durationMs: 0 };
    try {
      // Signed with the wall clock, not the fake's (advanced) clock: the app checks freshness against its own.
      const header = signatureHeader(payload, this.opts.secret!, Math.floor(Date.now() / 1000));
      const res = await fetch(url, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json; charset=utf-8', 'Stripe-Signature': header, 'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)' },
        body: payload,
        signal: AbortSignal.timeout(this.opts.timeoutMs),
      });
      await res.arrayBuffer().catch(() => undefined);
      record.status = res.status;
      record.ok = res.status >= 200 && res.status < 300;
    } catch (err) {
      record.error = err instanceof Error ? err.message : String(err);
    }
    record.durationMs = Date.now() - started;
    this.attempts.push(record);
    const wait = this.opts.retryDelaysMs[attempt - 1];
    if (!record.ok && wait !== undefined && !this.stopped) {
      this.pending += 1;
      const timer = setTimeout(() => {
        this.timers.delete(timer);
        this.pending -= 1;
        this.send(event, attempt + 1);
      }, wait);
      this.timers.add(timer);
    }
    this.pending -= 1;
    this.wake();
  }

  private wake() {
    if (this.pending > 0) return;
    for (const w of this.waiters.splice(0)) w();
  }

  /** Resolves when no delivery is running or waiting for a retry. */
  idle(): Promise<void> {
    if (this.pending === 0) return Promise.resolve();
    return new Promise((resolve) => this.waiters.push(resolve));
  }

  reset(): void {
    for (const t of this.timers) clearTimeout(t);
    this.pending -= this.timers.size;
    this.timers.clear();
    this.attempts.length = 0;
    this.wake();
  }

  stop(): void {
    this.stopped = true;
    this.reset();
  }
}
