import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PHOTO_LIMITS, decidePhotoUrl, photoUrl, type DecisionPageDto, type EstimateLineInputForm, type FindingDto, type FindingPhotoDto, type Role } from '@wingstage/shared';
import { createApp } from '../src/app.js';
import { ApprovalRequest, AuditEvent, Finding, FindingPhoto, Job } from '../src/models/index.js';
import type { PhotoStore } from '../src/storage/index.js';
import { decideTokenFromMail, makeFinding, makeJob, makeWorkshop, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let a: WorkshopFixture;
let b: WorkshopFixture;
const staff = {} as Record<Exclude<Role, 'owner'>, Client>;
let owner: Client;
let otherOwner: Client;
let bManager: Client;

beforeAll(async () => {
  server = await startTestServer();
  [a, b] = await Promise.all([makeWorkshop('Photos'), makeWorkshop('Elsewhere')]);
  for (const r of ['admin', 'manager', 'engineer', 'accounts'] as const) staff[r] = await signIn(server.app, a.users[r].email);
  owner = await signIn(server.app, a.owners[0].user.email);
  otherOwner = await signIn(server.app, a.owners[1].user.email);
  bManager = await signIn(server.app, b.users.manager.email);
});
afterAll(async () => {
  await server?.close();
});

// ─── Pictures made for the tests ─────────────────────────────────────────────

/** A plain JPEG of the given size. */
const jpeg = (width: number, height: number, background = '#4477aa') => sharp({ create: { width, height, channels: 3, background } }).jpeg({ quality: 90 }).toBuffer();

/** A JPEG carrying a camera make and a GPS position in its EXIF, as a phone writes it. */
const jpegWithLocation = () =>
  sharp({ create: { width: 640, height: 480, channels: 3, background: '#998877' } })
    .jpeg()
    .withExif({
      IFD0: { Make: 'TestCamMaker', Model: 'Field Unit 7' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 30/1' },
    })
    .toBuffer();

/**
 * Stored sideways (200×100: red left half, blue right half) with EXIF orientation 6, which says
 * "turn 90° clockwise to view": upright, it is 100×200 with red on top and blue below.
 */
const sideways = async () => {
  const blue = await sharp({ create: { width: 100, height: 100, channels: 3, background: '#0000ff' } }).png().toBuffer();
  return sharp({ create: { width: 200, height: 100, channels: 3, background: '#ff0000' } })
    .composite([{ input: blue, left: 100, top: 0 }])
    .jpeg({ quality: 95 })
    .withMetadata({ orientation: 6 })
    .toBuffer();
};

type Attach = { name: string; body: Buffer; type?: string };

function upload(c: Client, jobId: string, findingId: string, files: Attach[], field = 'photos') {
  let req = c.agent.post(`/api/jobs/${jobId}/findings/${findingId}/photos`).set('X-CSRF-Token', c.csrf);
  for (const f of files) req = req.attach(field, f.body, { filename: f.name, contentType: f.type ?? 'image/jpeg' });
  return req;
}

const del = (c: Client, jobId: string, findingId: string, photoId: string) =>
  c.agent.delete(`/api/jobs/${jobId}/findings/${findingId}/photos/${photoId}`).set('X-CSRF-Token', c.csrf);

/** Reads a binary answer into a Buffer (supertest leaves images unparsed otherwise). */
const binary = (r: request.Test) =>
  r.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

/** Every file under the finding's folder in the store (empty if the folder is not there). */
function storedFor(f: Finding): string[] {
  const dir = path.join(server.parts.config.STORAGE_DIR, 'workshops', f.workshopId, 'jobs', f.jobId, 'findings', f.id);
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((d) => d.isFile()).map((d) => d.name);
}

async function inspectingFinding(state: Finding['state'] = 'draft', ownerIndex: 0 | 1 = 0): Promise<Finding> {
  const job = await makeJob(a.workshop.id, a.owners[ownerIndex].aircraft.id, 'inspecting');
  return makeFinding(job, { state });
}

// ─── Upload ──────────────────────────────────────────────────────────────────

describe('uploading photos', () => {
  it('when an engineer uploads two photos, then both are re-encoded within the size limits, stored with thumbnails, recorded and listed oldest first', async () => {
    const f = await inspectingFinding();
    const big = await jpeg(3000, 2000);
    const small = await jpeg(300, 200, '#aa4444');
    const res = await upload(staff.engineer, f.jobId, f.id, [
      { name: 'wide.jpg', body: big },
      { name: 'small.jpg', body: small },
    ]);
    expect(res.status).toBe(201);
    const dtos = res.body as FindingPhotoDto[];
    expect(dtos).toHaveLength(2);
    // Long edge brought down to fullEdge; a smaller picture is never enlarged.
    expect(dtos[0]).toMatchObject({ findingId: f.id, width: PHOTO_LIMITS.fullEdge, height: Math.round((2000 / 3000) * PHOTO_LIMITS.fullEdge), thumbWidth: PHOTO_LIMITS.thumbEdge, thumbHeight: 320, uploadedByName: a.users.engineer.name });
    expect(dtos[1]).toMatchObject({ width: 300, height: 200, thumbWidth: 300, thumbHeight: 200 });
    expect(new Date(dtos[0]!.uploadedAt).getTime()).toBeLessThan(new Date(dtos[1]!.uploadedAt).getTime());

    const rows = await FindingPhoto.findAll({ where: { findingId: f.id }, order: [['createdAt', 'ASC']] });
    expect(rows.map((r) => r.id)).toEqual(dtos.map((d) => d.id));
    for (const r of rows) {
      const full = await server.parts.photos.get(r.storageKey);
      const thumb = await server.parts.photos.get(r.thumbKey);
      expect(full).not.toBeNull();
      expect(thumb).not.toBeNull();
      expect(full!.bytes).toBe(r.bytes);
      expect(r.uploadedBy).toBe(a.users.engineer.id);
    }
    expect(storedFor(f).sort()).toEqual(rows.flatMap((r) => [`${r.id}.jpg`, `${r.id}-thumb.jpg`]).sort());

    // The stored picture is a JPEG of the recorded size.
    const fetched = await binary(staff.manager.get(photoUrl(dtos[0]!.id)));
    expect(fetched.status).toBe(200);
    const meta = await sharp(fetched.body as Buffer).metadata();
    expect(meta).toMatchObject({ format: 'jpeg', width: dtos[0]!.width, height: dtos[0]!.height });
    const thumb = await binary(staff.manager.get(photoUrl(dtos[0]!.id, 'thumb')));
    expect(await sharp(thumb.body as Buffer).metadata()).toMatchObject({ width: PHOTO_LIMITS.thumbEdge, height: 320 });

    const listed = (await staff.manager.get(`/api/jobs/${f.jobId}/findings`)).body as FindingDto[];
    expect(listed.find((x) => x.id === f.id)!.photos).toEqual(dtos);
    const history = await AuditEvent.findAll({ where: { jobId: f.jobId, action: 'finding.photo_added' } });
    expect(history.map((h) => h.summary)).toEqual([`2 photos added to F-${f.seq}`]);
    expect(history[0]!.actorUserId).toBe(a.users.engineer.id);
  });

  it('when a PNG or a WebP is uploaded, then it is accepted by its content and stored as a JPEG', async () => {
    const f = await inspectingFinding();
    const png = await sharp({ create: { width: 120, height: 80, channels: 4, background: { r: 0, g: 0, b: 0, alpha: 0 } } }).png().toBuffer();
    const webp = await sharp({ create: { width: 90, height: 60, channels: 3, background: '#22aa22' } }).webp().toBuffer();
    // The label says JPEG; the content decides.
    const res = await upload(staff.manager, f.jobId, f.id, [
      { name: 'clear.png', body: png, type: 'image/jpeg' },
      { name: 'green.webp', body: webp, type: 'application/octet-stream' },
    ]);
    expect(res.status).toBe(201);
    const got = await binary(staff.manager.get(photoUrl((res.body as FindingPhotoDto[])[0]!.id)));
    expect(got.headers['content-type']).toBe('image/jpeg');
    const { data } = await sharp(got.body as Buffer).raw().toBuffer({ resolveWithObject: true });
    // Transparent became white, not black.
    expect(data[0]).toBeGreaterThan(240);
  });

  it('when a photo carries a GPS position in its EXIF, then the stored files carry no EXIF, XMP or ICC data at all', async () => {
    const f = await inspectingFinding();
    const input = await jpegWithLocation();
    const inMeta = await sharp(input).metadata();
    expect(inMeta.exif).toBeDefined();
    expect(inMeta.exif!.includes(Buffer.from('TestCamMaker'))).toBe(true);
    // The GPS sub-directory pointer (tag 0x8825) is in the input's EXIF.
    expect(inMeta.exif!.includes(Buffer.from([0x88, 0x25])) || inMeta.exif!.includes(Buffer.from([0x25, 0x88]))).toBe(true);

    const res = await upload(staff.engineer, f.jobId, f.id, [{ name: 'IMG_0001.jpg', body: input }]);
    expect(res.status).toBe(201);
    const row = (await FindingPhoto.findByPk((res.body as FindingPhotoDto[])[0]!.id))!;
    for (const key of [row.storageKey, row.thumbKey]) {
      const file = fs.readFileSync(path.join(server.parts.config.STORAGE_DIR, key));
      const meta = await sharp(file).metadata();
      expect(meta.exif).toBeUndefined();
      expect(meta.xmp).toBeUndefined();
      expect(meta.icc).toBeUndefined();
      expect(file.includes(Buffer.from('Exif'))).toBe(false);
      expect(file.includes(Buffer.from('TestCamMaker'))).toBe(false);
    }
  });

  it('when a photo was taken sideways, then the stored picture is turned upright from its EXIF orientation', async () => {
    const f = await inspectingFinding();
    const input = await sideways();
    expect((await sharp(input).metadata()).orientation).toBe(6);
    const res = await upload(staff.engineer, f.jobId, f.id, [{ name: 'sideways.jpg', body: input }]);
    expect(res.status).toBe(201);
    expect(res.body[0]).toMatchObject({ width: 100, height: 200 });
    const got = await binary(staff.engineer.get(photoUrl(res.body[0].id)));
    const { data, info } = await sharp(got.body as Buffer).raw().toBuffer({ resolveWithObject: true });
    expect(info).toMatchObject({ width: 100, height: 200 });
    const px = (x: number, y: number) => Array.from(data.subarray((y * info.width + x) * info.channels, (y * info.width + x) * info.channels + 3));
    const [r1, , b1] = px(50, 40);
    const [r2, , b2] = px(50, 160);
    expect(r1).toBeGreaterThan(200);
    expect(b1).toBeLessThan(60);
    expect(b2).toBeGreaterThan(200);
    expect(r2).toBeLessThan(60);
    expect((await sharp(got.body as Buffer).metadata()).orientation).toBeUndefined();
  });
});

describe('refused uploads leave nothing behind', () => {
  it(`when a file is larger than ${PHOTO_LIMITS.maxBytes} bytes, then it is 413 too_large naming the file and the limit in MB, and nothing is stored`, async () => {
    const f = await inspectingFinding();
    const small = await jpeg(100, 100);
    // A real JPEG at its start, padded past the limit: the size alone must refuse it.
    const huge = Buffer.concat([await jpeg(100, 100), Buffer.alloc(PHOTO_LIMITS.maxBytes, 1)]);
    expect(huge.length).toBeGreaterThan(PHOTO_LIMITS.maxBytes);
    const res = await upload(staff.engineer, f.jobId, f.id, [
      { name: 'fine.jpg', body: small },
      { name: 'enormous.jpg', body: huge },
    ]);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('too_large');
    expect(res.body.error.message).toContain('enormous.jpg');
    expect(res.body.error.message).toContain('15 MB');
    expect(await FindingPhoto.count({ where: { findingId: f.id } })).toBe(0);
    expect(storedFor(f)).toEqual([]);
    expect(await AuditEvent.count({ where: { jobId: f.jobId, action: 'finding.photo_added' } })).toBe(0);
  });

  it('when a text file is named .jpg, then it is 415 unsupported_type and nothing is stored', async () => {
    const f = await inspectingFinding();
    const res = await upload(staff.engineer, f.jobId, f.id, [{ name: 'notes.jpg', body: Buffer.from('Torque figures: 12 Nm on the flange nuts.\n'.repeat(50)) }]);
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_type');
    expect(res.body.error.message).toMatch(/notes\.jpg.* is not a JPEG, PNG or WebP picture/);
    expect(await FindingPhoto.count({ where: { findingId: f.id } })).toBe(0);
    expect(storedFor(f)).toEqual([]);
  });

  it('when one file of several is bad (a GIF, or a JPEG cut short), then none of the upload is stored', async () => {
    const f = await inspectingFinding();
    const good = await jpeg(400, 300);
    const gif = await sharp({ create: { width: 20, height: 20, channels: 3, background: '#ff00ff' } }).gif().toBuffer();
    const mixed = await upload(staff.engineer, f.jobId, f.id, [
      { name: 'good-1.jpg', body: good },
      { name: 'good-2.jpg', body: good },
      { name: 'moving.gif', body: gif, type: 'image/gif' },
    ]);
    expect(mixed.status).toBe(415);
    expect(mixed.body.error.message).toContain('moving.gif');
    const cut = await jpeg(800, 600);
    const damaged = await upload(staff.engineer, f.jobId, f.id, [
      { name: 'good.jpg', body: good },
      { name: 'cut.jpg', body: cut.subarray(0, Math.floor(cut.length * 0.5)) },
    ]);
    expect(damaged.status).toBe(400);
    expect(damaged.body.error.code).toBe('validation_failed');
    expect(damaged.body.error.message).toContain('cut.jpg');
    expect(await FindingPhoto.count({ where: { findingId: f.id } })).toBe(0);
    expect(storedFor(f)).toEqual([]);
  });

  it('when the store fails part-way through, then the files already written are removed and no row is written', async () => {
    const f = await inspectingFinding();
    let puts = 0;
    const real = server.parts.photos;
    const flaky: PhotoStore = {
      driver: real.driver,
      get: (k) => real.get(k),
      delete: (k) => real.delete(k),
      put: async (k, body, type) => {
        puts += 1;
        if (puts === 3) throw new Error('disk full (test)');
        return real.put(k, body, type);
      },
    };
    const app = createApp({ ...server.parts, photos: flaky });
    const c = await signIn(app, a.users.engineer.email);
    const good = await jpeg(200, 150);
    const res = await upload(c, f.jobId, f.id, [
      { name: 'one.jpg', body: good },
      { name: 'two.jpg', body: good },
    ]);
    expect(res.status).toBe(500);
    expect(puts).toBe(3);
    expect(await FindingPhoto.count({ where: { findingId: f.id } })).toBe(0);
    expect(storedFor(f)).toEqual([]);
  });

  it(`when more than ${PHOTO_LIMITS.maxFilesPerUpload} files come at once, or the finding would hold more than ${PHOTO_LIMITS.maxPerFinding}, then it is 400 and nothing is added`, async () => {
    const f = await inspectingFinding();
    const tiny = await jpeg(40, 30);
    const seven = Array.from({ length: PHOTO_LIMITS.maxFilesPerUpload + 1 }, (_, i) => ({ name: `p${i}.jpg`, body: tiny }));
    const tooMany = await upload(staff.engineer, f.jobId, f.id, seven);
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.message).toContain(`at most ${PHOTO_LIMITS.maxFilesPerUpload} photos`);
    expect(await FindingPhoto.count({ where: { findingId: f.id } })).toBe(0);

    const six = seven.slice(0, PHOTO_LIMITS.maxFilesPerUpload);
    expect((await upload(staff.engineer, f.jobId, f.id, six)).status).toBe(201);
    expect((await upload(staff.engineer, f.jobId, f.id, six.slice(0, PHOTO_LIMITS.maxPerFinding - PHOTO_LIMITS.maxFilesPerUpload - 1))).status).toBe(201);
    const over = await upload(staff.engineer, f.jobId, f.id, six.slice(0, 2));
    expect(over.status).toBe(400);
    expect(over.body.error.code).toBe('validation_failed');
    expect(over.body.error.message).toMatch(/has 11 of at most 12 photos, so 1 more can be added, not 2/);
    expect(await FindingPhoto.count({ where: { findingId: f.id } })).toBe(PHOTO_LIMITS.maxPerFinding - 1);
    expect(storedFor(f)).toHaveLength((PHOTO_LIMITS.maxPerFinding - 1) * 2);
    // A removed photo makes room again.
    const one = (await FindingPhoto.findOne({ where: { findingId: f.id } }))!;
    expect((await upload(staff.engineer, f.jobId, f.id, six.slice(0, 1))).status).toBe(201);
    expect((await upload(staff.engineer, f.jobId, f.id, six.slice(0, 1))).status).toBe(400);
    expect((await del(staff.engineer, f.jobId, f.id, one.id)).status).toBe(204);
    expect((await upload(staff.engineer, f.jobId, f.id, six.slice(0, 1))).status).toBe(201);
  });

  it('when two uploads race for the last places on a finding, then one is stored and the other refused with its files removed', async () => {
    const f = await inspectingFinding();
    const tiny = await jpeg(40, 30);
    const files = (n: number, tag: string) => Array.from({ length: n }, (_, i) => ({ name: `${tag}${i}.jpg`, body: tiny }));
    expect((await upload(staff.engineer, f.jobId, f.id, files(PHOTO_LIMITS.maxFilesPerUpload, 'a'))).status).toBe(201);
    expect((await upload(staff.engineer, f.jobId, f.id, files(PHOTO_LIMITS.maxPerFinding - PHOTO_LIMITS.maxFilesPerUpload - 2, 'b'))).status).toBe(201);
    // Both pass the early count (10 + 2 ≤ 12); the finding's row lock lets only one write its rows.
    const [one, two] = await Promise.all([upload(staff.engineer, f.jobId, f.id, files(2, 'c')), upload(staff.manager, f.jobId, f.id, files(2, 'd'))]);
    expect([one.status, two.status].sort()).toEqual([201, 400]);
    expect(await FindingPhoto.count({ where: { findingId: f.id } })).toBe(PHOTO_LIMITS.maxPerFinding);
    const rows = await FindingPhoto.findAll({ where: { findingId: f.id } });
    expect(storedFor(f).sort()).toEqual(rows.flatMap((r) => [`${r.id}.jpg`, `${r.id}-thumb.jpg`]).sort());
  });

  it('when the body is not multipart, has no file, or uses another field, then it is 400; without the CSRF header it is 403 and nothing is read', async () => {
    const f = await inspectingFinding();
    const json = await staff.engineer.post(`/api/jobs/${f.jobId}/findings/${f.id}/photos`, { photos: [] });
    expect(json.status).toBe(400);
    const none = await staff.engineer.agent.post(`/api/jobs/${f.jobId}/findings/${f.id}/photos`).set('X-CSRF-Token', staff.engineer.csrf).field('note', 'no file');
    expect(none.status).toBe(400);
    expect(none.body.error.message).toMatch(/at least one photo/);
    const wrongField = await upload(staff.engineer, f.jobId, f.id, [{ name: 'a.jpg', body: await jpeg(50, 50) }], 'picture');
    expect(wrongField.status).toBe(400);
    const noCsrf = await staff.engineer.agent.post(`/api/jobs/${f.jobId}/findings/${f.id}/photos`).attach('photos', await jpeg(50, 50), 'a.jpg');
    expect(noCsrf.status).toBe(403);
    expect(noCsrf.body.error.code).toBe('csrf_failed');
    expect(await FindingPhoto.count({ where: { findingId: f.id } })).toBe(0);
  });

  it('when the finding is withdrawn, or the job closed, then photos cannot be added (409)', async () => {
    const withdrawn = await inspectingFinding('withdrawn');
    const res = await upload(staff.manager, withdrawn.jobId, withdrawn.id, [{ name: 'a.jpg', body: await jpeg(50, 50) }]);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/withdrawn/);
    const f = await inspectingFinding('approved');
    await Job.update({ state: 'closed' }, { where: { id: f.jobId } });
    expect((await upload(staff.manager, f.jobId, f.id, [{ name: 'a.jpg', body: await jpeg(50, 50) }])).status).toBe(409);
    expect(await FindingPhoto.count({ where: { findingId: [withdrawn.id, f.id] } })).toBe(0);
  });
});

// ─── Roles and boundaries ────────────────────────────────────────────────────

describe('who may add, remove and see photos', () => {
  it('when each role uploads and removes, then admin, manager and engineer may; accounts and owners are refused (403); anonymous 401', async () => {
    const f = await inspectingFinding('priced');
    const pic = await jpeg(60, 40);
    for (const role of ['admin', 'manager', 'engineer'] as const) {
      const up = await upload(staff[role], f.jobId, f.id, [{ name: `${role}.jpg`, body: pic }]);
      expect({ role, status: up.status }).toEqual({ role, status: 201 });
      expect({ role, status: (await del(staff[role], f.jobId, f.id, up.body[0].id)).status }).toEqual({ role, status: 204 });
    }
    const kept = (await upload(staff.engineer, f.jobId, f.id, [{ name: 'kept.jpg', body: pic }])).body[0] as FindingPhotoDto;
    for (const [who, c] of [['accounts', staff.accounts], ['owner', owner]] as const) {
      const up = await upload(c, f.jobId, f.id, [{ name: 'x.jpg', body: pic }]);
      expect({ who, status: up.status }).toEqual({ who, status: 403 });
      expect({ who, status: (await del(c, f.jobId, f.id, kept.id)).status }).toEqual({ who, status: 403 });
    }
    expect((await request(server.app).post(`/api/jobs/${f.jobId}/findings/${f.id}/photos`).attach('photos', pic, 'a.jpg')).status).toBe(401);
    expect((await request(server.app).get(photoUrl(kept.id))).status).toBe(401);
    // Every staff role may look.
    for (const role of ['admin', 'manager', 'engineer', 'accounts'] as const) expect((await staff[role].get(photoUrl(kept.id, 'thumb'))).status).toBe(200);
    expect(await FindingPhoto.count({ where: { findingId: f.id, removedAt: null } })).toBe(1);
    expect((await AuditEvent.findAll({ where: { jobId: f.jobId, action: 'finding.photo_removed' } })).map((e) => e.summary)).toEqual(Array(3).fill(`Photo removed from F-${f.seq}`));
  });

  it("when another workshop's staff upload to, remove or fetch this workshop's photos, or name a finding of another job, then it is 404", async () => {
    const f = await inspectingFinding('priced');
    const pic = await jpeg(60, 40);
    const mine = (await upload(staff.engineer, f.jobId, f.id, [{ name: 'a.jpg', body: pic }])).body[0] as FindingPhotoDto;
    expect((await upload(bManager, f.jobId, f.id, [{ name: 'b.jpg', body: pic }])).status).toBe(404);
    expect((await del(bManager, f.jobId, f.id, mine.id)).status).toBe(404);
    expect((await bManager.get(photoUrl(mine.id))).status).toBe(404);
    // A finding of another job, named under this job.
    const other = await inspectingFinding('priced');
    expect((await upload(staff.engineer, f.jobId, other.id, [{ name: 'c.jpg', body: pic }])).status).toBe(404);
    expect((await del(staff.engineer, other.jobId, other.id, mine.id)).status).toBe(404);
    expect((await staff.engineer.get(photoUrl(randomUUID()))).status).toBe(404);
    expect((await staff.engineer.get('/api/photos/not-an-id')).status).toBe(400);
    expect((await staff.engineer.get(`${photoUrl(mine.id)}`.replace('size=full', 'size=huge'))).status).toBe(400);
    expect(await FindingPhoto.count({ where: { findingId: [f.id, other.id] } })).toBe(1);
  });

  it("when an owner fetches photos, then their own job's are served unless the finding is a draft; another owner's are 404", async () => {
    const priced = await inspectingFinding('priced');
    const draft = await makeFinding((await Job.findByPk(priced.jobId))!, { state: 'draft' });
    const pic = await jpeg(60, 40);
    const seen = (await upload(staff.engineer, priced.jobId, priced.id, [{ name: 'a.jpg', body: pic }])).body[0] as FindingPhotoDto;
    const hidden = (await upload(staff.engineer, draft.jobId, draft.id, [{ name: 'b.jpg', body: pic }])).body[0] as FindingPhotoDto;
    const res = await binary(owner.get(photoUrl(seen.id)));
    expect(res.status).toBe(200);
    expect(res.headers).toMatchObject({ 'content-type': 'image/jpeg', 'cache-control': 'private, max-age=3600', 'x-content-type-options': 'nosniff' });
    expect(Number(res.headers['content-length'])).toBe(seen.bytes);
    expect((res.body as Buffer).length).toBe(seen.bytes);
    expect((await owner.get(photoUrl(hidden.id))).status).toBe(404);
    expect((await otherOwner.get(photoUrl(seen.id))).status).toBe(404);
    // The findings list shows the owner the same: the priced finding with its photo, no draft.
    const listed = (await owner.get(`/api/jobs/${priced.jobId}/findings`)).body as FindingDto[];
    expect(listed.map((x) => x.id)).toEqual([priced.id]);
    expect(listed[0]!.photos.map((p) => p.id)).toEqual([seen.id]);
  });
});

// ─── Removal and the owner's decision page ───────────────────────────────────


/** An inspecting job of owner 1 with one finding priced through the estimate. */
async function pricedThroughEstimate() {
  const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
  const f = await makeFinding(job, { title: 'Cracked exhaust spring' });
  const line: EstimateLineInputForm = { id: randomUUID(), stage: 'discovered', kind: 'fee', description: 'Renew spring', amount: '40.00', vatRate: 'standard', findingId: f.id };
  const res = await staff.manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [line], accessTasks: [] });
  expect(res.status).toBe(200);
  return { job, f };
}

async function sendAndReadToken(jobId: string, findingId: string): Promise<{ requestId: string; token: string }> {
  const est = await staff.manager.get(`/api/jobs/${jobId}/estimate`);
  const sent = await staff.manager.post(`/api/jobs/${jobId}/approval-requests`, { findingIds: [findingId], message: 'Photos attached.', estimateVersion: est.body.version });
  expect(sent.status).toBe(201);
  const requestId = sent.body.request.id as string;
  return { requestId, token: await decideTokenFromMail(a.owners[0].customer.email, requestId, 30_000) };
}

describe('photos in approval requests', () => {
  it('when findings with photos are sent, then the snapshot lists them; a removed photo leaves the finding and /api/photos but the link still shows it', async () => {
    const { job, f } = await pricedThroughEstimate();
    const pics = (await upload(staff.engineer, job.id, f.id, [
      { name: 'one.jpg', body: await jpeg(800, 600) },
      { name: 'two.jpg', body: await jpeg(600, 800) },
    ])).body as FindingPhotoDto[];
    const { requestId, token } = await sendAndReadToken(job.id, f.id);

    const stored = (await ApprovalRequest.findByPk(requestId))!;
    expect(stored.snapshot.findings[0]!.photos).toEqual(pics.map((p) => ({ id: p.id, width: p.width, height: p.height })));
    const page = (await request(server.app).get(`/api/decide/${token}`)).body as DecisionPageDto;
    expect(page.snapshot.findings[0]!.photos).toEqual([
      { id: pics[0]!.id, width: 800, height: 600 },
      { id: pics[1]!.id, width: 600, height: 800 },
    ]);

    const viaLink = await binary(request(server.app).get(decidePhotoUrl(token, pics[1]!.id, 'thumb')));
    expect(viaLink.status).toBe(200);
    expect(viaLink.headers).toMatchObject({ 'content-type': 'image/jpeg', 'cache-control': 'private, max-age=3600' });
    expect(await sharp(viaLink.body as Buffer).metadata()).toMatchObject({ width: pics[1]!.thumbWidth, height: pics[1]!.thumbHeight });

    expect((await del(staff.engineer, job.id, f.id, pics[1]!.id)).status).toBe(204);
    expect((await del(staff.engineer, job.id, f.id, pics[1]!.id)).status).toBe(404);
    const after = (await staff.manager.get(`/api/jobs/${job.id}/findings`)).body as FindingDto[];
    expect(after[0]!.photos.map((p) => p.id)).toEqual([pics[0]!.id]);
    expect((await staff.manager.get(photoUrl(pics[1]!.id))).status).toBe(404);
    expect((await owner.get(photoUrl(pics[1]!.id))).status).toBe(404);
    // What the owner was sent stays viewable through the link, full size too.
    const still = await binary(request(server.app).get(decidePhotoUrl(token, pics[1]!.id)));
    expect(still.status).toBe(200);
    expect(await sharp(still.body as Buffer).metadata()).toMatchObject({ width: 600, height: 800 });
    const row = (await FindingPhoto.findByPk(pics[1]!.id))!;
    expect(row.removedAt).not.toBeNull();
    expect(row.removedBy).toBe(a.users.engineer.id);
  });

  it('when the link names a photo outside its snapshot, or the link is revoked or unknown, then it is 404', async () => {
    const { job, f } = await pricedThroughEstimate();
    const before = (await upload(staff.engineer, job.id, f.id, [{ name: 'before.jpg', body: await jpeg(300, 200) }])).body[0] as FindingPhotoDto;
    const { requestId, token } = await sendAndReadToken(job.id, f.id);
    // Added after sending: not what the owner was shown.
    const later = (await upload(staff.engineer, job.id, f.id, [{ name: 'later.jpg', body: await jpeg(300, 200) }])).body[0] as FindingPhotoDto;
    // A photo of another workshop's job.
    const elsewhereJob = await makeJob(b.workshop.id, b.owners[0].aircraft.id, 'inspecting');
    const elsewhere = await makeFinding(elsewhereJob);
    const foreign = (await upload(bManager, elsewhereJob.id, elsewhere.id, [{ name: 'b.jpg', body: await jpeg(300, 200) }])).body[0] as FindingPhotoDto;

    const anon = () => request(server.app);
    expect((await anon().get(decidePhotoUrl(token, before.id))).status).toBe(200);
    expect((await anon().get(decidePhotoUrl(token, later.id))).status).toBe(404);
    expect((await anon().get(decidePhotoUrl(token, foreign.id))).status).toBe(404);
    expect((await anon().get(decidePhotoUrl(token, 'not-a-uuid'))).status).toBe(404);
    expect((await anon().get(decidePhotoUrl('x'.repeat(43), before.id))).status).toBe(404);
    expect((await anon().get(decidePhotoUrl('short', before.id))).status).toBe(404);
    expect((await anon().get(`/api/decide/${token}/photos/${before.id}?size=poster`)).status).toBe(400);

    expect((await staff.manager.post(`/api/approval-requests/${requestId}/revoke`)).status).toBe(200);
    const revoked = await anon().get(decidePhotoUrl(token, before.id));
    expect(revoked.status).toBe(404);
    expect(revoked.body.error.message).toMatch(/link is not valid/);
  });

  it('when one address keeps asking for photos that are not there, then it is rate-limited; photos that load never count', async () => {
    const { job, f } = await pricedThroughEstimate();
    const pic = (await upload(staff.engineer, job.id, f.id, [{ name: 'a.jpg', body: await jpeg(200, 150) }])).body[0] as FindingPhotoDto;
    const { token } = await sendAndReadToken(job.id, f.id);
    // A real listening server and fetch's kept-alive connection, as a phone's browser loads a page of pictures.
    const http = server.variant({ DECIDE_ADDRESS_LIMIT: '3' }).listen(0, '127.0.0.1');
    await new Promise((r) => http.once('listening', r));
    const base = `http://127.0.0.1:${(http.address() as import('node:net').AddressInfo).port}`;
    const get = async (url: string) => {
      const r = await fetch(base + url);
      await r.arrayBuffer();
      return r;
    };
    try {
      for (let i = 0; i < 6; i++) expect((await get(decidePhotoUrl(token, pic.id, 'thumb'))).status).toBe(200);
      // A loaded picture is taken off the count once the server has finished sending it, a moment
      // after the client has it; let the last one settle.
      await new Promise((r) => setTimeout(r, 100));
      for (let i = 0; i < 3; i++) expect((await get(decidePhotoUrl(token, randomUUID()))).status).toBe(404);
      const limited = await fetch(base + decidePhotoUrl(token, randomUUID()));
      expect(limited.status).toBe(429);
      expect(((await limited.json()) as { error: { code: string } }).error.code).toBe('too_many_requests');
    } finally {
      http.closeAllConnections();
      await new Promise((r) => http.close(r));
    }
  });

  it('when a stored snapshot predates photos (photoIds), then the decision page reads its findings as having no photos', async () => {
    const { job, f } = await pricedThroughEstimate();
    const { requestId, token } = await sendAndReadToken(job.id, f.id);
    const r = (await ApprovalRequest.findByPk(requestId))!;
    const old = { ...r.snapshot, findings: r.snapshot.findings.map(({ photos: _p, ...rest }) => ({ ...rest, photoIds: [] })) };
    await ApprovalRequest.update({ snapshot: old as unknown as typeof r.snapshot }, { where: { id: requestId } });
    const page = await request(server.app).get(`/api/decide/${token}`);
    expect(page.status).toBe(200);
    expect((page.body as DecisionPageDto).snapshot.findings[0]!.photos).toEqual([]);
    expect((await request(server.app).get(decidePhotoUrl(token, randomUUID()))).status).toBe(404);
  });
});
