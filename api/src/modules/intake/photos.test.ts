// Ticket photos through HTTP: the type is decided from the bytes (file-type), not the name or the
// Content-Type (OWASP File Upload Cheat Sheet: "validate the file type, don't trust the
// Content-Type header"; ASVS 5.2.2); size-limited with the limit in the message; stored under
// generated names only; shown only to those who may see the ticket. Fixtures are made here by sharp.
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import sharp from 'sharp';
import { createUser, setupTestApp, signIn, tableSnapshot, truncateAll, type TestApp, type TestClient } from '../../../test/helpers';
import { displayName } from './photos.service';

const PW = 'correct horse battery';
const MAX = 64 * 1024;

let t: TestApp;
let member: TestClient, member2: TestClient, tech: TestClient, treasurer: TestClient;
let png: Buffer, jpeg: Buffer, webp: Buffer;

const intake = {
  equipmentKind: 'transceiver',
  makeModel: 'Fenwick Heron 100 HF transceiver',
  units: [],
  faultReported: 'Cracked front panel after a fall.',
  accessories: [],
  reflashConsent: false,
  updatesBy: 'none',
};

before(async () => {
  t = await setupTestApp({ RW_PHOTO_MAX_BYTES: String(MAX) });
  const picture = () => sharp({ create: { width: 640, height: 480, channels: 3, background: { r: 20, g: 120, b: 130 } } });
  [png, jpeg, webp] = await Promise.all([picture().png().toBuffer(), picture().jpeg().toBuffer(), picture().webp().toBuffer()]);
});
after(() => t.close());

beforeEach(async () => {
  await truncateAll(t.sequelize);
  await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow' });
  await createUser(t.sequelize, { email: 'morwenna@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Morwenna Tulk' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  await createUser(t.sequelize, { email: 'gwilym@kestrelfen.example', password: PW, roles: ['treasurer'], displayName: 'Gwilym Orchard' });
  [member, member2, tech, treasurer] = await Promise.all(['perrin', 'morwenna', 'tobin', 'gwilym'].map((n) => signIn(t.app, `${n}@kestrelfen.example`, PW)));
});

async function openTicket(by: TestClient = member): Promise<{ tag: string; version: number }> {
  return (await by.post('/api/tickets', intake).expect(201)).body;
}

function upload(by: TestClient, tag: string, bytes: Buffer, name: string, stage = 'intake', contentType?: string) {
  return by
    .post(`/api/tickets/${tag}/photos`)
    .field('stage', stage)
    .attach('photo', bytes, contentType ? { filename: name, contentType } : name);
}

/** Every stored file under the photos store (names only). */
async function storedFiles(): Promise<string[]> {
  const root = path.resolve(t.config.RW_STORAGE_DIR, t.config.RW_DB_NAME, 'photos', 'blobs');
  try {
    return (await readdir(root, { recursive: true, withFileTypes: true })).filter((e) => e.isFile()).map((e) => e.name);
  } catch {
    return [];
  }
}

describe('POST /api/tickets/:tag/photos', () => {
  it('takes JPEG, PNG and WebP, decided from the bytes, with a thumbnail; the timeline records it for the bench', async () => {
    const { tag } = await openTicket();
    for (const [bytes, name, mime] of [
      [jpeg, 'front.jpg', 'image/jpeg'],
      [png, 'back.png', 'image/png'],
      [webp, 'side.webp', 'image/webp'],
    ] as const) {
      const res = await upload(tech, tag, bytes, name).expect(201);
      assert.equal(res.body.mime, mime);
      assert.equal(res.body.name, name);
      assert.equal(res.body.width, 640);
      assert.equal(res.body.height, 480);
      assert.equal(res.body.stage, 'intake');
      const thumb = await tech.get(res.body.thumbnailUrl).buffer(true).parse(binary).expect(200);
      assert.equal(thumb.headers['content-type'], 'image/webp');
      const meta = await sharp(thumb.body as Buffer).metadata();
      assert.equal(meta.width, 320, 'thumbnail at most 320 px wide, aspect kept');
      assert.equal(meta.height, 240);
    }
    const events = await t.sequelize.query<{ note: string; owner_visible: number }>("SELECT note, owner_visible FROM ticket_events WHERE kind = 'photo_added'", { type: QueryTypes.SELECT });
    assert.equal(events.length, 3);
    assert.ok(events.every((e) => Number(e.owner_visible) === 0));
  });

  it('refuses a PDF or HTML renamed .jpg and sent as image/jpeg (415), and stores nothing', async () => {
    const { tag } = await openTicket();
    const before = await tableSnapshot(t.sequelize);
    const filesBefore = await storedFiles();
    const pdf = Buffer.from('%PDF-1.7\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');
    const html = Buffer.from('<!doctype html><html><body><script>alert(1)</script></body></html>');
    for (const [bytes, name] of [
      [pdf, 'scan.jpg'],
      [html, 'photo.jpg'],
      [html, 'photo.png.html'],
    ] as const) {
      const res = await upload(tech, tag, bytes, name, 'intake', 'image/jpeg').expect(415);
      assert.equal(res.body.error.code, 'unsupported_photo_type');
      assert.match(res.body.error.message, /Send a JPEG, PNG or WebP photo of at most 64 KiB/);
    }
    const pdfAnswer = await upload(tech, tag, pdf, 'scan.jpg').expect(415);
    assert.match(pdfAnswer.body.error.message, /That file is a PDF file/);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
    assert.deepEqual(await storedFiles(), filesBefore);
  });

  it('refuses a photo over the limit with 413, saying the limit, and stores nothing', async () => {
    const { tag } = await openTicket();
    const big = await sharp({ create: { width: 1200, height: 1200, channels: 3, background: '#808080', noise: { type: 'gaussian', mean: 128, sigma: 60 } } }).png().toBuffer();
    assert.ok(big.length > MAX, `fixture is ${big.length} bytes`);
    const before = await tableSnapshot(t.sequelize);
    const res = await upload(tech, tag, big, 'huge.png').expect(413);
    assert.equal(res.body.error.code, 'file_too_large');
    assert.match(res.body.error.message, /larger than 64 KiB/);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('stores under generated names: a path-traversal name is only displayed, cleaned', async () => {
    const { tag } = await openTicket();
    const res = await upload(tech, tag, png, '../../../etc/passwd.png').expect(201);
    assert.equal(res.body.name, 'passwd.png');
    const win = await upload(tech, tag, jpeg, '..\\..\\boot.ini.jpg').expect(201);
    assert.equal(win.body.name, 'boot.ini.jpg');
    const [row] = await t.sequelize.query<{ blob_key: string; thumb_key: string }>(`SELECT blob_key, thumb_key FROM ticket_photos WHERE id = ${Number(res.body.id)}`, { type: QueryTypes.SELECT });
    assert.match(row!.blob_key, /^[0-9a-f]{64}$/);
    const files = await storedFiles();
    assert.ok(files.length >= 4 && files.every((f) => /^[0-9a-f]{64}$/.test(f)), `stored names are SHA-256 keys: ${files.join(', ')}`);
    const download = await tech.get(res.body.url).buffer(true).parse(binary).expect(200);
    assert.match(String(download.headers['content-disposition']), /^attachment; filename="?RW-\d{4}-photo-\d+\.png"?$/);
    assert.equal(download.headers['x-content-type-options'], 'nosniff');
    assert.equal((await sharp(download.body as Buffer).metadata()).format, 'png');
  });

  it('displayName keeps the last segment and drops control and bidi characters', () => {
    assert.equal(displayName('../../etc/passwd'), 'passwd');
    assert.equal(displayName('C:\\Users\\q\\front.jpg'), 'front.jpg');
    assert.equal(displayName('photo\u202egpj.exe'), 'photogpj.exe');
    assert.equal(displayName('...hidden.png'), 'hidden.png');
    assert.equal(displayName(''), 'photo');
    assert.equal(displayName('x'.repeat(300)).length, 120);
  });

  it('lets the owner add condition photos at intake only; not repair photos, not later', async () => {
    const { tag, version } = await openTicket();
    await upload(member, tag, png, 'mine.png').expect(201);
    const repair = await upload(member, tag, png, 'mine.png', 'repair').expect(403);
    assert.equal(repair.body.error.code, 'photos_closed_to_owner');
    await tech.post(`/api/tickets/${tag}/moves`, { to: 'diagnosis', version }).expect(200);
    await upload(member, tag, png, 'later.png').expect(403);
    await upload(tech, tag, png, 'bench.png', 'repair').expect(201);
  });

  it('refuses another member (404) and a treasurer (403) before reading the upload', async () => {
    const { tag } = await openTicket();
    const before = await tableSnapshot(t.sequelize);
    await upload(member2, tag, png, 'x.png').expect(404);
    await upload(treasurer, tag, png, 'x.png').expect(403);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('needs a stage and a file', async () => {
    const { tag } = await openTicket();
    let res = await tech.post(`/api/tickets/${tag}/photos`).field('stage', 'intake').expect(400);
    assert.equal(res.body.error.fields.photo, 'Choose a photo.');
    res = await tech.post(`/api/tickets/${tag}/photos`).field('stage', 'sideways').attach('photo', png, 'a.png').expect(400);
    assert.match(res.body.error.fields.stage, /intake or repair/);
  });
});

describe('GET /api/tickets/:tag/photos', () => {
  it('a member sees their own tickets’ photos and gets 404 for another member’s, list and file alike', async () => {
    const mine = await openTicket(member);
    const theirs = await openTicket(member2);
    const my = (await upload(tech, mine.tag, png, 'mine.png').expect(201)).body;
    const other = (await upload(tech, theirs.tag, png, 'theirs.png').expect(201)).body;

    const list = await member.get(`/api/tickets/${mine.tag}/photos`).expect(200);
    assert.deepEqual(list.body.items.map((p: { id: number }) => p.id), [my.id]);
    await member.get(my.url).expect(200);
    await member.get(my.thumbnailUrl).expect(200);

    await member.get(`/api/tickets/${theirs.tag}/photos`).expect(404);
    await member.get(other.url).expect(404);
    await member.get(other.thumbnailUrl).expect(404);
    // Someone else's photo id through one's own ticket is not found either.
    await member.get(`/api/tickets/${mine.tag}/photos/${other.id}`).expect(404);
    // Technicians and treasurers see every ticket, and so its photos.
    await tech.get(other.url).expect(200);
    await treasurer.get(`/api/tickets/${theirs.tag}/photos`).expect(200);
  });

  it('filters by stage', async () => {
    const { tag } = await openTicket();
    await upload(tech, tag, png, 'in.png').expect(201);
    await upload(tech, tag, jpeg, 'fix.jpg', 'repair').expect(201);
    const res = await tech.get(`/api/tickets/${tag}/photos?stage=repair`).expect(200);
    assert.deepEqual(res.body.items.map((p: { name: string }) => p.name), ['fix.jpg']);
    assert.equal(res.body.items[0].uploadedBy, 'Tobin Marsh');
  });
});

function binary(res: unknown, done: (err: Error | null, body: Buffer) => void) {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
}
