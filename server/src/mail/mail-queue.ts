import nodemailer, { type Transporter } from 'nodemailer';
import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Sequelize, Transaction } from 'sequelize';
import type { Config } from '../config/config.js';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html: string;
}

const QUEUE = 'mail-send';

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
  ) {
    this.boss = new PgBoss({ connectionString: config.DATABASE_URL, schema: 'pgboss', max: 3, application_name: 'wingstage-mail' });
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

  async start(): Promise<void> {
    if (this.started) return;
    await this.boss.start();
    await this.boss.createQueue(QUEUE, { name: QUEUE, retryLimit: 10, retryDelay: 15, retryBackoff: true, expireInMinutes: 5 });
    if (this.config.MAIL_WORKER) {
      await this.boss.work<MailMessage>(QUEUE, { pollingIntervalSeconds: 1, batchSize: 5 }, async (jobs) => {
        for (const job of jobs) {
          await this.deliver(job.data);
          this.logger.info({ to: job.data.to, subject: job.data.subject }, 'mail sent');
        }
      });
    }
    this.started = true;
  }

  async stop(): Promise<void> {
    if (!this.started) return;
    this.started = false;
    await this.boss.stop({ graceful: true, wait: true, timeout: 5_000 });
    this.transport.close();
  }

  /** Deliver now, bypassing the queue; the worker uses it, and so can a health check. */
  async deliver(msg: MailMessage): Promise<void> {
    await this.transport.sendMail({ from: this.config.MAIL_FROM, to: msg.to, subject: msg.subject, text: msg.text, html: msg.html });
  }

  async enqueue(msg: MailMessage, transaction?: Transaction): Promise<void> {
    if (!this.started) throw new Error('The mail queue is not started.');
    // pg-boss runs its insert on the transaction's own connection, so the job commits with it.
    const conn = transaction ? (transaction as unknown as { connection?: PgConnection }).connection : undefined;
    if (transaction && !conn) throw new Error('The transaction has no connection yet.');
    const db = conn ? { executeSql: (text: string, values: unknown[]) => conn.query(text, values) } : undefined;
    await this.boss.send(QUEUE, msg, { retryLimit: 10, retryDelay: 15, retryBackoff: true, db });
  }
}
