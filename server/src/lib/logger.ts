import { pino, type Logger } from 'pino';
import type { Config } from '../config/config.js';

export function createLogger(config: Pick<Config, 'LOG_LEVEL' | 'NODE_ENV'>): Logger {
  return pino({
    level: config.LOG_LEVEL,
    base: { app: 'wingstage' },
    // Never let a password, token or cookie reach a log line.
    redact: {
      paths: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]', '*.password', '*.confirmPassword', '*.token'],
      censor: '[hidden]',
    },
  });
}
