import { PHOTO_LIMITS } from '@wingstage/shared';

type PictureType = (typeof PHOTO_LIMITS.acceptedTypes)[number];

/**
 * Reads a file's first bytes to tell a JPEG, PNG or WebP picture from anything else. The browser's
 * own label comes from the file name, so a text file renamed .jpg would pass a check on `type`.
 * The server checks the content again; this only saves a pointless upload.
 */
export async function sniffPictureType(file: Blob): Promise<PictureType | null> {
  const b = new Uint8Array(await file.slice(0, 12).arrayBuffer());
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return 'image/jpeg';
  const png = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  if (b.length >= 8 && png.every((v, i) => b[i] === v)) return 'image/png';
  const ascii = (from: number, to: number) => String.fromCharCode(...b.slice(from, to));
  if (b.length >= 12 && ascii(0, 4) === 'RIFF' && ascii(8, 12) === 'WEBP') return 'image/webp';
  return null;
}

/** Sizes for people: kB under a megabyte, else to a tenth of a megabyte; `up` rounds up so a file just over a limit never reads as the limit. */
export function formatFileSize(bytes: number, up = false): string {
  if (bytes < 1024 * 1024) return `${Math.max(1, Math.ceil(bytes / 1024))} kB`;
  const tenths = (bytes / (1024 * 1024)) * 10;
  return `${(up ? Math.ceil(tenths) : Math.round(tenths)) / 10} MB`;
}

const MAX_MB = formatFileSize(PHOTO_LIMITS.maxBytes);

export interface PhotoCheck {
  accepted: File[];
  /** One plain sentence per file left out, naming the file. */
  refused: string[];
}

/**
 * Sorts freshly chosen files into those that may be attached and those that may not, with the
 * reason for each. `room` is how many more photos fit (the per-upload and per-finding limits).
 */
export async function checkPhotoFiles(files: readonly File[], room: number): Promise<PhotoCheck> {
  const accepted: File[] = [];
  const refused: string[] = [];
  const overLimit: string[] = [];
  for (const file of files) {
    if (file.size > PHOTO_LIMITS.maxBytes) {
      refused.push(`${file.name} is ${formatFileSize(file.size, true)}; a photo can be at most ${MAX_MB}.`);
      continue;
    }
    if ((await sniffPictureType(file)) === null) {
      refused.push(`${file.name} is not a JPEG, PNG or WebP picture, so it cannot be attached.`);
      continue;
    }
    if (accepted.length >= room) {
      overLimit.push(file.name);
      continue;
    }
    accepted.push(file);
  }
  if (overLimit.length > 0) {
    refused.push(`${overLimit.join(', ')} left out: ${roomSentence(room)}`);
  }
  return { accepted, refused };
}

/** Why no more photos fit, in the limits' own numbers. */
export function roomSentence(room: number): string {
  const limits = `at most ${PHOTO_LIMITS.maxFilesPerUpload} are sent at once and a finding holds ${PHOTO_LIMITS.maxPerFinding}`;
  return room <= 0 ? `no more photos fit here (${limits}).` : `only ${room} more photo${room === 1 ? '' : 's'} fit here (${limits}).`;
}

/** How many more photos one upload to a finding that already holds `existing` may carry. */
export function photoRoom(existing: number, chosen: number): number {
  return Math.max(0, Math.min(PHOTO_LIMITS.maxFilesPerUpload, PHOTO_LIMITS.maxPerFinding - existing) - chosen);
}
