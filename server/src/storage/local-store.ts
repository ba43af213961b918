import { createReadStream } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { assertKey, StorageKeyError, type PhotoStore, type StoredObject } from './photo-store.js';

/** Files under one folder; the content type is derived from the key's extension (we store only what we write). */
const TYPES: Record<string, string> = { '.jpg': 'image/jpeg', '.jpeg': 'image/jpeg', '.png': 'image/png', '.webp': 'image/webp' };

export class LocalPhotoStore implements PhotoStore {
  readonly driver = 'local' as const;
  private readonly root: string;

  constructor(dir: string) {
    this.root = path.resolve(dir);
  }

  /** The file for a key, checked twice: by the key's own shape and by where it resolves. */
  private fileOf(key: string): string {
    assertKey(key);
    const file = path.resolve(this.root, key);
    if (!file.startsWith(this.root + path.sep)) throw new StorageKeyError(key);
    return file;
  }

  async put(key: string, body: Buffer, _contentType: string): Promise<void> {
    const file = this.fileOf(key);
    await fs.mkdir(path.dirname(file), { recursive: true, mode: 0o750 });
    // Written beside its final name and renamed, so a reader never sees half a picture.
    const tmp = `${file}.${randomBytes(6).toString('hex')}.part`;
    try {
      await fs.writeFile(tmp, body, { mode: 0o640 });
      await fs.rename(tmp, file);
    } catch (err) {
      await fs.rm(tmp, { force: true });
      throw err;
    }
  }

  async get(key: string): Promise<StoredObject | null> {
    const file = this.fileOf(key);
    let size: number;
    try {
      const st = await fs.stat(file);
      if (!st.isFile()) return null;
      size = st.size;
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw err;
    }
    return { body: createReadStream(file), contentType: TYPES[path.extname(file).toLowerCase()] ?? 'application/octet-stream', bytes: size };
  }

  async delete(key: string): Promise<void> {
    await fs.rm(this.fileOf(key), { force: true });
  }
}
