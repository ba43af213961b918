import type { StorageConfig } from '../config/config.js';
import { LocalPhotoStore } from './local-store.js';
import { S3PhotoStore } from './s3-store.js';
import type { PhotoStore } from './photo-store.js';

export type { PhotoStore, StoredObject } from './photo-store.js';
export { StorageKeyError, assertKey } from './photo-store.js';
export { LocalPhotoStore } from './local-store.js';
export { S3PhotoStore } from './s3-store.js';

/** The store the settings ask for (the config schema has already checked the s3 settings are all there). */
export function createPhotoStore(c: StorageConfig): PhotoStore {
  if (c.STORAGE_DRIVER === 's3') {
    return new S3PhotoStore({
      bucket: c.S3_BUCKET!,
      region: c.S3_REGION!,
      endpoint: c.S3_ENDPOINT,
      accessKeyId: c.S3_ACCESS_KEY_ID!,
      secretAccessKey: c.S3_SECRET_ACCESS_KEY!,
      forcePathStyle: c.S3_FORCE_PATH_STYLE,
    });
  }
  return new LocalPhotoStore(c.STORAGE_DIR);
}
