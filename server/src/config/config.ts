import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

const bool = z
  .enum(['true', 'false', '1', '0'], { message: 'Use true or false.' })
  .transform((v) => v === 'true' || v === '1');

/**
 * Where finding photos are kept. The local driver needs a folder; any S3-compatible store needs at
 * least a bucket, a region and both keys (checked below, with a message per missing setting).
 */
const storageShape = {
  STORAGE_DRIVER: z.enum(['local', 's3'], { message: 'STORAGE_DRIVER must be local or s3.' }).default('local'),
  /** Local driver: the folder photos are written under (created if missing); defaults to .local/uploads-<profile>. */
  STORAGE_DIR: z.string().min(1),
  S3_BUCKET: z.string().min(1).optional(),
  S3_REGION: z.string().min(1).optional(),
  /** Only for stores other than AWS itself (MinIO, a test server, …): their base URL. */
  S3_ENDPOINT: z.url({ message: 'S3_ENDPOINT must be an absolute URL such as http://127.0.0.1:9000.' }).optional(),
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  S3_FORCE_PATH_STYLE: bool.optional(),
};

type StorageFields = { STORAGE_DRIVER: 'local' | 's3'; S3_BUCKET?: string; S3_REGION?: string; S3_ACCESS_KEY_ID?: string; S3_SECRET_ACCESS_KEY?: string };

function checkStorage(c: StorageFields, ctx: z.RefinementCtx): void {
  if (c.STORAGE_DRIVER !== 's3') return;
  const needed: [keyof StorageFields, string][] = [
    ['S3_BUCKET', 'S3_BUCKET is required when STORAGE_DRIVER=s3: the bucket photos are kept in.'],
    ['S3_REGION', 'S3_REGION is required when STORAGE_DRIVER=s3 (any value, such as us-east-1, for a store that ignores regions).'],
    ['S3_ACCESS_KEY_ID', 'S3_ACCESS_KEY_ID is required when STORAGE_DRIVER=s3.'],
    ['S3_SECRET_ACCESS_KEY', 'S3_SECRET_ACCESS_KEY is required when STORAGE_DRIVER=s3.'],
  ];
  for (const [key, message] of needed) if (!c[key]) ctx.addIssue({ code: 'custom', path: [key], message });
}

/** The default photo folder follows the scripts' profile (lib.sh exports WS_PROFILE and WS_LOCAL_DIR), so dev and test never share one. */
function defaultStorageDir(env: Record<string, string | undefined>): string {
  const profile = env.WS_PROFILE || (env.NODE_ENV === 'test' ? 'test' : 'dev');
  const localDir = env.WS_LOCAL_DIR || path.join(repoRoot, '.local');
  return path.join(localDir, `uploads-${profile.replace(/[^A-Za-z0-9_-]/g, '_')}`);
}

/** http://127.0.0.1:…, http://localhost:…, http://[::1]:…: reachable from this machine only. */
export function isLoopbackHttp(url: string): boolean {
  try {
    const u = new URL(url);
    return u.protocol === 'http:' && (u.hostname === 'localhost' || u.hostname === '[::1]' || /^127(\.\d{1,3}){3}$/.test(u.hostname));
  } catch {
    return false;
  }
}

/**
 * Card payments. The secret key and the webhook signing secret come from the environment (never
 * from the repository); STRIPE_API_URL points the SDK elsewhere than the processor's own API — the
 * local fake in development and tests. Production refuses a plain-http API address.
 */
const stripeShape = {
  STRIPE_SECRET_KEY: z
    .string({ message: 'STRIPE_SECRET_KEY is required: the secret key (sk_test_… or sk_live_…) the server calls Stripe with.' })
    .regex(/^(sk|rk)_(test|live)_[A-Za-z0-9_]{8,}$/, { message: 'STRIPE_SECRET_KEY must be a Stripe secret key: sk_test_… or sk_live_… (or a restricted rk_… key).' }),
  STRIPE_WEBHOOK_SECRET: z
    .string({ message: 'STRIPE_WEBHOOK_SECRET is required: the signing secret (whsec_…) of the webhook endpoint.' })
    .regex(/^whsec_[A-Za-z0-9_+/=-]{8,}$/, { message: 'STRIPE_WEBHOOK_SECRET must be a webhook signing secret: whsec_ followed by at least 8 characters.' }),
  /** Empty: Stripe's own API (https://api.stripe.com). */
  STRIPE_API_URL: z.url({ protocol: /^https?$/, message: 'STRIPE_API_URL must be an http(s) URL such as http://127.0.0.1:12111.' }).optional(),
};

/**
 * Production refuses a plain-http API address. The one exception is the local demo (npm start runs
 * production code): a test key (sk_test_…) talking to the Stripe fake on this machine's loopback
 * address, where nothing crosses a network and no live key is ever sent.
 */
function checkStripe(c: { NODE_ENV: string; STRIPE_API_URL?: string; STRIPE_SECRET_KEY: string }, ctx: z.RefinementCtx): void {
  if (c.NODE_ENV !== 'production' || !c.STRIPE_API_URL || new URL(c.STRIPE_API_URL).protocol === 'https:') return;
  if (isLoopbackHttp(c.STRIPE_API_URL) && c.STRIPE_SECRET_KEY.startsWith('sk_test_')) return;
  ctx.addIssue({
    code: 'custom',
    path: ['STRIPE_API_URL'],
    message: 'STRIPE_API_URL must use https in production: card payment calls never travel over plain http (only a test key may reach a local fake on a loopback address).',
  });
}

/** Where the SDK sends its calls: null means Stripe's own API with the SDK's defaults. */
export interface StripeApi {
  host: string;
  port: number;
  protocol: 'http' | 'https';
}

function stripeApi(url: string | undefined): StripeApi | null {
  if (!url) return null;
  const u = new URL(url);
  const protocol = u.protocol === 'https:' ? 'https' : 'http';
  return { host: u.hostname, port: u.port ? Number(u.port) : protocol === 'https' ? 443 : 80, protocol };
}

const configSchema = z
  .object({
    ...storageShape,
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
    /** Failed look-ups (unknown links) per address per 15 minutes on the owner's decision links. */
    DECIDE_ADDRESS_LIMIT: z.coerce.number().int().min(1).max(100000).default(120),
    /**
     * Prefix of this deployment's rate-limit counters in the database. Every app process of one
     * deployment must use the same one (they then share each limit); tests give each server its own.
     */
    RATE_LIMIT_NAMESPACE: z.string().regex(/^[A-Za-z0-9_.-]{1,40}$/, { message: 'RATE_LIMIT_NAMESPACE: 1–40 letters, digits, dots, dashes or underscores.' }).default('wingstage'),
    /**
     * Megabytes of estimate answers each app process keeps (GET /api/jobs/:id/estimate), checked
     * against PostgreSQL on every request; 0 reads and prices the estimate on every request.
     */
    ESTIMATE_ANSWERS_MB: z.coerce.number().min(0).max(4096).default(32),
    /** Worker threads that check and hash passwords (default: one fewer than the machine's cores, at least one). */
    PASSWORD_THREADS: z.coerce.number().int().min(1).max(64).optional(),
    /** Passwords that may wait for a worker thread; a sign-in past that is answered 503 with Retry-After. */
    PASSWORD_QUEUE: z.coerce.number().int().min(0).max(10000).default(16),
    /** Runs the reminder and expiry schedule; off unless asked for in tests. */
    APPROVAL_CHASER: bool.default(true),
    /** Runs the hourly payout fetch; off in tests unless asked for. */
    PAYOUT_SCHEDULE: bool.optional(),
    /** Off in unit-style tests that do not need mail delivery; on everywhere else. */
    MAIL_WORKER: bool.default(true),
    /**
     * The pg-boss queue outgoing mail goes through. Every process of one deployment uses the same;
     * each API test server takes its own, so no test's worker can hold another test's message.
     */
    MAIL_QUEUE: z.string().regex(/^[a-z0-9-]{1,60}$/, { message: 'MAIL_QUEUE: 1–60 lower-case letters, digits or dashes.' }).default('mail-send'),
    ...stripeShape,
  })
  .transform((c) => ({ ...c, COOKIE_SECURE: c.COOKIE_SECURE ?? c.NODE_ENV === 'production', PAYOUT_SCHEDULE: c.PAYOUT_SCHEDULE ?? c.NODE_ENV !== 'test', stripeApi: stripeApi(c.STRIPE_API_URL) }))
  .superRefine((c, ctx) => {
    // ASVS 4.0.3 V2.2.1: at most 100 failed attempts per account per hour, so at most 25 per 15 minutes.
    // Test runs may raise it (many journeys sign in as the same person); production may not.
    if (c.NODE_ENV === 'production' && c.SIGNIN_ACCOUNT_LIMIT > 25) {
      ctx.addIssue({ code: 'custom', path: ['SIGNIN_ACCOUNT_LIMIT'], message: 'SIGNIN_ACCOUNT_LIMIT above 25 per 15 minutes allows over 100 failures an hour (ASVS 4.0.3 V2.2.1).' });
    }
    // The one exception is the local demo (npm start): production code served over plain http on
    // this machine's loopback address, where a Secure cookie would never be sent back.
    if (c.NODE_ENV === 'production' && !c.COOKIE_SECURE && !isLoopbackHttp(c.APP_URL)) {
      ctx.addIssue({ code: 'custom', path: ['COOKIE_SECURE'], message: 'COOKIE_SECURE=false is refused in production unless APP_URL is plain http on a loopback address (the local demo): session cookies must be Secure.' });
    }
    checkStorage(c, ctx);
    checkStripe(c, ctx);
  });

const storageSchema = z.object(storageShape).superRefine(checkStorage);

export type Config = z.output<typeof configSchema>;
/** The storage settings alone: what the photo store needs (scripts such as the seeder read only these). */
export type StorageConfig = Pick<Config, keyof typeof storageShape>;
export type ConfigInput = z.input<typeof configSchema>;

export class ConfigError extends Error {}

function pick(keys: string[], env: Record<string, string | undefined>): Record<string, string> {
  const picked: Record<string, string> = {};
  for (const key of keys) {
    const v = env[key];
    if (v !== undefined && v !== '') picked[key] = v;
  }
  picked.STORAGE_DIR ??= defaultStorageDir(env);
  return picked;
}

function failed(error: z.ZodError): ConfigError {
  const lines = error.issues.map((i) => `  ${i.path.join('.') || '(config)'}: ${i.message}`);
  return new ConfigError(`Wingstage cannot start, the configuration is invalid:\n${lines.join('\n')}`);
}

/** Parse once at start-up; a bad value stops the process with every problem listed. */
export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const result = configSchema.safeParse(pick(Object.keys(configSchema.in.shape), env));
  if (!result.success) throw failed(result.error);
  return result.data;
}

/** Only the storage settings, for scripts that do not need the whole app's configuration. */
export function loadStorageConfig(env: Record<string, string | undefined> = process.env): StorageConfig {
  const result = storageSchema.safeParse(pick(Object.keys(storageShape), env));
  if (!result.success) throw failed(result.error);
  return result.data;
}

export { repoRoot };
