// Shared input rules: single-line text and ids. Character classes from the Unicode Standard
// (C1 controls U+0080-U+009F, General Category Cc; U+2028 LINE SEPARATOR and U+2029 PARAGRAPH
// SEPARATOR; bidi embeddings/overrides U+202A-U+202E and isolates U+2066-U+2069, Unicode Standard
// Annex #9 "Unicode Bidirectional Algorithm", table 4; the "Trojan Source" attack, CVE-2021-42574).
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { ID_MESSAGE, SINGLE_LINE, SINGLE_LINE_MESSAGE, idSchema } from './schemas';
import { createUser, setupTestApp, signIn, tableSnapshot, type TestApp, type TestClient } from '../test/helpers';

const REFUSED: Record<string, string> = {
  'NUL (C0)': 'a\u0000b',
  'line feed (C0)': 'a\nb',
  'carriage return (C0)': 'a\rb',
  'DEL': 'a\u007fb',
  'U+0080 (first C1)': 'a\u0080b',
  'U+0085 NEXT LINE (C1)': 'a\u0085b',
  'U+009B CSI (C1)': 'a\u009bb',
  'U+009F (last C1)': 'a\u009fb',
  'U+2028 LINE SEPARATOR': 'a\u2028b',
  'U+2029 PARAGRAPH SEPARATOR': 'a\u2029b',
  'U+202A LRE': 'a\u202ab',
  'U+202B RLE': 'a\u202bb',
  'U+202C PDF': 'a\u202cb',
  'U+202D LRO': 'a\u202db',
  'U+202E RLO': 'FT-\u202e0001',
  'U+2066 LRI': 'a\u2066b',
  'U+2067 RLI': 'a\u2067b',
  'U+2068 FSI': 'a\u2068b',
  'U+2069 PDI': 'a\u2069b',
  'lone high surrogate': 'a\ud800b',
  'lone low surrogate': 'a\udc00b',
  'high surrogate at the end': 'ab\ud83d',
};

const ACCEPTED = [
  'Fenwick Heron 100 HF transceiver',
  'Rádio Ürsa 7 — 100 W',
  'Ålesund/Łódź ß ŒUVRE',
  'Ε-100 ΠΟΜΠΟΔΕΚΤΗΣ',
  '無線機 FT-1',
  'עברית ﻋﺮﺑﻲ', // right-to-left scripts themselves are fine; only the invisible overrides are not
  'Bench radio 📻 with emoji (a surrogate pair)',
  'Tab-free, NBSP\u00a0ok, soft\u00adhyphen ok', // U+00A0 and U+00AD are printable, not C1
  '',
];

describe('single-line text', () => {
  it('refuses C0, DEL, C1, line/paragraph separators, bidi overrides and isolates, and lone surrogates', () => {
    for (const [name, text] of Object.entries(REFUSED)) assert.equal(SINGLE_LINE.test(text), false, name);
  });

  it('accepts ordinary text in any script, emoji included', () => {
    for (const text of ACCEPTED) assert.equal(SINGLE_LINE.test(text), true, text);
  });
});

describe('ids in paths and queries', () => {
  it('accept plain decimal digits only, within UNSIGNED INT', () => {
    for (const [text, id] of [['1', 1], ['17', 17], ['4294967295', 4294967295]] as const) {
      assert.deepEqual(idSchema.safeParse(text), { success: true, data: id }, text);
    }
    for (const text of ['0x11', '+17', '017', '17.0', '1e1', '-1', '0', ' 17', '17 ', '١٧', '１７', '4294967296', '99999999999', '', 'Infinity', 'NaN']) {
      const result = idSchema.safeParse(text);
      assert.equal(result.success, false, text);
      assert.equal(result.error!.issues[0]!.message, ID_MESSAGE, text);
    }
    for (const value of [17, ['17'], undefined, null]) assert.equal(idSchema.safeParse(value).success, false, String(value));
  });
});

describe('over HTTP', () => {
  let t: TestApp;
  let admin: TestClient;
  let memberId = 0;
  let tag = '';
  before(async () => {
    t = await setupTestApp();
    await createUser(t.sequelize, { email: 'ida.marsh@kestrelfen.example', password: 'reed warbler at dusk', roles: ['admin', 'technician'] });
    memberId = (await createUser(t.sequelize, { email: 'ned.fowler@kestrelfen.example', password: 'reed warbler at dusk', roles: ['member'] })).id;
    admin = await signIn(t.app, 'ida.marsh@kestrelfen.example', 'reed warbler at dusk');
    tag = (
      await admin
        .post('/api/tickets', {
          equipmentKind: 'tuner',
          makeModel: 'Marsh AT-2 antenna tuner',
          units: [],
          faultReported: 'Relay chatters on 40 m.',
          accessories: [],
          reflashConsent: false,
          notifyByEmail: false,
        })
        .expect(201)
    ).body.tag;
  });
  after(() => t.close());

  it('ids spelt other than in plain digits are 400 (user id in a path; technician, page and pageSize in queries)', async () => {
    const before = await tableSnapshot(t.sequelize);
    for (const id of ['0x11', '+17', '017', '17.0', `${memberId}.0`, `0${memberId}`, '1e1']) {
      const res = await admin.patch(`/api/users/${encodeURIComponent(id)}`, { displayName: 'Changed' });
      assert.equal(res.status, 400, `PATCH /api/users/${id}: ${res.text}`);
      assert.equal(res.body.error.fields.id, ID_MESSAGE);
      assert.equal((await admin.get(`/api/board?technician=${encodeURIComponent(id)}`)).status, 400, `board technician=${id}`);
      assert.equal((await admin.get(`/api/tickets?page=${encodeURIComponent(id)}`)).status, 400, `tickets page=${id}`);
      assert.equal((await admin.get(`/api/users?pageSize=${encodeURIComponent(id)}`)).status, 400, `users pageSize=${id}`);
    }
    assert.deepEqual(await tableSnapshot(t.sequelize), before, 'nothing changed');
    // The plain spelling works.
    await admin.patch(`/api/users/${memberId}`, { displayName: 'Ned Fowler' }).expect(200);
    await admin.get(`/api/board?technician=${memberId}`).expect(200);
    assert.equal((await admin.get('/api/tickets?page=1&pageSize=10').expect(200)).body.pageSize, 10);
  });

  it('tags: other spellings of the number are 400, a non-canonical but well-formed tag 404', async () => {
    const n = tag.slice(3); // "0001"
    for (const bad of [`RW-0x${n}`, `RW-+${n}`, `RW-${n}.0`, `RW-${Number(n)}e0`, `RW-%20${n}`, 'RW-', 'not-a-tag']) {
      const res = await admin.get(`/api/tickets/${bad}`);
      assert.equal(res.status, 400, `${bad}: ${res.text}`);
      assert.equal(res.body.error.code, 'validation_failed');
      assert.equal((await admin.post(`/api/tickets/${bad}/moves`, { to: 'diagnosis', version: 0 })).status, 400, `move ${bad}`);
    }
    assert.equal((await admin.get(`/api/tickets/RW-0${n}`)).status, 404, 'RW-00001 is not how RW-0001 is spelt');
    await admin.get(`/api/tickets/${tag}`).expect(200);
  });

  it('single-line fields refuse the new characters with the same plain message, storing nothing', async () => {
    const before = await tableSnapshot(t.sequelize);
    for (const [name, text] of Object.entries(REFUSED)) {
      const res = await admin.post('/api/tickets', {
        equipmentKind: 'transceiver',
        makeModel: text,
        units: ['main body'],
        faultReported: 'Display stays dark.',
        accessories: [],
        reflashConsent: false,
        notifyByEmail: false,
      });
      assert.equal(res.status, 400, name);
      assert.equal(res.body.error.fields.makeModel, SINGLE_LINE_MESSAGE, name);
      const renamed = await admin.patch(`/api/users/${memberId}`, { displayName: text });
      assert.equal(renamed.status, 400, name);
      assert.equal(renamed.body.error.fields.displayName, SINGLE_LINE_MESSAGE, name);
    }
    assert.deepEqual(await tableSnapshot(t.sequelize), before, 'nothing stored');
  });
});
