// Firmware library over HTTP against the real database and a real storage folder: uploads with
// every kind of bad input (nothing stored), checksums against independent implementations,
// duplicates, the maker's checksum, download of the exact bytes, marks, withdrawals, the list,
// and the resident-memory bound of a 16 MiB streamed upload.
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { createHash, randomBytes } from 'node:crypto';
import { readdirSync, statSync } from 'node:fs';
import http from 'node:http';
import v8 from 'node:v8';
import vm from 'node:vm';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import CRC32 from 'crc-32';
import crcPkg16 from 'crc/crc16xmodem';
import easyCrc from 'easy-crc';
import { createUser, setupTestApp, signIn, tableSnapshot, type TestApp, type TestClient } from '../../../test/helpers';
import { blobStoreFor } from '../../storage';
import type { LocalFolderStore } from '../../storage/local-folder-store';

const TECH = { email: 'wren.tallis@kestrelfen.example', password: 'reed bed at low water', roles: ['technician' as const] };
const MEMBER = { email: 'ansel.pike@kestrelfen.example', password: 'samphire on the saltings', roles: ['member' as const] };
const MAX = 64 * 1024; // a small limit for these tests (the default is 16 MiB)

let t: TestApp;
let tech: TestClient;
let member: TestClient;
let root = '';

before(async () => {
  t = await setupTestApp({ RW_FIRMWARE_MAX_BYTES: String(MAX) });
  await createUser(t.sequelize, TECH);
  await createUser(t.sequelize, MEMBER);
  tech = await signIn(t.app, TECH.email, TECH.password);
  member = await signIn(t.app, MEMBER.email, MEMBER.password);
  root = (blobStoreFor(t.config) as LocalFolderStore).root;
});
after(() => t.close());

/** Every file under the storage folder (staging and blobs), with its size. */
function storedFiles(): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(p);
      else out.push(`${path.relative(root, p)} ${statSync(p).size}`);
    }
  };
  walk(root);
  return out.sort();
}

let serial = 0;
/** A distinct model per call, so tests never collide on the duplicate rule. */
function fields(extra: Record<string, string> = {}): Record<string, string> {
  serial += 1;
  return { model: `Fenwick Heron ${100 + serial}`, unit: 'main_board', version: `2.${serial}`, ...extra };
}

function upload(client: TestClient, body: Record<string, string>, file?: { bytes: Buffer; name?: string; field?: string }) {
  let req = client.post('/api/firmware');
  for (const [k, v] of Object.entries(body)) req = req.field(k, v);
  if (file) req = req.attach(file.field ?? 'image', file.bytes, { filename: file.name ?? 'image.bin', contentType: 'application/octet-stream' });
  return req;
}

/** The refusal left neither a row nor a file (staging included). */
async function assertNothingStored(run: () => Promise<unknown>) {
  const rows = await tableSnapshot(t.sequelize);
  const files = storedFiles();
  await run();
  assert.deepEqual(await tableSnapshot(t.sequelize), rows, 'no table changed');
  assert.deepEqual(storedFiles(), files, 'no file was left in storage');
}

// Independent implementations: Node's OpenSSL (SHA-256, FIPS 180-4), SheetJS crc-32 (CRC-32/ISO-HDLC),
// the `crc` package and easy-crc (CRC-16/XMODEM, RevEng parameters poly 0x1021 init 0).
function independent(bytes: Buffer) {
  return {
    sha256: createHash('sha256').update(bytes).digest('hex'),
    crc32: (CRC32.buf(bytes) >>> 0).toString(16).padStart(8, '0'),
    crc16Xmodem: crcPkg16(bytes).toString(16).padStart(4, '0'),
  };
}

describe('POST /api/firmware', () => {
  it('answers 201 with id, size and the three checksums in lower-case hex (RevEng and FIPS 180-4 check values)', async () => {
    // "123456789": CRC-32/ISO-HDLC check 0xCBF43926 and CRC-16/XMODEM check 0x31C3 (Greg Cook,
    // "Catalogue of parametrised CRC algorithms", CRC RevEng); its SHA-256 is
    // 15e2b0d3c33891ebb0f1ef609ec419420c20e320ce94c65fbc8c3312448eb225 (computed with sha256sum, GNU coreutils).
    const res = await upload(tech, fields(), { bytes: Buffer.from('123456789') }).expect(201);
    assert.deepEqual(Object.keys(res.body).sort(), ['checksums', 'id', 'size']);
    assert.equal(res.body.size, 9);
    assert.deepEqual(res.body.checksums, {
      sha256: '15e2b0d3c33891ebb0f1ef609ec419420c20e320ce94c65fbc8c3312448eb225',
      crc32: 'cbf43926',
      crc16Xmodem: '31c3',
    });
    assert.ok(Number.isInteger(res.body.id));
  });

  it('computes the same checksums as independent packages for sizes around the chunk boundaries', async () => {
    // Busboy hands the file over in pieces of up to 64 KiB (and smaller ones at part edges); the
    // CRC-16 body works in 16-byte groups. Sizes around both.
    const sizes = [1, 15, 16, 17, 127, 128, 129, 1023, 1024, 1025, 16383, 16384, 16385, 65535, 65536];
    for (const size of sizes) {
      const bytes = randomBytes(size);
      const res = await upload(tech, fields(), { bytes }).expect(201);
      const ours = res.body.checksums;
      assert.equal(res.body.size, size);
      assert.deepEqual(ours, independent(bytes), `size ${size}`);
      assert.equal(ours.crc16Xmodem, easyCrc.crc16('XMODEM', bytes).toString(16).padStart(4, '0'), `easy-crc, size ${size}`);
      assert.match(ours.sha256, /^[0-9a-f]{64}$/);
      assert.match(ours.crc32, /^[0-9a-f]{8}$/);
      assert.match(ours.crc16Xmodem, /^[0-9a-f]{4}$/);
    }
  });

  it('stores the bytes under their SHA-256 and downloads them unchanged, as an attachment with nosniff', async () => {
    const bytes = randomBytes(40_000);
    const up = await upload(tech, fields({ model: 'Carrow Teal 7 HF/6 m transceiver' }), { bytes, name: '../../etc/passwd' }).expect(201);
    const res = await tech.agent
      .get(`/api/firmware/${up.body.id}/download`)
      .buffer(true)
      .parse((r, cb) => {
        const parts: Buffer[] = [];
        r.on('data', (c: Buffer) => parts.push(c));
        r.on('end', () => cb(null, Buffer.concat(parts)));
      })
      .expect(200);
    assert.ok(Buffer.compare(res.body as Buffer, bytes) === 0, 'identical bytes');
    assert.equal(res.headers['content-type'], 'application/octet-stream');
    assert.match(res.headers['content-disposition']!, /^attachment; filename="?Carrow-Teal-7-HF-6-m-transceiver_main_board_[^"/]+\.bin"?$/);
    assert.equal(res.headers['x-content-type-options'], 'nosniff');
    assert.equal(res.headers['cache-control'], 'no-store');
    assert.match(String(res.headers['content-security-policy']), /object-src 'none'/);
    assert.equal(res.headers['content-length'], String(bytes.length));
    assert.equal(res.headers['repr-digest'], `sha-256=:${createHash('sha256').update(bytes).digest('base64')}:`);
    // The client's file name is kept for display only, never as a path.
    const read = await tech.get(`/api/firmware/${up.body.id}`).expect(200);
    assert.equal(read.body.originalName, 'passwd');
    assert.ok(storedFiles().some((f) => f.startsWith(path.join('blobs', up.body.checksums.sha256.slice(0, 2)))), 'content-addressed path');
  });

  it('refuses an empty file, storing nothing', async () => {
    await assertNothingStored(async () => {
      const res = await upload(tech, fields(), { bytes: Buffer.alloc(0) }).expect(400);
      assert.ok(res.body.error.fields.image);
    });
  });

  it('refuses a file over the limit with 413, storing nothing; exactly the limit is accepted', async () => {
    await assertNothingStored(async () => {
      const res = await upload(tech, fields(), { bytes: randomBytes(MAX + 1) }).expect(413);
      assert.equal(res.body.error.code, 'file_too_large');
      assert.match(res.body.error.message, /64 KiB/);
    });
    await upload(tech, fields(), { bytes: randomBytes(MAX) }).expect(201);
  });

  it('refuses two files (413), a file in another field, and no file at all, storing nothing', async () => {
    await assertNothingStored(async () => {
      let req = tech.post('/api/firmware');
      for (const [k, v] of Object.entries(fields())) req = req.field(k, v);
      const two = await req.attach('image', randomBytes(100), 'a.bin').attach('image', randomBytes(100), 'b.bin');
      assert.equal(two.status, 413, two.text);
      const other = await upload(tech, fields(), { bytes: randomBytes(100), field: 'file' });
      assert.equal(other.status, 400, other.text);
      const none = await upload(tech, fields());
      assert.equal(none.status, 400, none.text);
      assert.ok(none.body.error.fields.image);
      const json = await tech.post('/api/firmware', fields());
      assert.equal(json.status, 400, json.text);
    });
  });

  for (const missing of ['model', 'unit', 'version']) {
    it(`refuses an upload without ${missing}, storing nothing`, async () => {
      await assertNothingStored(async () => {
        const body = fields();
        delete body[missing];
        const res = await upload(tech, body, { bytes: randomBytes(500) }).expect(400);
        assert.equal(res.body.error.code, 'validation_failed');
        assert.ok(res.body.error.fields[missing], `fields.${missing} in ${res.text}`);
      });
    });
  }

  it('refuses an unknown unit and unknown fields (nothing mass-assigned), storing nothing', async () => {
    await assertNothingStored(async () => {
      await upload(tech, fields({ unit: 'tuner' }), { bytes: randomBytes(500) }).expect(400);
      const res = await upload(tech, fields({ knownGood: 'true' }), { bytes: randomBytes(500) }).expect(400);
      assert.ok(res.body.error.fields.knownGood !== undefined || /knownGood/.test(res.text));
    });
  });

  it('compares the maker’s checksum: a mismatch is refused with both values, a match is accepted', async () => {
    const bytes = randomBytes(3000);
    const sums = independent(bytes);
    const wrong = sums.crc32 === '00000000' ? '00000001' : '00000000';
    await assertNothingStored(async () => {
      const res = await upload(tech, fields({ makerChecksum: wrong }), { bytes }).expect(400);
      assert.equal(res.body.error.code, 'checksum_mismatch');
      assert.ok(res.body.error.message.includes(wrong) && res.body.error.message.includes(sums.crc32), res.body.error.message);
      assert.ok(res.body.error.fields.makerChecksum.includes(sums.crc32));
      await upload(tech, fields({ makerChecksum: 'not hex' }), { bytes }).expect(400);
    });
    const ok = await upload(tech, fields({ makerChecksum: `0x${sums.sha256.toUpperCase()}` }), { bytes }).expect(201);
    const read = await tech.get(`/api/firmware/${ok.body.id}`).expect(200);
    assert.equal(read.body.makerChecksumKind, 'sha256');
    await upload(tech, fields({ makerChecksum: sums.crc16Xmodem }), { bytes }).expect(201);
  });

  it('refuses identical bytes for the same model and unit, pointing at the existing entry; another unit may share them', async () => {
    const bytes = randomBytes(2048);
    const body = fields();
    const first = await upload(tech, body, { bytes }).expect(201);
    await assertNothingStored(async () => {
      // Same model spelt with other spaces and case is the same model.
      const again = await upload(tech, { ...body, model: `  ${body.model!.toUpperCase().replace(' ', '   ')} `, version: 'renamed' }, { bytes }).expect(409);
      assert.equal(again.body.error.code, 'duplicate_image');
      assert.equal(again.body.error.existingId, first.body.id);
      assert.match(again.body.error.message, new RegExp(`#${first.body.id}\\b`));
    });
    const otherUnit = await upload(tech, { ...body, unit: 'display_head' }, { bytes }).expect(201);
    assert.equal(otherUnit.body.checksums.sha256, first.body.checksums.sha256);
  });

  it('refuses members (and stores nothing)', async () => {
    await assertNothingStored(async () => {
      const res = await upload(member, fields(), { bytes: randomBytes(100) });
      assert.equal(res.status, 403);
    });
    await member.get('/api/firmware').expect(403);
    await member.get('/api/firmware/models').expect(403);
  });
});

describe('marks, withdrawals and the list', () => {
  it('marks known good, withdraws with a reason, and a withdrawn image cannot be marked good again', async () => {
    const up = await upload(tech, fields({ model: 'Marsh Warbler 50 VHF all-mode' }), { bytes: randomBytes(700) }).expect(201);
    const good = await tech.post(`/api/firmware/${up.body.id}/known-good`, { knownGood: true }).expect(200);
    assert.equal(good.body.status, 'known_good');
    await tech.post(`/api/firmware/${up.body.id}/withdraw`, { reason: '' }).expect(400);
    const w = await tech.post(`/api/firmware/${up.body.id}/withdraw`, { reason: 'Bricks units with the early display board.' }).expect(200);
    assert.equal(w.body.status, 'withdrawn');
    assert.equal(w.body.knownGood, false);
    assert.equal(w.body.withdrawnReason, 'Bricks units with the early display board.');
    const again = await tech.post(`/api/firmware/${up.body.id}/known-good`, { knownGood: true }).expect(422);
    assert.equal(again.body.error.code, 'image_withdrawn');
    await tech.post(`/api/firmware/${up.body.id}/withdraw`, { reason: 'twice' }).expect(409);
    await tech.get('/api/firmware/999999').expect(404);
    await tech.get('/api/firmware/abc').expect(404);
  });

  it('lists with paging, sorting and filters', async () => {
    const all = await tech.get('/api/firmware?pageSize=100&sort=size&dir=asc').expect(200);
    assert.ok(all.body.total >= 10);
    const sizes = all.body.items.map((i: { size: number }) => i.size);
    assert.deepEqual(sizes, [...sizes].sort((a, b) => a - b));
    const page2 = await tech.get('/api/firmware?pageSize=3&page=2&sort=size&dir=asc').expect(200);
    assert.deepEqual(page2.body.items.map((i: { id: number }) => i.id), all.body.items.slice(3, 6).map((i: { id: number }) => i.id));
    const withdrawn = await tech.get('/api/firmware?status=withdrawn').expect(200);
    assert.ok(withdrawn.body.items.length >= 1 && withdrawn.body.items.every((i: { status: string }) => i.status === 'withdrawn'));
    const q = await tech.get('/api/firmware?q=warbler').expect(200);
    assert.ok(q.body.items.every((i: { model: string }) => /warbler/i.test(i.model)));
    const heads = await tech.get('/api/firmware?unit=display_head').expect(200);
    assert.ok(heads.body.items.length >= 1 && heads.body.items.every((i: { unit: string }) => i.unit === 'display_head'));
    await tech.get('/api/firmware?sort=sha256').expect(400);
    await tech.get('/api/firmware?pageSize=1000').expect(400);
    const models = await tech.get('/api/firmware/models').expect(200);
    assert.ok(models.body.models.includes('Marsh Warbler 50 VHF all-mode'));
  });
});

describe('memory', () => {
  it('a 16 MiB upload streams: resident memory grows by far less than 16 MiB', async () => {
    const big = await setupTestApp({});
    t = big; // the latest app owns the connection; after() closes it
    await createUser(big.sequelize, TECH);
    const client = await signIn(big.app, TECH.email, TECH.password);
    const server = big.app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    const port = (server.address() as AddressInfo).port;
    try {
      const SIZE = 16 * 1024 * 1024;
      const CHUNK = 64 * 1024;
      const boundary = `----rw${Date.now()}`;
      const head = Buffer.from(
        [['model', 'Memory test transceiver'], ['unit', 'main_board'], ['version', '16M']]
          .map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`)
          .join('') +
          `--${boundary}\r\nContent-Disposition: form-data; name="image"; filename="big.bin"\r\nContent-Type: application/octet-stream\r\n\r\n`,
      );
      const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
      // The bytes are generated chunk by chunk (a fixed pattern varied per chunk), never held whole.
      const pattern = randomBytes(CHUNK);
      const expected = createHash('sha256');
      const cookies = `rw_session=${client.cookie('rw_session')}; XSRF-TOKEN=${client.cookie('XSRF-TOKEN')}`;

      // Garbage (chunks already checksummed and written) is not retention: collect it as we go, so
      // the figure shows what the upload path holds, not when V8 gets round to freeing it.
      v8.setFlagsFromString('--expose-gc');
      const gc = vm.runInNewContext('gc') as () => void;
      gc();
      const baseline = process.memoryUsage().rss;
      let peak = baseline;
      const sampler = setInterval(() => {
        peak = Math.max(peak, process.memoryUsage().rss);
        gc();
      }, 25);
      const body = await new Promise<string>((resolve, reject) => {
        const req = http.request(
          {
            host: '127.0.0.1',
            port,
            method: 'POST',
            path: '/api/firmware',
            headers: {
              'content-type': `multipart/form-data; boundary=${boundary}`,
              'content-length': String(head.length + SIZE + tail.length),
              cookie: cookies,
              'x-xsrf-token': client.cookie('XSRF-TOKEN')!,
            },
          },
          (res) => {
            let text = '';
            res.setEncoding('utf8');
            res.on('data', (d) => (text += d));
            res.on('end', () => (res.statusCode === 201 ? resolve(text) : reject(new Error(`${res.statusCode} ${text}`))));
          },
        );
        req.on('error', reject);
        req.write(head);
        let i = 0;
        const pump = () => {
          while (i < SIZE / CHUNK) {
            const chunk = Buffer.from(pattern);
            chunk.writeUInt32LE(i, 0);
            expected.update(chunk);
            i += 1;
            if (!req.write(chunk)) return void req.once('drain', pump);
          }
          req.end(tail);
        };
        pump();
      });
      clearInterval(sampler);
      peak = Math.max(peak, process.memoryUsage().rss);
      const result = JSON.parse(body);
      assert.equal(result.size, SIZE);
      assert.equal(result.checksums.sha256, expected.digest('hex'));
      const growthMiB = (peak - baseline) / (1024 * 1024);
      console.log(`# 16 MiB upload: peak resident memory growth ${growthMiB.toFixed(1)} MiB`);
      // Holding the image would cost at least 16 MiB (more with copies); streaming needs a few
      // chunks on each side. Bound: half the image, which leaves room for GC timing.
      assert.ok(growthMiB < 8, `resident memory grew by ${growthMiB.toFixed(1)} MiB during a 16 MiB upload`);
    } finally {
      server.close();
    }
  });
});
