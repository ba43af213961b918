import { z } from 'zod';
import { idSchema } from './common.js';

/**
 * Limits on finding photos. A phone camera's JPEG is 2–8 MB; 15 MB leaves room without letting a
 * single request hold a worker for long. Every upload is re-encoded by the server (which drops EXIF,
 * including location), so what is stored is never what was sent.
 */
export const PHOTO_LIMITS = {
  /** Largest file accepted, in bytes (15 MiB). */
  maxBytes: 15 * 1024 * 1024,
  /** Files in one upload request. */
  maxFilesPerUpload: 6,
  /** Photos one finding may hold (removed ones do not count). */
  maxPerFinding: 12,
  /** What the browser may send; the server checks the content itself, not this label. */
  acceptedTypes: ['image/jpeg', 'image/png', 'image/webp'] as const,
  /** Long edge of the stored picture and of its thumbnail, in pixels. */
  fullEdge: 2048,
  thumbEdge: 480,
} as const;

export const PHOTO_SIZES = ['full', 'thumb'] as const;
export type PhotoSize = (typeof PHOTO_SIZES)[number];

export const photoQuerySchema = z.object({
  size: z.enum(PHOTO_SIZES, { message: 'size is full or thumb.' }).optional().default('full'),
});

export const photoParamsSchema = z.object({ id: idSchema, findingId: idSchema, photoId: idSchema });

/** One stored photo of a finding, as staff and the job's owner see it. */
export interface FindingPhotoDto {
  id: string;
  findingId: string;
  /** Pixel size of the stored (re-encoded) picture and of its thumbnail. */
  width: number;
  height: number;
  thumbWidth: number;
  thumbHeight: number;
  /** Bytes of the stored full-size picture. */
  bytes: number;
  uploadedByName: string;
  uploadedAt: string;
}

/** A photo as frozen in an approval request's snapshot: enough to lay the page out before it loads. */
export interface SnapshotPhoto {
  id: string;
  width: number;
  height: number;
}

/** Where the browser fetches a photo: signed-in users by id, the owner's decision page by its link. */
export function photoUrl(photoId: string, size: PhotoSize = 'full'): string {
  return `/api/photos/${encodeURIComponent(photoId)}?size=${size}`;
}
export function decidePhotoUrl(token: string, photoId: string, size: PhotoSize = 'full'): string {
  return `/api/decide/${encodeURIComponent(token)}/photos/${encodeURIComponent(photoId)}?size=${size}`;
}
