import { createHash, randomUUID } from 'node:crypto';
import type { Readable } from 'node:stream';
import sharp from 'sharp';
import { Op, type Transaction } from 'sequelize';
import { PHOTO_LIMITS, type ApprovalSnapshot, type FindingPhotoDto, type PhotoSize, type SnapshotPhoto } from '@wingstage/shared';
import { AppError, conflict, notFound } from '../errors/app-error.js';
import { ApprovalRequest, Finding, FindingPhoto, User } from '../models/index.js';
import type { PhotoStore } from '../storage/index.js';
import { recordAudit } from './audit.js';
import type { Deps } from './deps.js';
import { inTransaction } from '../db/transaction.js';
import { findJob, type JobRow } from './job-access.js';
import { inWorkshop, requireStaff, type Scope } from './scope.js';

/** One uploaded file as the route hands it over (multer's memory storage). */
export interface UploadedFile {
  originalname: string;
  buffer: Buffer;
}

/** What the client sees of a file's name in a message: no paths, no control characters, not endless. */
export function fileLabel(name: string | undefined): string {
  const base = (name ?? '').split(/[\\/]/).pop() ?? '';
  // eslint-disable-next-line no-control-regex -- removing control characters is the point
  const clean = base.replace(/[\u0000-\u001f\u007f]/g, '').trim();
  if (!clean) return 'The file';
  return `“${clean.length > 80 ? `${clean.slice(0, 77)}…` : clean}”`;
}

export const megabytes = (bytes: number) => `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;

// ─── Re-encoding ─────────────────────────────────────────────────────────────

interface Encoded {
  full: Buffer;
  width: number;
  height: number;
  thumb: Buffer;
  thumbWidth: number;
  thumbHeight: number;
}

const ACCEPTED = new Set(['jpeg', 'png', 'webp']);

/**
 * Judges a file by its content, turns it upright from its EXIF orientation and writes a new JPEG at
 * most fullEdge px on the long edge, plus a thumbnail. sharp keeps no metadata unless asked to, so
 * camera location and serial numbers stay behind; colour is converted to sRGB on the way.
 */
export async function encodePhoto(file: UploadedFile): Promise<Encoded> {
  const label = fileLabel(file.originalname);
  const notAPicture = () => new AppError('unsupported_type', 415, `${label} is not a JPEG, PNG or WebP picture. Choose a photo taken with a camera or phone.`);
  let format: string | undefined;
  try {
    format = (await sharp(file.buffer).metadata()).format;
  } catch {
    throw notAPicture();
  }
  if (!format || !ACCEPTED.has(format)) throw notAPicture();
  try {
    // 'error' rather than the default 'warning': many phone JPEGs carry harmless warnings.
    const full = await sharp(file.buffer, { failOn: 'error' })
      .rotate()
      .resize({ width: PHOTO_LIMITS.fullEdge, height: PHOTO_LIMITS.fullEdge, fit: 'inside', withoutEnlargement: true })
      // A transparent PNG would otherwise turn black where it was clear.
      .flatten({ background: '#ffffff' })
      .jpeg({ quality: 82, mozjpeg: false })
      .toBuffer({ resolveWithObject: true });
    const thumb = await sharp(full.data)
      .resize({ width: PHOTO_LIMITS.thumbEdge, height: PHOTO_LIMITS.thumbEdge, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 78, mozjpeg: false })
      .toBuffer({ resolveWithObject: true });
    return { full: full.data, width: full.info.width, height: full.info.height, thumb: thumb.data, thumbWidth: thumb.info.width, thumbHeight: thumb.info.height };
  } catch {
    throw new AppError('validation_failed', 400, `${label} could not be read as a picture; it may be damaged or cut short. Try taking or exporting it again.`, {
      photos: `${label} could not be read.`,
    });
  }
}

// ─── DTOs ────────────────────────────────────────────────────────────────────

const uploaderInclude = [{ model: User, as: 'uploader', required: false, attributes: ['name'] }];

export function photoDto(p: FindingPhoto): FindingPhotoDto {
  return {
    id: p.id,
    findingId: p.findingId,
    width: p.width,
    height: p.height,
    thumbWidth: p.thumbWidth,
    thumbHeight: p.thumbHeight,
    bytes: p.bytes,
    uploadedByName: p.uploader?.name ?? '',
    uploadedAt: p.createdAt.toISOString(),
  };
}

/** The current photos of some findings of one job, oldest first, in one query; keyed by finding. */
export async function photosByFinding(scope: Scope, jobId: string, findingIds?: string[], t?: Transaction): Promise<Map<string, FindingPhotoDto[]>> {
  const where: Record<string, unknown> = { jobId, removedAt: null };
  if (findingIds) where.findingId = findingIds;
  const rows = await FindingPhoto.findAll({ where: inWorkshop(scope, where), include: uploaderInclude, order: [['createdAt', 'ASC'], ['id', 'ASC']], transaction: t });
  const map = new Map<string, FindingPhotoDto[]>();
  for (const p of rows) map.set(p.findingId, [...(map.get(p.findingId) ?? []), photoDto(p)]);
  return map;
}

/** What an approval snapshot freezes of each finding's photos: id and pixel size, oldest first. */
export async function snapshotPhotosOf(findingIds: string[], t?: Transaction): Promise<Map<string, SnapshotPhoto[]>> {
  const map = new Map<string, SnapshotPhoto[]>();
  if (!findingIds.length) return map;
  const rows = await FindingPhoto.findAll({
    where: { findingId: findingIds, removedAt: null },
    attributes: ['id', 'findingId', 'width', 'height'],
    order: [['createdAt', 'ASC'], ['id', 'ASC']],
    transaction: t,
  });
  for (const p of rows) map.set(p.findingId, [...(map.get(p.findingId) ?? []), { id: p.id, width: p.width, height: p.height }]);
  return map;
}

/** A snapshot stored before photos existed named them `photoIds` (always empty): read it as no photos. */
export function withPhotos(snapshot: ApprovalSnapshot): ApprovalSnapshot {
  if (snapshot.findings.every((f) => Array.isArray(f.photos))) return snapshot;
  return { ...snapshot, findings: snapshot.findings.map((f) => (Array.isArray(f.photos) ? f : { ...f, photos: [] })) };
}

// ─── Upload and removal ──────────────────────────────────────────────────────

function assertOpenForPhotos(job: JobRow, f: Finding): void {
  if (job.state === 'closed' || job.state === 'cancelled') throw conflict(`This job is ${job.state}; its photos can no longer be changed.`);
  if (f.state === 'withdrawn') throw conflict(`F-${f.seq} is withdrawn; photos can no longer be added to it.`);
}

async function loadFinding(scope: Scope, jobId: string, findingId: string, t?: Transaction, lock = false): Promise<{ job: JobRow; f: Finding }> {
  // Writing: the job row first, as every write to a job's records does (job-access.ts, lock order).
  const job = await findJob(scope, jobId, t, lock);
  const f = await Finding.findOne({ where: inWorkshop(scope, { jobId: job.id, id: findingId }), transaction: t, lock: lock && t ? t.LOCK.UPDATE : undefined });
  if (!f) throw notFound('That finding');
  return { job, f };
}

async function currentCount(findingId: string, t?: Transaction): Promise<number> {
  return FindingPhoto.count({ where: { findingId, removedAt: null }, transaction: t });
}

function tooMany(f: Finding, have: number, adding: number): AppError {
  const room = Math.max(PHOTO_LIMITS.maxPerFinding - have, 0);
  const message =
    room === 0
      ? `F-${f.seq} already has ${have} photos, the most a finding can hold (${PHOTO_LIMITS.maxPerFinding}). Remove one before adding another.`
      : `F-${f.seq} has ${have} of at most ${PHOTO_LIMITS.maxPerFinding} photos, so ${room} more can be added, not ${adding}.`;
  return new AppError('validation_failed', 400, message, { photos: message });
}

const keysOf = (workshopId: string, jobId: string, findingId: string, id: string) => {
  const base = `workshops/${workshopId}/jobs/${jobId}/findings/${findingId}/${id}`;
  return { storageKey: `${base}.jpg`, thumbKey: `${base}-thumb.jpg` };
};

async function removeStored(store: PhotoStore, keys: string[], deps: Deps): Promise<void> {
  for (const key of keys) {
    await store.delete(key).catch((err) => deps.logger.error({ err, key }, 'could not remove a stored photo after a failed upload'));
  }
}

/**
 * Adds photos to a finding. Every file is checked and re-encoded first; then all are stored; then
 * the rows and the history entry are written in one transaction. Any failure removes what was
 * stored, so a refused upload leaves nothing behind.
 */
export async function addPhotos(deps: Deps, scope: Scope, jobId: string, findingId: string, files: UploadedFile[]): Promise<FindingPhotoDto[]> {
  requireStaff(scope);
  if (!files.length) {
    throw new AppError('validation_failed', 400, 'Choose at least one photo to add.', { photos: 'Choose at least one photo.' });
  }
  // Cheap checks before the slow work, so a refused upload costs no re-encoding.
  const before = await loadFinding(scope, jobId, findingId);
  assertOpenForPhotos(before.job, before.f);
  const had = await currentCount(before.f.id);
  if (had + files.length > PHOTO_LIMITS.maxPerFinding) throw tooMany(before.f, had, files.length);

  const encoded: Encoded[] = [];
  for (const file of files) encoded.push(await encodePhoto(file));

  const rows = encoded.map((e) => {
    const id = randomUUID();
    return { id, e, ...keysOf(scope.workshopId, before.job.id, before.f.id, id) };
  });
  const stored: string[] = [];
  try {
    for (const r of rows) {
      await deps.photos.put(r.storageKey, r.e.full, 'image/jpeg');
      stored.push(r.storageKey);
      await deps.photos.put(r.thumbKey, r.e.thumb, 'image/jpeg');
      stored.push(r.thumbKey);
    }
    const ids = await inTransaction(async (t) => {
      // Again under a lock: another upload or a withdrawal may have landed meanwhile.
      const { job, f } = await loadFinding(scope, jobId, findingId, t, true);
      assertOpenForPhotos(job, f);
      const have = await currentCount(f.id, t);
      if (have + rows.length > PHOTO_LIMITS.maxPerFinding) throw tooMany(f, have, rows.length);
      const now = Date.now();
      for (const [i, r] of rows.entries()) {
        await FindingPhoto.create(
          {
            id: r.id,
            workshopId: scope.workshopId,
            jobId: job.id,
            findingId: f.id,
            storageKey: r.storageKey,
            thumbKey: r.thumbKey,
            width: r.e.width,
            height: r.e.height,
            thumbWidth: r.e.thumbWidth,
            thumbHeight: r.e.thumbHeight,
            bytes: r.e.full.length,
            uploadedBy: scope.userId,
            // A millisecond apart, so "oldest first" keeps the order they were chosen in.
            createdAt: new Date(now + i),
          },
          { transaction: t },
        );
      }
      await recordAudit(scope, t, {
        jobId: job.id,
        action: 'finding.photo_added',
        summary: rows.length === 1 ? `Photo added to F-${f.seq}` : `${rows.length} photos added to F-${f.seq}`,
        detail: { findingId: f.id, photoIds: rows.map((r) => r.id) },
      });
      return rows.map((r) => r.id);
    });
    const out = await FindingPhoto.findAll({ where: inWorkshop(scope, { id: ids }), include: uploaderInclude, order: [['createdAt', 'ASC'], ['id', 'ASC']] });
    return out.map(photoDto);
  } catch (err) {
    await removeStored(deps.photos, stored, deps);
    throw err;
  }
}

/**
 * Takes a photo off a finding. The files stay in the store: an approval request already sent may
 * show the photo to the owner, and what they saw must stay viewable.
 */
export async function removePhoto(scope: Scope, jobId: string, findingId: string, photoId: string): Promise<void> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const { job, f } = await loadFinding(scope, jobId, findingId, t, true);
    if (job.state === 'closed' || job.state === 'cancelled') throw conflict(`This job is ${job.state}; its photos can no longer be changed.`);
    const p = await FindingPhoto.findOne({ where: inWorkshop(scope, { id: photoId, jobId: job.id, findingId: f.id, removedAt: null }), transaction: t, lock: t.LOCK.UPDATE });
    if (!p) throw notFound('That photo');
    await p.update({ removedAt: new Date(), removedBy: scope.userId }, { transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'finding.photo_removed',
      summary: `Photo removed from F-${f.seq}`,
      detail: { findingId: f.id, photoId: p.id },
    });
  });
}

// ─── Serving ─────────────────────────────────────────────────────────────────

export interface PhotoFile {
  body: Readable | Buffer;
  bytes: number;
}

async function open(deps: Deps, p: FindingPhoto, size: PhotoSize): Promise<PhotoFile> {
  const key = size === 'thumb' ? p.thumbKey : p.storageKey;
  const obj = await deps.photos.get(key);
  if (!obj) {
    deps.logger.error({ photoId: p.id, key }, 'a photo row names a file the store does not have');
    throw notFound('That photo');
  }
  return { body: obj.body, bytes: obj.bytes };
}

/**
 * A photo for a signed-in user: staff of its workshop, or the job's owner once the finding is no
 * longer a draft (the same rule as the findings list). Anyone else, and a removed photo: 404.
 */
export async function photoFile(deps: Deps, scope: Scope, photoId: string, size: PhotoSize): Promise<PhotoFile> {
  const p = await FindingPhoto.findOne({ where: inWorkshop(scope, { id: photoId, removedAt: null }) });
  if (!p) throw notFound('That photo');
  if (scope.role === 'owner') {
    // The job through the owner's own aircraft (404 otherwise), then the finding's state.
    await findJob(scope, p.jobId).catch(() => {
      throw notFound('That photo');
    });
    const f = await Finding.findOne({ where: inWorkshop(scope, { id: p.findingId, jobId: p.jobId, state: { [Op.ne]: 'draft' } }), attributes: ['id'] });
    if (!f) throw notFound('That photo');
  }
  return open(deps, p, size);
}

const unknownLink = () => new AppError('not_found', 404, 'This approval link is not valid. Use the link in the newest e-mail from the workshop.');

/**
 * A photo for the owner's decision page, reached by the link alone. The link is looked up as the
 * page itself does (by the SHA-256 of the token); a revoked link shows nothing, and only photos the
 * request's snapshot names are served, removed ones included: they are what the owner was shown.
 */
export async function decidePhotoFile(deps: Deps, token: string, photoId: string, size: PhotoSize): Promise<PhotoFile> {
  const r = await ApprovalRequest.findOne({ where: { tokenHash: createHash('sha256').update(token, 'utf8').digest('hex') } });
  if (!r || r.state === 'revoked') throw unknownLink();
  const named = withPhotos(r.snapshot).findings.some((f) => f.photos.some((ph) => ph.id === photoId));
  if (!named) throw notFound('That photo');
  const p = await FindingPhoto.findOne({ where: { id: photoId, jobId: r.jobId, workshopId: r.workshopId } });
  if (!p) throw notFound('That photo');
  return open(deps, p, size);
}
