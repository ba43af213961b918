import nodemailer, { type Transporter } from 'nodemailer';
import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Sequelize, Transaction } from 'sequelize';
import type { Config } from '../config/config.js';
import { bossSetUp } from '../lib/boss-setup.js';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html: string;
  /** Files sent with it (a document's PDF), as base64 so the queued message stays JSON. */
  attachments?: { filename: string; contentType: string; contentBase64: string }[];
}

export const MAIL_QUEUE = 'mail-send';

type PgConnection = { query(text: string, values: unknown[]): Promise<{ rows: unknown[] }> };

/**
 * Outgoing mail goes through a pg-boss queue in the app's own database, so a mail-server outage
 * delays a message instead of losing it. A message queued inside a transaction is committed with
 * the rows that caused it (an invitation and its e-mail appear together or not at all).
 */
export class MailQueue {
  private boss: PgBoss;
  private transport: Transporter;
  private started = false;

  constructor(
    private readonly config: Pick<Config, 'DATABASE_URL' | 'SMTP_HOST' | 'SMTP_PORT' | 'MAIL_FROM' | 'MAIL_WORKER'>,
    private readonly sequelize: Sequelize,
    private readonly logger: Logger,
    private readonly options: { queue?: string; retryDelaySeconds?: number; retryLimit?: number } = {},
  ) {
    this.boss = new PgBoss({
      connectionString: config.DATABASE_URL,
      schema: 'pgboss',
      max: 3,
      application_name: 'wingstage-mail',
      // Queued mail holds live links in plain text; once sent, clear it out within minutes, not days.
      archiveCompletedAfterSeconds: 60,
      deleteAfterSeconds: 300,
    });
    this.boss.on('error', (err) => this.logger.error({ err }, 'mail queue error'));
    this.transport = nodemailer.createTransport({
      host: config.SMTP_HOST,
      port: config.SMTP_PORT,
      secure: false,
      // Local maildev speaks plain SMTP; a real relay would be configured with TLS here.
      ignoreTLS: true,
      connectionTimeout: 10_000,
    });
  }

  private get queue() {
    return this.options.queue ?? MAIL_QUEUE;
  }

  /** Back-off doubles from the first delay; ten tries at 15 s span several hours of outage. */
  private get retry() {
    return { retryLimit: this.options.retryLimit ?? 10, retryDelay: this.options.retryDelaySeconds ?? 15, retryBackoff: true };
  }

  async start(): Promise<void> {
    if (this.started) return;
    await this.boss.start();
    await this.createQueue(this.queue);
    if (this.config.MAIL_WORKER) {
      // One message per fetch: a failure retries only that message, never re-sends others.
      await this.boss.work<MailMessage>(this.queue, { pollingIntervalSeconds: 1, batchSize: 1 }, async (jobs) => {
        for (const job of jobs) {
          await this.deliver(job.data);
          this.logger.info({ to: job.data.to, subject: job.data.subject }, 'mail sent');
        }
      });
    }
    this.started = true;
  }

  /** Creating a queue is DDL in pg-boss: retried when processes starting together deadlock on it (lib/boss-setup.ts). */
  private async createQueue(name: string): Promise<void> {
    await bossSetUp(() => this.boss.createQueue(name, { name, ...this.retry, expireInMinutes: 5 }));
  }

  /** The queue's view of one message: created, retry, active, completed or failed. */
  async status(id: string): Promise<{ state: string; retryCount: number } | null> {
    const job = await this.boss.getJobById(this.queue, id);
    return job ? { state: job.state, retryCount: job.retryCount } : null;
  }

  async stop(): Promise<void> {
    if (!this.started) return;
    this.started = false;
    await this.boss.stop({ graceful: true, wait: true, timeout: 5_000 });
    this.transport.close();
  }

  /** Deliver now, bypassing the queue; the worker uses it, and so can a health check. */
  async deliver(msg: MailMessage): Promise<void> {
    await this.transport.sendMail({
      from: this.config.MAIL_FROM,
      to: msg.to,
      subject: msg.subject,
      text: msg.text,
      html: msg.html,
      attachments: msg.attachments?.map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.contentBase64, 'base64') })),
    });
  }

  async enqueue(msg: MailMessage, transaction?: Transaction): Promise<string | null> {
    if (!this.started) throw new Error('The mail queue is not started.');
    return this.boss.send(this.queue, msg, { ...this.retry, db: onConnection(transaction) });
  }

  /**
   * Work that ends in an e-mail but is too slow for the transaction that causes it (rendering a
   * PDF): a task queued in that transaction, on a queue named after the mail queue, so it commits
   * with the rows and each test server's worker sees only its own tasks.
   */
  taskQueue(task: string): string {
    return `${this.queue}-${task}`;
  }

  async enqueueTask(task: string, data: object, transaction?: Transaction): Promise<string | null> {
    if (!this.started) throw new Error('The mail queue is not started.');
    return this.boss.send(this.taskQueue(task), data, { ...this.retry, db: onConnection(transaction) });
  }

  /**
   * A task run on a schedule (cron, UTC): pg-boss queues one job per tick whatever the number of
   * processes, and the queue holds at most one waiting, so a slow run never piles up behind itself.
   */
  async scheduleTask(task: string, cron: string): Promise<void> {
    if (!this.started) throw new Error('The mail queue is not started.');
    const name = this.taskQueue(task);
    await bossSetUp(() => this.boss.createQueue(name, { name, policy: 'singleton', retryLimit: 1, expireInMinutes: 10 }));
    await bossSetUp(() => this.boss.schedule(name, cron, {}, { tz: 'UTC' }));
  }

  /** Runs a task's worker in this process (when it runs the mail worker); the handler must be idempotent. */
  async workTask<T extends object>(task: string, handler: (data: T) => Promise<void>): Promise<void> {
    if (!this.started) throw new Error('The mail queue is not started.');
    const name = this.taskQueue(task);
    await this.createQueue(name);
    if (!this.config.MAIL_WORKER) return;
    await this.boss.work<T>(name, { pollingIntervalSeconds: 1, batchSize: 1 }, async (jobs) => {
      for (const job of jobs) await handler(job.data);
    });
  }
}

/** pg-boss runs its insert on the transaction's own connection, so the job commits with it. */
function onConnection(transaction?: Transaction) {
  const conn = transaction ? (transaction as unknown as { connection?: PgConnection }).connection : undefined;
  if (transaction && !conn) throw new Error('The transaction has no connection yet.');
  return conn ? { executeSql: (text: string, values: unknown[]) => conn.query(text, values) } : undefined;
}
