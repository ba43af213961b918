import type { Logger } from 'pino';
import type { Config } from '../config/config.js';
import type { MailQueue } from '../mail/mail-queue.js';
import type { PhotoStore } from '../storage/index.js';

/** What services need from the outside: settings, the mail queue, the photo store and a logger. */
export interface Deps {
  config: Config;
  mail: MailQueue;
  logger: Logger;
  photos: PhotoStore;
}
