import { Router, type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { PHOTO_LIMITS, ROLES, idSchema, photoParamsSchema, photoQuerySchema } from '@wingstage/shared';
import { AppError } from '../errors/app-error.js';
import { invalidDecideLink, wellFormedToken } from '../middleware/decide-link.js';
import { failedLookupsPerAddress, type RateLimits } from '../lib/rate-limits.js';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validParams, validQuery, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as photos from '../services/photos.service.js';

const findingParams = z.object({ id: idSchema, findingId: idSchema });
const photoIdParams = z.object({ photoId: idSchema });

/** Multer's refusals in our own words and error shape; the upload is then dropped whole. */
function uploadError(err: unknown): AppError | unknown {
  if (!(err instanceof multer.MulterError)) return err;
  const e = err as multer.MulterError & { filename?: string };
  switch (e.code) {
    case 'LIMIT_FILE_SIZE':
      return new AppError(
        'too_large',
        413,
        `${photos.fileLabel(e.filename)} is larger than ${photos.megabytes(PHOTO_LIMITS.maxBytes)}, the most one photo may be. Nothing from this upload was kept; send a smaller photo (most phones can share a smaller size).`,
        { photos: `${photos.fileLabel(e.filename)} is over ${photos.megabytes(PHOTO_LIMITS.maxBytes)}.` },
      );
    case 'LIMIT_FILE_COUNT':
    case 'LIMIT_UNEXPECTED_FILE':
      if (e.code === 'LIMIT_UNEXPECTED_FILE' && e.field !== 'photos') break;
      return new AppError('validation_failed', 400, `Send at most ${PHOTO_LIMITS.maxFilesPerUpload} photos at a time. Nothing from this upload was kept.`, {
        photos: `At most ${PHOTO_LIMITS.maxFilesPerUpload} photos at a time.`,
      });
  }
  return new AppError('validation_failed', 400, 'The upload could not be read: send the pictures as multipart form data in the field "photos".', {
    photos: 'Send the pictures in the field "photos".',
  });
}

/** Mounted under /api/jobs: adding and removing a finding's photos. */
export function findingPhotoRoutes(deps: Deps): Router {
  const router = Router();
  const hands = authorize(deps.config, 'admin', 'manager', 'engineer');
  // In memory: each file is re-encoded before anything is stored, and the limits cap what one request holds.
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: PHOTO_LIMITS.maxBytes, files: PHOTO_LIMITS.maxFilesPerUpload, fields: 10, fieldSize: 10_000, parts: PHOTO_LIMITS.maxFilesPerUpload + 10 },
  }).array('photos', PHOTO_LIMITS.maxFilesPerUpload);
  // Runs after authorize, so the CSRF check and the role check come before a byte of the body is read.
  const receive: RequestHandler = (req: Request, res: Response, next: NextFunction) => {
    if (!req.is('multipart/form-data')) {
      next(new AppError('validation_failed', 400, 'Send the pictures as multipart form data in the field "photos".', { photos: 'Choose at least one photo.' }));
      return;
    }
    upload(req, res, (err?: unknown) => next(err ? uploadError(err) : undefined));
  };

  router.post('/:id/findings/:findingId/photos', hands, validate({ params: findingParams }), receive, async (req, res) => {
    const p = validParams(req, findingParams);
    const files = ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({ originalname: f.originalname, buffer: f.buffer }));
    res.status(201).json(await photos.addPhotos(deps, scopeOf(req), p.id, p.findingId, files));
  });
  router.delete('/:id/findings/:findingId/photos/:photoId', hands, validate({ params: photoParamsSchema }), async (req, res) => {
    const p = validParams(req, photoParamsSchema);
    await photos.removePhoto(scopeOf(req), p.id, p.findingId, p.photoId);
    res.status(204).end();
  });
  return router;
}

function send(res: Response, file: photos.PhotoFile): void {
  res.setHeader('Content-Type', 'image/jpeg');
  res.setHeader('Content-Length', String(file.bytes));
  // Private: a shared cache must never hand one owner's photo to another.
  res.setHeader('Cache-Control', 'private, max-age=3600');
  res.setHeader('X-Content-Type-Options', 'nosniff');
  if (Buffer.isBuffer(file.body)) {
    res.end(file.body);
    return;
  }
  file.body.on('error', (err) => {
    res.log?.error({ err }, 'reading a stored photo failed');
    res.destroy(err);
  });
  file.body.pipe(res);
}

/** Mounted under /api/photos: a photo for a signed-in user. */
export function photoRoutes(deps: Deps): Router {
  const router = Router();
  router.get('/:photoId', authorize(deps.config, ...ROLES), validate({ params: photoIdParams, query: photoQuerySchema }), async (req, res) => {
    const q = validQuery(req, photoQuerySchema);
    send(res, await photos.photoFile(deps, scopeOf(req), validParams(req, photoIdParams).photoId, q.size));
  });
  return router;
}

/**
 * Mounted under /api/decide: a photo on the owner's decision page, reached by the link alone. The
 * token is checked as the page's own route checks it, and failed look-ups are rate-limited per
 * address at the same limit; pictures that load fine do not count, so a page full of photos never
 * uses up the owner's attempts.
 */
export function decidePhotoRoutes(deps: Deps, limits: RateLimits): Router {
  const router = Router();
  const lookups = failedLookupsPerAddress(limits.decideAddress);
  router.get('/:token/photos/:photoId', lookups.check, async (req, res) => {
    if (!wellFormedToken(req.params.token)) throw invalidDecideLink();
    const id = idSchema.safeParse(req.params.photoId);
    if (!id.success) throw new AppError('not_found', 404, 'That photo was not found.');
    const q = photoQuerySchema.parse(req.query);
    send(res, await photos.decidePhotoFile(deps, String(req.params.token), id.data, q.size));
  });
  router.use(lookups.countFailure);
  return router;
}
