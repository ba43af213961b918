import { pino, type Logger, type LoggerOptions } from 'pino';
import type { Config } from '../config/config.js';

export function createLogger(config: Pick<Config, 'LOG_LEVEL' | 'NODE_ENV'>): Logger {
  const options: LoggerOptions = {
    level: config.LOG_LEVEL,
    base: { app: 'wingstage' },
    // Never let a password, token or cookie reach a log line.
    redact: {
      paths: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]', '*.password', '*.confirmPassword', '*.token'],
      censor: '[hidden]',
    },
  };
  if (config.NODE_ENV !== 'production') return pino(options);
  // In production the lines go to stdout through a buffer written in the background: one write per
  // few KB instead of a blocking write per request. Pino writes what is left when the process exits,
  // and a quiet server's last lines go out within a second. Tests and development keep pino's plain
  // synchronous stdout, so a line is there the moment it is logged.
  const destination = pino.destination({ dest: 1, sync: false, minLength: 4096 });
  setInterval(() => {
    try {
      destination.flush();
    } catch {
      // Closed at shutdown: nothing left to write.
    }
  }, 1000).unref();
  return pino(options, destination);
}
