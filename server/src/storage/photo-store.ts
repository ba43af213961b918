import type { Readable } from 'node:stream';

/** What a store hands back: the bytes (streamed where the driver can), their type and length. */
export interface StoredObject {
  body: Readable | Buffer;
  contentType: string;
  bytes: number;
}

/**
 * Where photo files live. Rows in the database hold only keys; a driver maps a key to a file on
 * disk or an object in a bucket. Keys are made by the server, never taken from a request, and every
 * driver still refuses one that could reach outside its own space.
 */
export interface PhotoStore {
  readonly driver: 'local' | 's3';
  put(key: string, body: Buffer, contentType: string): Promise<void>;
  /** null when nothing is stored under the key. */
  get(key: string): Promise<StoredObject | null>;
  /** Removing a key that is not there is not an error. */
  delete(key: string): Promise<void>;
}

export class StorageKeyError extends Error {
  constructor(key: string) {
    super(`Refused storage key ${JSON.stringify(key)}: keys are relative paths of letters, digits, '.', '_', '-' and '/'.`);
    this.name = 'StorageKeyError';
  }
}

const KEY = /^[A-Za-z0-9_-][A-Za-z0-9._-]*(\/[A-Za-z0-9_-][A-Za-z0-9._-]*)*$/;

/** Relative, no empty, '.' or '..' segment, no backslash or drive letter, at most 512 characters. */
export function assertKey(key: string): void {
  if (typeof key !== 'string' || key.length > 512 || !KEY.test(key) || key.split('/').some((s) => s === '.' || s === '..')) {
    throw new StorageKeyError(key);
  }
}
