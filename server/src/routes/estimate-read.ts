import { createHash } from 'node:crypto';
import { promisify } from 'node:util';
import zlib from 'node:zlib';
import type { Request, RequestHandler, Response } from 'express';
import { LRUCache } from 'lru-cache';
import { idParamsSchema, type Role } from '@wingstage/shared';
import { notFound } from '../errors/app-error.js';
import { acceptSession, tokenClaims } from '../middleware/authorize.js';
import type { Config } from '../config/config.js';
import { estimateAnswerKey, readEstimateKey, readEstimateSignedIn } from '../services/estimates.service.js';

const gzip = promisify(zlib.gzip);
const brotli = promisify(zlib.brotliCompress);

/** One answer as sent: the JSON's bytes, and each compressed form once a client has asked for it. */
interface StoredAnswer {
  key: string;
  /** The ETag's base: a digest of the key, so the tag does not show the database's revision numbers. */
  tag: string;
  identity: Buffer;
  gzip?: Buffer;
  br?: Buffer;
}

type Encoding = 'br' | 'gzip' | 'identity' | 'other';

/*
 * The same bytes the compression middleware (app.ts) would send for an API answer: gzip at level 1,
 * brotli at compression's default quality (4).
 */
const GZIP = { level: 1 };
const BROTLI = { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 4 } };
/** What a stored answer costs beside its bytes (key, object, list entry), roughly. */
const OVERHEAD = 512;

/**
 * The estimate answers this app instance has made, by job and audience, each with the key it was
 * made for. Bounded by bytes (every stored encoding counts); the least recently read goes first.
 * Nothing here is ever sent without the request's own key read from PostgreSQL matching it.
 */
export class EstimateAnswers {
  private readonly lru: LRUCache<string, StoredAnswer>;
  /** Answers being made right now, by key: twenty reads after a write make it once. */
  private readonly making = new Map<string, Promise<StoredAnswer | null>>();

  constructor(readonly maxBytes: number) {
    this.lru = new LRUCache<string, StoredAnswer>({
      maxSize: maxBytes,
      sizeCalculation: (a) => OVERHEAD + a.identity.length + (a.gzip?.length ?? 0) + (a.br?.length ?? 0),
    });
  }

  /** Bytes held now (never above maxBytes). */
  get bytes(): number {
    return this.lru.calculatedSize;
  }

  get size(): number {
    return this.lru.size;
  }

  /** The answer made for exactly this key, if this instance holds it. */
  find(key: string): StoredAnswer | undefined {
    const got = this.lru.get(slotOf(key));
    return got?.key === key ? got : undefined;
  }

  /** Keeps an answer (replacing the job and audience's older one); a single answer over the bound is not kept. */
  keep(a: StoredAnswer): void {
    this.lru.set(slotOf(a.key), a);
  }

  /** The encoding asked for, made once and kept beside the answer. */
  async encoded(a: StoredAnswer, enc: 'br' | 'gzip'): Promise<Buffer> {
    const have = a[enc];
    if (have) return have;
    const made = enc === 'br' ? await brotli(a.identity, BROTLI) : await gzip(a.identity, GZIP);
    a[enc] = made;
    // Counted again with the new bytes, if the answer is still held (set() of the same object would
    // keep its old size).
    const slot = slotOf(a.key);
    if (this.lru.peek(slot) === a) {
      this.lru.delete(slot);
      this.lru.set(slot, a);
    }
    return made;
  }

  /**
   * Runs `make` once per key at a time: reads that arrive while the answer for their key is being
   * made wait for it (twenty reads after a write read the estimate once). A waiter takes the result
   * only if it was made for its own key; otherwise it makes its own.
   */
  async once(key: string, make: () => Promise<StoredAnswer | null>): Promise<StoredAnswer | null> {
    const running = this.making.get(key);
    if (running) {
      const shared = await running.catch(() => null);
      return shared?.key === key ? shared : make();
    }
    const p = make();
    this.making.set(key, p);
    try {
      return await p;
    } finally {
      if (this.making.get(key) === p) this.making.delete(key);
    }
  }
}

export function tagOf(key: string): string {
  return createHash('sha256').update(key).digest('base64url').slice(0, 24);
}

/** job id and audience: one answer per pair is kept, the newest made. */
function slotOf(key: string): string {
  return key.split('.', 2).join('.');
}

/**
 * What compression would choose for this Accept-Encoding: the highest q among br, gzip and
 * identity, br before gzip before identity on a tie; 'other' when the client prefers something
 * else (deflate), which the compression middleware then makes from the plain bytes.
 */
export function encodingFor(header: string | undefined): Encoding {
  if (!header) return 'identity';
  const q = new Map<string, number>();
  for (const part of header.split(',')) {
    const [name, ...params] = part.trim().toLowerCase().split(';');
    if (!name) continue;
    const qp = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
    const value = qp ? Number(qp.slice(2)) : 1;
    q.set(name, Number.isFinite(value) ? value : 0);
  }
  const star = q.get('*');
  const of = (name: string) => q.get(name) ?? star ?? (name === 'identity' ? 0.001 : 0);
  const br = of('br');
  const gz = of('gzip');
  const id = of('identity');
  const deflate = of('deflate');
  const best = Math.max(br, gz, id, deflate);
  if (best <= 0) return 'identity';
  if (br === best) return 'br';
  if (gz === best) return 'gzip';
  if (id === best) return 'identity';
  return 'other';
}

/**
 * Sends a stored answer as the client takes it: Content-Type, Content-Encoding, Content-Length,
 * Vary, a strong ETag per encoding, and Cache-Control `private, no-cache` (the browser may keep it,
 * but asks again every time; 304 when its copy is the current one). The compression middleware
 * leaves a response that already has a Content-Encoding alone.
 */
async function send(req: Request, res: Response, answers: EstimateAnswers, a: StoredAnswer): Promise<void> {
  const enc = encodingFor(req.headers['accept-encoding']);
  res.vary('Accept-Encoding');
  res.setHeader('Cache-Control', 'private, no-cache');
  res.setHeader('Content-Type', 'application/json; charset=utf-8');
  // 'other': compression makes the bytes, so the tag only says the content is the same.
  res.setHeader('ETag', enc === 'other' ? `W/"${a.tag}"` : `"${a.tag}.${enc}"`);
  if (req.fresh) {
    res.status(304).end();
    return;
  }
  const body = enc === 'br' || enc === 'gzip' ? await answers.encoded(a, enc) : a.identity;
  if (enc === 'br' || enc === 'gzip') res.setHeader('Content-Encoding', enc);
  res.setHeader('Content-Length', body.length);
  res.end(body);
}

/**
 * GET /api/jobs/:id/estimate with the answers kept: every request reads the key of the answer
 * (session row, job access, the estimate's and the workshop's revisions: one small prepared
 * statement) and sends the answer this instance made for that key, if it holds one. Otherwise it
 * reads the whole estimate in one statement (which returns its own key, from the same snapshot),
 * prices it, serialises it and keeps it. Because the key is read from PostgreSQL in every request
 * and the revisions are changed by triggers in every writing transaction, an answer is never sent
 * after a write it does not include, whichever process made the write.
 *
 * The session is accepted (401/403) before anything about the job is told; a job without an
 * estimate row yet, or a malformed id, falls through to the ordinary chain on the route.
 */
export function estimateRead(config: Config, roles: readonly Role[], answers: EstimateAnswers): RequestHandler {
  return async (req, res, next) => {
    const claims = tokenClaims(config, req);
    const parsed = idParamsSchema.safeParse(req.params);
    if (!parsed.success) return next();
    const jobId = parsed.data.id;
    const row = await readEstimateKey(claims, jobId);
    req.auth = acceptSession(claims, row, roles);
    if (!row?.j_id) throw notFound('That job');
    const key = estimateAnswerKey(row);
    if (!key) return next();
    // Not held: the whole estimate in one statement that returns its own key (same snapshot as the
    // lines), priced and serialised once, kept under that key.
    const make = async (): Promise<StoredAnswer | null> => {
      const got = await readEstimateSignedIn(claims, jobId);
      if (!got?.key) return null;
      acceptSession(claims, got.session, roles);
      const made: StoredAnswer = { key: got.key, tag: tagOf(got.key), identity: Buffer.from(JSON.stringify(got.answer())) };
      answers.keep(made);
      return made;
    };
    const stored = answers.find(key) ?? (await answers.once(key, make));
    // The estimate row went between the two statements: the ordinary path answers (and makes it).
    if (!stored) return next();
    await send(req, res, answers, stored);
  };
}
