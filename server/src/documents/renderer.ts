import { Piscina } from 'piscina';
import { AppError } from '../errors/app-error.js';
import type { AnyDocument } from './render.js';

/*
 * PDFs are rendered in one worker thread (render-worker.mjs): a 200-line invoice is seconds of CPU,
 * and on a two-core machine the thread that answers requests must keep its core. Documents queue
 * for that thread; past PDF_QUEUE waiting, a download is told to come back (503 + Retry-After)
 * instead of piling up. The thread starts on the first document and ends after a minute idle.
 */
const PDF_QUEUE = 40;

let pool: Piscina | null = null;

function thePool(): Piscina {
  pool ??= new Piscina({
    filename: new URL('./render-worker.mjs', import.meta.url).href,
    minThreads: 0,
    maxThreads: 1,
    maxQueue: PDF_QUEUE,
    idleTimeout: 60_000,
  });
  return pool;
}

const busy = () => new AppError('unavailable', 503, 'Documents are being prepared for others right now. Please try again in a few seconds.', undefined, 5);

export async function renderDocument(d: AnyDocument): Promise<Buffer> {
  try {
    const bytes = (await thePool().run(d)) as Uint8Array;
    return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  } catch (err) {
    if (err instanceof Error && /queue is at limit/i.test(err.message)) throw busy();
    throw err;
  }
}

/** Ends the worker thread (the app's shutdown and tests call it); the next document starts a new one. */
export async function closeDocumentRenderer(): Promise<void> {
  const p = pool;
  pool = null;
  if (p) await p.destroy();
}
