import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Readable } from 'node:stream';
import S3rver from 's3rver';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { photoUrl, type FindingPhotoDto } from '@wingstage/shared';
import { FindingPhoto } from '../src/models/index.js';
import { makeFinding, makeJob, makeWorkshop, signIn, startTestServer } from './helpers.js';
import { loadStorageConfig } from '../src/config/config.js';
import { ConfigError } from '../src/config/config.js';
import { LocalPhotoStore, S3PhotoStore, StorageKeyError, createPhotoStore, type PhotoStore } from '../src/storage/index.js';

async function bytesOf(body: Readable | Buffer): Promise<Buffer> {
  if (Buffer.isBuffer(body)) return body;
  const chunks: Buffer[] = [];
  for await (const c of body) chunks.push(Buffer.from(c as Buffer));
  return Buffer.concat(chunks);
}

const tmp = (label: string) => fs.mkdtempSync(path.join(os.tmpdir(), `ws-${label}-`));

let s3dir: string;
let s3: S3rver;
let s3port: number;
let localDir: string;

beforeAll(async () => {
  localDir = tmp('store-local');
  s3dir = tmp('store-s3');
  // Port 0: the system picks a free port, so parallel runs never collide.
  s3 = new S3rver({ address: '127.0.0.1', port: 0, directory: s3dir, silent: true, configureBuckets: [{ name: 'finding-photos' }] });
  s3port = (await s3.run()).port;
});
afterAll(async () => {
  await s3?.close();
  fs.rmSync(s3dir, { recursive: true, force: true });
  fs.rmSync(localDir, { recursive: true, force: true });
});

const drivers: { name: string; make: () => PhotoStore }[] = [
  { name: 'local', make: () => new LocalPhotoStore(localDir) },
  {
    name: 's3',
    make: () =>
      createPhotoStore(
        loadStorageConfig({
          STORAGE_DRIVER: 's3',
          S3_BUCKET: 'finding-photos',
          S3_REGION: 'us-east-1',
          S3_ENDPOINT: `http://127.0.0.1:${s3port}`,
          S3_ACCESS_KEY_ID: 'S3RVER',
          S3_SECRET_ACCESS_KEY: 'S3RVER',
          S3_FORCE_PATH_STYLE: 'true',
        }),
      ),
  },
];

describe.each(drivers)('photo store contract: $name driver', ({ name, make }) => {
  it('when a picture is put, then get returns the same bytes, its type and length; delete removes it and a second delete is fine', async () => {
    const store = make();
    expect(store.driver).toBe(name);
    // Not text: every byte value, so any framing or re-encoding on the way would show.
    const body = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff]), Buffer.from(Array.from({ length: 300_000 }, (_, i) => (i * 7919) % 256))]);
    const key = `workshops/w1/jobs/j1/findings/f1/${name}-photo.jpg`;
    await store.put(key, body, 'image/jpeg');
    const got = await store.get(key);
    expect(got).not.toBeNull();
    expect(got!.contentType).toBe('image/jpeg');
    expect(got!.bytes).toBe(body.length);
    expect((await bytesOf(got!.body)).equals(body)).toBe(true);
    // Putting again replaces.
    const smaller = Buffer.from([0xff, 0xd8, 0xff, 0xe0, 1, 2, 3]);
    await store.put(key, smaller, 'image/jpeg');
    expect((await bytesOf((await store.get(key))!.body)).equals(smaller)).toBe(true);
    await store.delete(key);
    expect(await store.get(key)).toBeNull();
    await expect(store.delete(key)).resolves.toBeUndefined();
  });

  it('when a key was never stored, then get returns null', async () => {
    expect(await make().get(`workshops/none/${name}-missing.jpg`)).toBeNull();
  });

  it('when a key could climb out of the store or is not a plain relative path, then put, get and delete refuse it', async () => {
    const store = make();
    const bad = ['../escape.jpg', 'a/../../escape.jpg', '/etc/passwd', 'a//b.jpg', 'a/./b.jpg', 'a\\..\\b.jpg', '', '.hidden', 'a/b/', 'C:/x.jpg', 'a/b.jpg\u0000.png', 'x'.repeat(600)];
    for (const key of bad) {
      await expect(store.put(key, Buffer.from('x'), 'image/jpeg'), key).rejects.toBeInstanceOf(StorageKeyError);
      await expect(store.get(key), key).rejects.toBeInstanceOf(StorageKeyError);
      await expect(store.delete(key), key).rejects.toBeInstanceOf(StorageKeyError);
    }
  });
});

describe('s3 driver settings', () => {
  it('when the s3 store is made, then its client sends and checks checksums only when required and uses path-style addresses', async () => {
    const store = drivers[1]!.make() as S3PhotoStore;
    const cfg = (store as unknown as { client: { config: { requestChecksumCalculation: () => Promise<string>; responseChecksumValidation: () => Promise<string>; forcePathStyle?: boolean } } }).client.config;
    expect(await cfg.requestChecksumCalculation()).toBe('WHEN_REQUIRED');
    expect(await cfg.responseChecksumValidation()).toBe('WHEN_REQUIRED');
    expect(cfg.forcePathStyle).toBe(true);
  });

  it('when the app runs on the s3 driver, then an upload lands in the bucket and the photo streams back from it', async () => {
    const server = await startTestServer({
      STORAGE_DRIVER: 's3', S3_BUCKET: 'finding-photos', S3_REGION: 'us-east-1', S3_ENDPOINT: `http://127.0.0.1:${s3port}`,
      S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: 'true',
    });
    try {
      expect(server.parts.photos.driver).toBe('s3');
      const w = await makeWorkshop('Bucket');
      const f = await makeFinding(await makeJob(w.workshop.id, w.owners[0].aircraft.id, 'inspecting'));
      const c = await signIn(server.app, w.users.engineer.email);
      const pic = await sharp({ create: { width: 2400, height: 1800, channels: 3, background: '#777777', noise: { type: 'gaussian', mean: 120, sigma: 40 } } }).jpeg().toBuffer();
      const up = await c.agent.post(`/api/jobs/${f.jobId}/findings/${f.id}/photos`).set('X-CSRF-Token', c.csrf).attach('photos', pic, 'noisy.jpg');
      expect(up.status).toBe(201);
      const dto = up.body[0] as FindingPhotoDto;
      const row = (await FindingPhoto.findByPk(dto.id))!;
      // s3rver keeps each object as a file under bucket/key in its folder.
      expect(fs.existsSync(path.join(s3dir, 'finding-photos', `${row.storageKey}._S3rver_object`))).toBe(true);
      const got = await c.get(photoUrl(dto.id)).buffer(true).parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (x: Buffer) => chunks.push(x));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
      expect(got.status).toBe(200);
      expect((got.body as Buffer).length).toBe(dto.bytes);
      expect(await sharp(got.body as Buffer).metadata()).toMatchObject({ format: 'jpeg', width: 2048, height: 1536 });
    } finally {
      await server.close();
    }
  });
});

describe('local driver on disk', () => {
  it('when keys are refused, then nothing is written outside (or inside) the folder; a good key lands under it', async () => {
    const root = tmp('store-escape');
    const outside = path.join(path.dirname(root), `${path.basename(root)}-outside.jpg`);
    const store = new LocalPhotoStore(root);
    await expect(store.put(`../${path.basename(outside)}`, Buffer.from('x'), 'image/jpeg')).rejects.toBeInstanceOf(StorageKeyError);
    expect(fs.existsSync(outside)).toBe(false);
    expect(fs.readdirSync(root)).toEqual([]);
    await store.put('a/b/c.jpg', Buffer.from('picture'), 'image/jpeg');
    expect(fs.readFileSync(path.join(root, 'a', 'b', 'c.jpg'), 'utf8')).toBe('picture');
    // No half-written temporary file is left beside it.
    expect(fs.readdirSync(path.join(root, 'a', 'b'))).toEqual(['c.jpg']);
    fs.rmSync(root, { recursive: true, force: true });
  });
});

describe('storage settings', () => {
  it('when STORAGE_DRIVER=s3 lacks its settings, then start-up is refused naming each missing one', () => {
    let err: unknown;
    try {
      loadStorageConfig({ STORAGE_DRIVER: 's3', S3_REGION: 'us-east-1' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ConfigError);
    const message = (err as Error).message;
    expect(message).toContain('S3_BUCKET is required when STORAGE_DRIVER=s3');
    expect(message).toContain('S3_ACCESS_KEY_ID is required');
    expect(message).toContain('S3_SECRET_ACCESS_KEY is required');
    expect(message).not.toContain('S3_REGION is required');
    expect(() => loadStorageConfig({ STORAGE_DRIVER: 'ftp' })).toThrow(/STORAGE_DRIVER must be local or s3/);
    expect(() => loadStorageConfig({ STORAGE_DRIVER: 's3', S3_BUCKET: 'b', S3_REGION: 'r', S3_ACCESS_KEY_ID: 'k', S3_SECRET_ACCESS_KEY: 's', S3_ENDPOINT: 'not a url' })).toThrow(/S3_ENDPOINT must be an absolute URL/);
  });

  it('when no folder is given, then the local folder follows the profile under .local', () => {
    expect(loadStorageConfig({ WS_PROFILE: 'dev' }).STORAGE_DIR).toMatch(/[/\\]\.local[/\\]uploads-dev$/);
    expect(loadStorageConfig({ WS_PROFILE: 'test' }).STORAGE_DIR).toMatch(/[/\\]\.local[/\\]uploads-test$/);
    expect(loadStorageConfig({ WS_PROFILE: 'test', WS_LOCAL_DIR: '/srv/ws' }).STORAGE_DIR).toBe(path.join('/srv/ws', 'uploads-test'));
    expect(loadStorageConfig({ STORAGE_DIR: '/data/photos' })).toMatchObject({ STORAGE_DRIVER: 'local', STORAGE_DIR: '/data/photos' });
  });
});
