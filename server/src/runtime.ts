import type { Config } from './config/config.js';
import { createSequelize } from './db/sequelize.js';
import { createLogger } from './lib/logger.js';
import { MailQueue } from './mail/mail-queue.js';
import { initModels, releaseModels } from './models/index.js';
import { PasswordHasher, defaultPasswordThreads } from './lib/passwords.js';
import { closeDocumentRenderer } from './documents/renderer.js';
import type { AppParts } from './app.js';
import { ApprovalChaser } from './jobs/approval-chaser.js';
import { PayoutFetcher } from './jobs/payout-fetch.js';
import { startReceiptTasks } from './jobs/payment-receipts.js';
import { createPhotoStore } from './storage/index.js';

/** Connects the database, binds the models and starts the mail queue and its worker. */
export async function startParts(config: Config): Promise<AppParts> {
  const logger = createLogger(config);
  const sequelize = createSequelize(config.DATABASE_URL, logger);
  await sequelize.authenticate();
  initModels(sequelize);
  const photos = createPhotoStore(config);
  const mail = new MailQueue(config, sequelize, logger.child({ part: 'mail' }), { queue: config.MAIL_QUEUE });
  await mail.start();
  await startReceiptTasks({ mail, logger: logger.child({ part: 'receipts' }) });
  const passwords = new PasswordHasher({ threads: config.PASSWORD_THREADS ?? defaultPasswordThreads(), queue: config.PASSWORD_QUEUE });
  let chaser: ApprovalChaser | undefined;
  if (config.APPROVAL_CHASER) {
    chaser = new ApprovalChaser(config, { config, mail, logger, photos }, logger.child({ part: 'approvals' }));
    await chaser.start();
  }
  const payouts = config.PAYOUT_SCHEDULE ? new PayoutFetcher(config, logger.child({ part: 'payouts' })) : undefined;
  await payouts?.start();
  return { config, logger, sequelize, mail, photos, chaser, passwords, payouts };
}

export async function stopParts(parts: AppParts): Promise<void> {
  await parts.chaser?.stop();
  await parts.payouts?.stop();
  await parts.mail.stop();
  await parts.passwords.close();
  await closeDocumentRenderer();
  await parts.sequelize.close();
  releaseModels(parts.sequelize);
}
