import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Config } from '../config/config.js';
import { chaseUndecided } from './approval-reminders.js';
import type { Deps } from '../services/deps.js';
import { bossSetUp } from '../lib/boss-setup.js';

export const CHASE_QUEUE = 'approval-chase';

/**
 * Every 15 minutes, one process at a time (pg-boss keeps one job per schedule tick), reminds owners
 * of undecided requests and marks expired links. The work itself is chaseUndecided, callable with a clock.
 */
export class ApprovalChaser {
  private boss: PgBoss;
  private started = false;

  constructor(
    config: Pick<Config, 'DATABASE_URL'>,
    private readonly deps: Deps,
    private readonly logger: Logger,
  ) {
    this.boss = new PgBoss({ connectionString: config.DATABASE_URL, schema: 'pgboss', max: 2, application_name: 'wingstage-chase' });
    this.boss.on('error', (err) => this.logger.error({ err }, 'approval schedule error'));
  }

  async start(): Promise<void> {
    if (this.started) return;
    await this.boss.start();
    await bossSetUp(() => this.boss.createQueue(CHASE_QUEUE, { name: CHASE_QUEUE, policy: 'singleton', retryLimit: 1, expireInMinutes: 10 }));
    await bossSetUp(() => this.boss.schedule(CHASE_QUEUE, '*/15 * * * *', {}, { tz: 'UTC' }));
    await this.boss.work(CHASE_QUEUE, { pollingIntervalSeconds: 30 }, async () => {
      const done = await chaseUndecided(this.deps, new Date());
      this.logger.info(done, 'approval requests chased');
    });
    this.started = true;
  }

  async stop(): Promise<void> {
    if (!this.started) return;
    this.started = false;
    await this.boss.stop({ graceful: true, wait: true, timeout: 5_000 });
  }
}
