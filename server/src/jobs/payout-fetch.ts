import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Config } from '../config/config.js';
import { syncPayouts } from '../accounts/payouts.js';
import { scanExceptions } from '../accounts/exceptions.js';
import { Workshop } from '../models/index.js';
import { stripeClient } from '../payments/stripe-client.js';
import { bossSetUp } from '../lib/boss-setup.js';

export const PAYOUT_QUEUE = 'payout-fetch';

/**
 * Every hour, one process at a time, fetches payouts and their balance transactions through the
 * SDK (the same idempotent store as the `payout.paid` webhook, which usually gets there first), then
 * looks for new exceptions in every workshop.
 */
export class PayoutFetcher {
  private boss: PgBoss;
  private started = false;

  constructor(
    private readonly config: Config,
    private readonly logger: Logger,
  ) {
    this.boss = new PgBoss({ connectionString: config.DATABASE_URL, schema: 'pgboss', max: 2, application_name: 'wingstage-payouts' });
    this.boss.on('error', (err) => this.logger.error({ err }, 'payout schedule error'));
  }

  async start(): Promise<void> {
    if (this.started) return;
    await this.boss.start();
    await bossSetUp(() => this.boss.createQueue(PAYOUT_QUEUE, { name: PAYOUT_QUEUE, policy: 'singleton', retryLimit: 2, expireInMinutes: 15 }));
    await bossSetUp(() => this.boss.schedule(PAYOUT_QUEUE, '7 * * * *', {}, { tz: 'UTC' }));
    await this.boss.work(PAYOUT_QUEUE, { pollingIntervalSeconds: 30 }, async () => {
      const done = await syncPayouts(stripeClient(this.config));
      let raised = 0;
      for (const w of await Workshop.findAll({ attributes: ['id'] })) raised += await scanExceptions(w.id);
      this.logger.info({ ...done, raised }, 'payouts fetched');
    });
    this.started = true;
  }

  async stop(): Promise<void> {
    if (!this.started) return;
    this.started = false;
    await this.boss.stop({ graceful: true, wait: true, timeout: 5_000 });
  }
}
