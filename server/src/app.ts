import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import compression from 'compression';
import cookieParser from 'cookie-parser';
import helmet, { type HelmetOptions } from 'helmet';
import { pinoHttp } from 'pino-http';
import type { Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import type { Config } from './config/config.js';
import { apiNotFound, errorHandler } from './errors/error-handler.js';
import type { MailQueue } from './mail/mail-queue.js';
import { aircraftRoutes } from './routes/aircraft.routes.js';
import { authRoutes } from './routes/auth.routes.js';
import { customersRoutes } from './routes/customers.routes.js';
import { jobsRoutes } from './routes/jobs.routes.js';
import { usersRoutes } from './routes/users.routes.js';
import { partsRoutes, suppliersRoutes } from './routes/catalogue.routes.js';
import { templatesRoutes } from './routes/templates.routes.js';
import { creditNotesRoutes, invoicesRoutes, jobInvoiceRoutes } from './routes/invoices.routes.js';
import { jobWorkRoutes } from './routes/job-work.routes.js';
import { workshopRoutes } from './routes/workshop.routes.js';
import { approvalRequestRoutes, decideRoutes, jobApprovalRoutes } from './routes/approvals.routes.js';
import type { Deps } from './services/deps.js';
import { createRateLimits } from './lib/rate-limits.js';
import type { PhotoStore } from './storage/index.js';
import { webhooksRoutes } from './routes/webhooks.routes.js';
import { documentsRoutes } from './routes/documents.routes.js';
import { decideDepositRoutes, depositRoutes, jobPaymentRoutes } from './routes/payments.routes.js';
import { decidePhotoRoutes, findingPhotoRoutes, photoRoutes } from './routes/photos.routes.js';
import { decidePage } from './routes/decide-page.routes.js';
import { accountsRoutes } from './routes/accounts.routes.js';

export interface AppParts {
  config: Config;
  logger: Logger;
  sequelize: Sequelize;
  mail: MailQueue;
  /** Where finding photos are kept (local folder or an S3-compatible bucket). */
  photos: PhotoStore;
  /** Password checks and hashes, in worker threads off the request thread. */
  passwords: import('./lib/passwords.js').PasswordHasher;
  /** The reminder and expiry schedule, when this process runs it. */
  chaser?: import('./jobs/approval-chaser.js').ApprovalChaser;
  /** The hourly payout fetch, when this process runs it. */
  payouts?: import('./jobs/payout-fetch.js').PayoutFetcher;
}

const REQUEST_ID = /^[A-Za-z0-9._-]{8,64}$/;

/**
 * CSP hashes ('sha256-…') of the inline scripts in the built pages: decide.html asks for its data
 * with one before its module scripts load, and the policy allows exactly that script, nothing else.
 */
export function inlineScriptHashes(files: string[]): string[] {
  const hashes = new Set<string>();
  for (const file of files) {
    if (!fs.existsSync(file)) continue;
    const html = fs.readFileSync(file, 'utf8');
    for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)) {
      if (/\bsrc\s*=/i.test(m[1]!) || !m[2]!.trim()) continue;
      hashes.add(`'sha256-${createHash('sha256').update(m[2]!, 'utf8').digest('base64')}'`);
    }
  }
  return [...hashes];
}

/** Helmet's settings for every response: the policy allows our own files and the pages' hashed inline scripts. */
export function helmetOptions(config: Config): HelmetOptions {
  return {
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'", ...inlineScriptHashes([path.join(config.CLIENT_DIST, 'decide.html'), path.join(config.CLIENT_DIST, 'index.html')])],
        // React's style={} props become inline style attributes.
        styleSrc: ["'self'", "'unsafe-inline'"],
        fontSrc: ["'self'", 'data:'],
        imgSrc: ["'self'", 'data:', 'blob:'],
        connectSrc: ["'self'"],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
        // Only where the app is served over https: the local demo runs production code on plain http.
        ...(config.APP_URL.startsWith('https:') ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    hsts: config.APP_URL.startsWith('https:'),
  };
}

/**
 * Helmet's headers, worked out once by helmet itself and set on every response. None of ours depends
 * on the request (no nonce, no function in the policy), so each response gets the same values; the
 * difference is that helmet runs its twelve middlewares one after another on every request, and this
 * sets the same list in one step. `server/test/hot-read-headers.test.ts` holds the two byte for byte.
 */
export function securityHeaders(config: Config): express.RequestHandler {
  const set: [string, string][] = [];
  const removed: string[] = [];
  const recorder = {
    setHeader: (name: string, value: string) => void set.push([name, String(value)]),
    removeHeader: (name: string) => void removed.push(name),
  };
  let failed: unknown = null;
  helmet(helmetOptions(config))({} as express.Request, recorder as unknown as express.Response, (err?: unknown) => {
    failed = err ?? null;
  });
  if (failed) throw failed instanceof Error ? failed : new Error(String(failed));
  return (_req, res, next) => {
    for (const name of removed) res.removeHeader(name);
    for (const [name, value] of set) res.setHeader(name, value);
    next();
  };
}

export function createApp(parts: AppParts): Express {
  const { config, logger, sequelize } = parts;
  const deps: Deps = { config, mail: parts.mail, logger, photos: parts.photos };
  // Counted in PostgreSQL, so every app process on the database shares each limit.
  const limits = createRateLimits(sequelize, config);
  const app = express();
  app.disable('x-powered-by');
  app.set('query parser', 'extended');
  // Local only: the app listens on 127.0.0.1 behind nothing. Behind a proxy, set this to its hop count.
  app.set('trust proxy', false);
  // No ETag on bodies sent with res.send/res.json: every one of them is sent with
  // `Cache-Control: no-store` (the API, the decision page's first view), so no browser ever comes
  // back with If-None-Match, and the SHA-1 of each body (and the copy it needs) was pure cost on
  // every answer. Static files keep theirs (express.static makes its own), and so does the app shell
  // (see `page` below).
  app.set('etag', false);

  app.use(
    pinoHttp({
      logger: logger as unknown as import('pino').Logger<'error' | 'warn' | 'info'>,
      genReqId: (req, res) => {
        const incoming = req.headers['x-request-id'];
        const id = typeof incoming === 'string' && REQUEST_ID.test(incoming) ? incoming : randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
      serializers: {
        // Invitation links carry their token in the path; it must not reach the logs.
        req: (r: { id: unknown; method: string; url: string }) => ({ id: r.id, method: r.method, url: r.url.replace(/(\/invitations\/|\/decide\/)[A-Za-z0-9_-]{20,}/, '$1[hidden]') }),
        res: (r: { statusCode: number }) => ({ statusCode: r.statusCode }),
      },
      autoLogging: { ignore: (req) => req.url === '/api/health' },
    }),
  );
  app.use(securityHeaders(config));
  // The processor signs the exact bytes it sent: its webhook reads the raw body, before any JSON parser.
  app.use('/api/webhooks', webhooksRoutes(deps));

  // JSON and the client's files travel compressed (gzip/deflate as the browser asks). API answers
  // are made per request, so they take zlib's fastest level (a 200-line estimate still shrinks about
  // eightfold, at a fraction of the default level's CPU); the client's files are content-hashed and
  // cached for a year, so they take the smallest. Bodies under 1 KB are not worth the CPU.
  const isApi = (req: express.Request) => req.path === '/api' || req.path.startsWith('/api/');
  // One middleware picks the level: each compression() wraps the response's write/end on every
  // request it sees, so two in a row cost every request twice.
  const compressApi = compression({ threshold: 1024, level: 1 });
  const compressFiles = compression({ threshold: 1024, level: 9 });
  app.use((req, res, next) => (isApi(req) ? compressApi : compressFiles)(req, res, next));
  // An estimate may carry up to 2000 lines (shared schema), about 1 MB of JSON; every other body stays small.
  app.put('/api/jobs/:id/estimate', express.json({ limit: '1mb' }));
  app.use(express.json({ limit: '200kb' }));
  app.use(cookieParser());
  app.use('/api', (_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });

  app.get('/api/health', async (req, res) => {
    try {
      await sequelize.query('SELECT 1', { raw: true });
      res.json({ status: 'ok', app: 'ok', database: 'ok' });
    } catch (err) {
      req.log.error({ err }, 'health check: database unreachable');
      res.status(503).json({ status: 'degraded', app: 'ok', database: 'unreachable' });
    }
  });
  app.use('/api/auth', authRoutes(deps, { limits, passwords: parts.passwords }));
  app.use('/api/users', usersRoutes(deps));
  app.use('/api/workshop', workshopRoutes(deps));
  app.use('/api/customers', customersRoutes(deps));
  app.use('/api/aircraft', aircraftRoutes(deps));
  app.use('/api/jobs', jobsRoutes(deps));
  app.use('/api/jobs', jobWorkRoutes(deps));
  app.use('/api/jobs', jobApprovalRoutes(deps));
  app.use('/api/jobs', findingPhotoRoutes(deps));
  app.use('/api/jobs', jobPaymentRoutes(deps));
  app.use('/api/deposits', depositRoutes(deps));
  app.use('/api/photos', photoRoutes(deps));
  app.use('/api/approval-requests', approvalRequestRoutes(deps));
  app.use('/api/decide', decideRoutes(deps, limits));
  app.use('/api/decide', decidePhotoRoutes(deps, limits));
  app.use('/api/decide', decideDepositRoutes(deps, limits));
  app.use('/api/suppliers', suppliersRoutes(deps));
  app.use('/api/parts', partsRoutes(deps));
  app.use('/api/templates', templatesRoutes(deps));
  app.use('/api', documentsRoutes(deps));
  app.use('/api/accounts', accountsRoutes(deps));
  app.use('/api/jobs', jobInvoiceRoutes(deps));
  app.use('/api/invoices', invoicesRoutes(deps));
  app.use('/api/credit-notes', creditNotesRoutes(deps));
  app.use('/api', apiNotFound);

  const indexHtml = path.join(config.CLIENT_DIST, 'index.html');
  // The owner's decision page has its own light entry; a build without one falls back to the app.
  const decideHtml = fs.existsSync(path.join(config.CLIENT_DIST, 'decide.html')) ? path.join(config.CLIENT_DIST, 'decide.html') : indexHtml;
  if (fs.existsSync(indexHtml)) {
    // Vite names built assets by content hash, so they may be cached for good; the pages may not.
    app.use('/assets', express.static(path.join(config.CLIENT_DIST, 'assets'), { immutable: true, maxAge: '365d', fallthrough: false }));
    app.use(express.static(config.CLIENT_DIST, { index: false, maxAge: '1h' }));
    // The app shell is revalidated on every visit (no-cache), so it keeps its ETag, the same weak tag
    // of size and modification time express.static gives files: with the app's ETags off, sendFile
    // makes none itself, but it still answers 304 to a matching If-None-Match.
    const page = (file: string) => (_req: express.Request, res: express.Response, next: express.NextFunction) => {
      fs.stat(file, (err, stat) => {
        if (err) return next(err);
        res.setHeader('Cache-Control', 'no-cache');
        res.setHeader('ETag', `W/"${stat.size.toString(16)}-${stat.mtime.getTime().toString(16)}"`);
        res.sendFile(file);
      });
    };
    // The e-mailed link, /decide/<token>, opens the decision page on its own, its first view
    // rendered on the server when the build has the renderer (routes/decide-page.routes.ts).
    app.get('/decide/{*splat}', decideHtml === indexHtml ? page(indexHtml) : decidePage({ dist: config.CLIENT_DIST, htmlFile: decideHtml, limiter: limits.decideAddress, logger }));
    // Client-side routes: any other GET, the root included, gets the app shell.
    app.get('/{*splat}', page(indexHtml));
  } else {
    logger.warn({ dir: config.CLIENT_DIST }, 'no built client found; serving the API only');
  }

  app.use(errorHandler);
  return app;
}
