import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

const bool = z
  .enum(['true', 'false', '1', '0'], { message: 'Use true or false.' })
  .transform((v) => v === 'true' || v === '1');

const configSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
    HOST: z.string().min(1).default('127.0.0.1'),
    PORT: z.coerce.number().int().min(0).max(65535).default(3000),
    APP_URL: z.url({ message: 'APP_URL must be an absolute URL such as http://127.0.0.1:3000.' }).default('http://127.0.0.1:3000'),
    DATABASE_URL: z.string().regex(/^postgres(ql)?:\/\//, { message: 'DATABASE_URL must be a postgres:// URL.' }),
    JWT_SECRET: z.string({ message: 'JWT_SECRET is required.' }).min(32, { message: 'JWT_SECRET must be at least 32 characters.' }),
    SMTP_HOST: z.string().min(1).default('127.0.0.1'),
    SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(1025),
    MAIL_FROM: z.string().min(3).default('Wingstage <no-reply@wingstage.example>'),
    CLIENT_DIST: z.string().min(1).default(path.join(repoRoot, 'client', 'dist')),
    LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
    COOKIE_SECURE: bool.optional(),
    SIGNIN_ACCOUNT_LIMIT: z.coerce.number().int().min(1).max(100).default(10),
    SIGNIN_ADDRESS_LIMIT: z.coerce.number().int().min(1).max(100000).default(100),
    /** Requests per address per 15 minutes to the owner's decision links. */
    DECIDE_ADDRESS_LIMIT: z.coerce.number().int().min(1).max(100000).default(120),
    /** Runs the reminder and expiry schedule; off unless asked for in tests. */
    APPROVAL_CHASER: bool.default(true),
    /** Off in unit-style tests that do not need mail delivery; on everywhere else. */
    MAIL_WORKER: bool.default(true),
  })
  .transform((c) => ({ ...c, COOKIE_SECURE: c.COOKIE_SECURE ?? c.NODE_ENV === 'production' }))
  .superRefine((c, ctx) => {
    // ASVS 4.0.3 V2.2.1: at most 100 failed attempts per account per hour, so at most 25 per 15 minutes.
    // Test runs may raise it (many journeys sign in as the same person); production may not.
    if (c.NODE_ENV === 'production' && c.SIGNIN_ACCOUNT_LIMIT > 25) {
      ctx.addIssue({ code: 'custom', path: ['SIGNIN_ACCOUNT_LIMIT'], message: 'SIGNIN_ACCOUNT_LIMIT above 25 per 15 minutes allows over 100 failures an hour (ASVS 4.0.3 V2.2.1).' });
    }
    if (c.NODE_ENV === 'production' && !c.COOKIE_SECURE) {
      ctx.addIssue({ code: 'custom', path: ['COOKIE_SECURE'], message: 'COOKIE_SECURE=false is refused in production: session cookies must be Secure.' });
    }
  });

export type Config = z.output<typeof configSchema>;
export type ConfigInput = z.input<typeof configSchema>;

export class ConfigError extends Error {}

/** Parse once at start-up; a bad value stops the process with every problem listed. */
export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const picked: Record<string, string> = {};
  for (const key of Object.keys(configSchema.in.shape)) {
    const v = env[key];
    if (v !== undefined && v !== '') picked[key] = v;
  }
  const result = configSchema.safeParse(picked);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.') || '(config)'}: ${i.message}`);
    throw new ConfigError(`Wingstage cannot start, the configuration is invalid:\n${lines.join('\n')}`);
  }
  return result.data;
}

export { repoRoot };
