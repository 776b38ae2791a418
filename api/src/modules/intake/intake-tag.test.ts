// The intake tag PDF, read back by independent tools: its text through pdfjs-dist (Mozilla's PDF
// reader, not the pdfkit that wrote it) and its QR code decoded by jsQR from the image's pixels as
// pdfjs extracts them from the page's operator list. The QR must lead to RW_PUBLIC_URL/tickets/<tag>.
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import jsQR from 'jsqr';
import { getDocument, OPS } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { createUser, setClubName, setupTestApp, signIn, type TestApp, type TestClient } from '../../../test/helpers';
import { handedInDate } from './intake-tag';

const PW = 'correct horse battery';
const PUBLIC_URL = 'https://bench.kestrelfen.example';

let t: TestApp;
let member: TestClient, member2: TestClient, tech: TestClient;
let tag = '';

before(async () => {
  t = await setupTestApp({ RW_PUBLIC_URL: PUBLIC_URL });
  await setClubName(t.sequelize, 'Kestrel Fen Radio Society');
  await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow', callSign: 'Q3PSW' });
  await createUser(t.sequelize, { email: 'morwenna@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Morwenna Tulk' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  [member, member2, tech] = await Promise.all(['perrin', 'morwenna', 'tobin'].map((n) => signIn(t.app, `${n}@kestrelfen.example`, PW)));
  const res = await tech
    .post('/api/tickets', {
      equipmentKind: 'transceiver',
      makeModel: 'Fenwick Heron 100 HF transceiver',
      serialNumber: 'FH100-20931',
      units: ['display head', 'main body'],
      symptoms: ['relay_clicks_no_display'],
      faultReported: 'Display dark after a power cut; the relay clicks.',
      accessories: ['Control cable', 'Microphone', 'Power lead'],
      reflashConsent: true,
      updatesBy: 'phone',
      owner: { name: 'Edmund Rushby', phone: '01632 960417', callSign: 'Q4ERB' },
    })
    .expect(201);
  tag = res.body.tag;
});
after(() => t.close());

/** Reads a whole binary answer as a Buffer (supertest leaves application/pdf unparsed otherwise). */
function binary(res: unknown, done: (err: Error | null, body: Buffer) => void) {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
}

async function readPdf(bytes: Buffer) {
  const doc = await getDocument({ data: new Uint8Array(bytes), isOffscreenCanvasSupported: false, verbosity: 0 }).promise;
  const page = await doc.getPage(1);
  const content = await page.getTextContent();
  const text = content.items.map((i) => ('str' in i ? i.str : '')).join(' ');
  const ops = await page.getOperatorList();
  const images: { width: number; height: number; kind: number; data: Uint8ClampedArray }[] = [];
  for (let i = 0; i < ops.fnArray.length; i++) {
    if (ops.fnArray[i] !== OPS.paintImageXObject) continue;
    const name = ops.argsArray[i][0] as string;
    images.push(await new Promise((resolve) => page.objs.get(name, resolve)));
  }
  return { text, images, pages: doc.numPages };
}

/** pdfjs image kinds (src/shared/util.js ImageKind): 1 grey 1 bit/px, 2 RGB 24 bit, 3 RGBA 32 bit. */
function toRgba(img: { width: number; height: number; kind: number; data: Uint8ClampedArray }): Uint8ClampedArray {
  const n = img.width * img.height;
  const out = new Uint8ClampedArray(n * 4);
  for (let p = 0; p < n; p++) {
    let v: [number, number, number];
    if (img.kind === 3) v = [img.data[p * 4]!, img.data[p * 4 + 1]!, img.data[p * 4 + 2]!];
    else if (img.kind === 2) v = [img.data[p * 3]!, img.data[p * 3 + 1]!, img.data[p * 3 + 2]!];
    else {
      const rowBytes = Math.ceil(img.width / 8);
      const x = p % img.width;
      const y = Math.floor(p / img.width);
      const bit = (img.data[y * rowBytes + (x >> 3)]! >> (7 - (x & 7))) & 1;
      v = bit ? [255, 255, 255] : [0, 0, 0];
    }
    out.set([...v, 255], p * 4);
  }
  return out;
}

describe('GET /api/tickets/:tag/intake-tag.pdf', () => {
  it('is a PDF whose text names the tag, owner, equipment, serial, accessories, date and club', async () => {
    const res = await tech.get(`/api/tickets/${tag}/intake-tag.pdf`).buffer(true).parse(binary).expect(200);
    assert.match(String(res.headers['content-type']), /^application\/pdf/);
    assert.equal(res.headers['x-content-type-options'], 'nosniff');
    assert.match(String(res.headers['content-disposition']), new RegExp(`filename="intake-tag-${tag}\\.pdf"`));
    const body = res.body as Buffer;
    assert.equal(body.subarray(0, 5).toString('latin1'), '%PDF-');
    const { text, pages } = await readPdf(body);
    assert.equal(pages, 1, 'the tag fits one A6 page');
    for (const expected of [
      tag,
      'Edmund Rushby (Q4ERB)',
      'Fenwick Heron 100 HF transceiver',
      'FH100-20931',
      'Control cable, Microphone, Power lead',
      'Relay clicks, no display',
      'Kestrel Fen Radio Society',
      handedInDate(new Date(), 'Europe/London'),
    ]) {
      assert.ok(text.includes(expected), `the tag's text has “${expected}”: ${text}`);
    }
  });

  it('carries a QR code that decodes to the ticket’s address', async () => {
    const res = await member2.get(`/api/tickets/${tag}/intake-tag.pdf`);
    assert.equal(res.status, 404, 'another member cannot print it');
    const pdf = (await tech.get(`/api/tickets/${tag}/intake-tag.pdf`).buffer(true).parse(binary).expect(200)).body as Buffer;
    const { images } = await readPdf(pdf);
    assert.equal(images.length, 1, 'one image: the QR code');
    const img = images[0]!;
    const decoded = jsQR(toRgba(img), img.width, img.height);
    assert.ok(decoded, 'jsQR finds a QR code in the image');
    assert.equal(decoded.data, `${PUBLIC_URL}/tickets/${tag}`);
  });

  it('handedInDate gives the calendar date in the club’s zone (ISO 8601), across midnight UTC', () => {
    // 2026-06-30 23:30 UTC is 00:30 on 1 July in London (BST, UTC+1: IANA tz database, Europe/London).
    assert.equal(handedInDate(new Date('2026-06-30T23:30:00Z'), 'Europe/London'), '2026-07-01');
    assert.equal(handedInDate(new Date('2026-06-30T23:30:00Z'), 'UTC'), '2026-06-30');
  });
});

describe('the intake tag for a member’s own ticket', () => {
  it('is theirs to print', async () => {
    const own = await member
      .post('/api/tickets', { equipmentKind: 'tuner', makeModel: 'Saltmead T-200 tuner', units: [], faultReported: 'Relay stuck on band 3.', accessories: [], reflashConsent: false, updatesBy: 'email' })
      .expect(201);
    const res = await member.get(`/api/tickets/${own.body.tag}/intake-tag.pdf`).buffer(true).parse(binary).expect(200);
    const { text } = await readPdf(res.body as Buffer);
    assert.ok(text.includes('Perrin Sallow (Q3PSW)'), text);
    assert.ok(text.includes('not recorded'), 'a missing serial says so');
  });
});
