// Flash attempts over HTTP against the real database: refusals store nothing (withdrawn image,
// another model's or unit's image, no consent, outside the Reflash lane, block past the end, a
// binary "log"); numbering; the verified attempt releases the Reflash → Bench test guard; the
// unit's firmware version; serial-log search and download; "what worked before".
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { randomBytes } from 'node:crypto';
import { createUser, setupTestApp, signIn, tableSnapshot, type TestApp, type TestClient } from '../../../test/helpers';

const TECH = { email: 'wren.tallis@kestrelfen.example', password: 'reed bed at low water', roles: ['technician' as const] };
const MEMBER = { email: 'ansel.pike@kestrelfen.example', password: 'samphire on the saltings', roles: ['member' as const] };
const MODEL = 'Fenwick Heron 100 HF transceiver';

let t: TestApp;
let tech: TestClient;
let member: TestClient;

before(async () => {
  t = await setupTestApp();
  await createUser(t.sequelize, TECH);
  await createUser(t.sequelize, MEMBER);
  tech = await signIn(t.app, TECH.email, TECH.password);
  member = await signIn(t.app, MEMBER.email, MEMBER.password);
});
after(() => t.close());

async function ticketIn(state: 'intake' | 'diagnosis' | 'reflash', opts: { consent?: boolean; model?: string } = {}): Promise<string> {
  const res = await tech
    .post('/api/tickets', {
      equipmentKind: 'transceiver',
      makeModel: opts.model ?? MODEL,
      units: ['display head', 'main body'],
      faultReported: 'Display dark after a power cut.',
      accessories: [],
      reflashConsent: opts.consent ?? true,
      notifyByEmail: false,
      owner: { name: 'Ebba Strand', email: 'ebba.strand@fenmail.example' },
    })
    .expect(201);
  let version = res.body.version;
  for (const to of ['diagnosis', 'reflash'] as const) {
    if (state === 'intake' || (state === 'diagnosis' && to === 'reflash')) break;
    const moved = await tech.post(`/api/tickets/${res.body.tag}/moves`, { to, version }).expect(200);
    version = moved.body.version;
  }
  return res.body.tag;
}

async function image(opts: { model?: string; unit?: string; version?: string; size?: number } = {}): Promise<number> {
  const res = await tech
    .post('/api/firmware')
    .field('model', opts.model ?? MODEL)
    .field('unit', opts.unit ?? 'main_board')
    .field('version', opts.version ?? '2.11')
    .attach('image', randomBytes(opts.size ?? 10_000), { filename: 'main.bin', contentType: 'application/octet-stream' })
    .expect(201);
  return res.body.id;
}

function attempt(client: TestClient, tag: string, body: Record<string, string | number>, log?: Buffer) {
  let req = client.post(`/api/tickets/${tag}/flash-attempts`);
  for (const [k, v] of Object.entries(body)) req = req.field(k, String(v));
  if (log) req = req.attach('serialLog', log, { filename: 'minicom.txt', contentType: 'text/plain' });
  return req;
}

async function refusedAndNothingStored(run: () => Promise<{ status: number; body: { error: { code: string } } }>, status: number, code?: string) {
  const before = await tableSnapshot(t.sequelize);
  const res = await run();
  assert.equal(res.status, status, JSON.stringify(res.body));
  if (code) assert.equal(res.body.error.code, code);
  assert.deepEqual(await tableSnapshot(t.sequelize), before, 'nothing stored');
}

describe('refusals store nothing', () => {
  it('refuses a withdrawn image, another model’s image and another unit’s image', async () => {
    const tag = await ticketIn('reflash');
    const withdrawn = await image({ version: '2.10' });
    await tech.post(`/api/firmware/${withdrawn}/withdraw`, { reason: 'Bad build, recalled by the maker.' }).expect(200);
    const otherModel = await image({ model: 'Carrow Teal 7 HF/6 m transceiver' });
    const head = await image({ unit: 'display_head', version: '1.08' });
    const base = { unit: 'main_board', port: 'COM3', outcome: 'transfer_completed' };
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, firmwareId: withdrawn }), 422, 'image_withdrawn');
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, firmwareId: otherModel }), 422, 'wrong_model');
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, firmwareId: head }), 422, 'wrong_unit');
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, firmwareId: 999999 }), 400, 'validation_failed');
  });

  it('refuses a ticket without consent, and one outside the Reflash lane', async () => {
    const noConsent = await ticketIn('diagnosis', { consent: false });
    const img = await image({ version: '3.0' });
    const body = { unit: 'main_board', port: 'COM3', outcome: 'verified_running', firmwareId: img };
    await refusedAndNothingStored(() => attempt(tech, noConsent, body), 422, 'no_reflash_consent');
    const view = await tech.get(`/api/tickets/${noConsent}/flash-attempts`).expect(200);
    assert.equal(view.body.canRecord, false);
    assert.match(view.body.reason, /consent/);
    const inDiagnosis = await ticketIn('diagnosis');
    await refusedAndNothingStored(() => attempt(tech, inDiagnosis, body), 422, 'not_in_reflash');
  });

  it('refuses bad fields: no outcome, a failed transfer without a block, a block past the end, a binary log, bad serial settings', async () => {
    const tag = await ticketIn('reflash');
    const img = await image({ version: '3.1', size: 1000 }); // 8 blocks of 128 bytes
    const base = { unit: 'main_board', port: 'COM3', firmwareId: img };
    await refusedAndNothingStored(() => attempt(tech, tag, base), 400);
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, outcome: 'transfer_failed' }), 400);
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, outcome: 'transfer_failed', failedAtBlock: 9 }), 400);
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, outcome: 'transfer_completed', failedAtBlock: 3 }), 400);
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, outcome: 'transfer_completed', baud: 12345 }), 400);
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, outcome: 'transfer_completed', port: 'COM3\r\nX' }), 400);
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, outcome: 'transfer_completed' }, Buffer.from([0x43, 0x00, 0x01, 0xff])), 400);
    await refusedAndNothingStored(() => attempt(tech, tag, { ...base, outcome: 'transfer_completed', version: 7 }), 400);
  });

  it('refuses members on the ticket’s attempts, storing nothing', async () => {
    const tag = await ticketIn('reflash');
    await member.get(`/api/tickets/${tag}/flash-attempts`).expect(403);
    await refusedAndNothingStored(() => attempt(member, tag, { unit: 'main_board', port: 'COM3', outcome: 'verified_running', firmwareId: 1 }), 403);
  });
});

describe('recording attempts', () => {
  it('numbers attempts, keeps the log searchable, and the verified one releases the Reflash → Bench test guard', async () => {
    const tag = await ticketIn('reflash');
    const img = await image({ version: '2.12', size: 70_000 });
    const detail = await tech.get(`/api/tickets/${tag}`).expect(200);
    const bench = detail.body.moves.find((m: { to: string }) => m.to === 'bench_test');
    assert.equal(bench.allowed, false, 'guard holds before any verified attempt');
    const refused = await tech.post(`/api/tickets/${tag}/moves`, { to: 'bench_test', version: detail.body.version }).expect(422);
    assert.match(refused.body.error.message, /verified running/);

    const log1 = Buffer.from('Bootloader v1.2\r\nErase OK\r\nC\r\nBlock 212 NAK\r\nBlock 212 NAK\r\nTimeout: transfer aborted\r\n');
    const first = await attempt(
      tech,
      tag,
      { unit: 'main_board', firmwareId: img, port: '/dev/ttyUSB0', baud: 115200, outcome: 'transfer_failed', failedAtBlock: 212, notes: 'Supply dipped when the fan started.' },
      log1,
    ).expect(201);
    assert.equal(first.body.attempts.length, 1);
    const a1 = first.body.attempts[0];
    assert.equal(a1.number, 1);
    // 70 000 bytes in 128-byte blocks: ceil(70000/128) = 547 blocks; block 212 failed, so 211 of
    // 547 got through: 38.6 % (worked by hand).
    assert.equal(a1.blocks, 547);
    assert.equal(a1.failedAtPercent, 38.6);
    assert.deepEqual(a1.serial, { port: '/dev/ttyUSB0', baud: 115200, dataBits: 8, parity: 'none', stopBits: '1', block: 128, check: 'crc' });
    assert.deepEqual(a1.serialLog, { name: 'minicom.txt', bytes: log1.length });

    const stillHeld = await tech.get(`/api/tickets/${tag}`).expect(200);
    assert.equal(stillHeld.body.moves.find((m: { to: string }) => m.to === 'bench_test').allowed, false);

    const second = await attempt(
      tech,
      tag,
      { unit: 'main_board', firmwareId: img, port: '/dev/ttyUSB0', outcome: 'verified_running', notes: 'Bench supply on its own mains socket.' },
      Buffer.from('Bootloader v1.2\nErase OK\nTransfer complete, CRC OK\nBooting 2.12\n'),
    ).expect(201);
    assert.deepEqual(second.body.attempts.map((a: { number: number }) => a.number), [1, 2]);
    assert.deepEqual(
      second.body.unitFirmware.map((u: { unit: string; version: string; attemptNumber: number }) => [u.unit, u.version, u.attemptNumber]),
      [['main_board', '2.12', 2]],
    );

    const found = await tech.get(`/api/tickets/${tag}/flash-attempts?q=nak`).expect(200);
    assert.deepEqual(found.body.attempts.map((a: { number: number }) => a.number), [1]);
    assert.equal(found.body.nextNumber, 3, 'the next number counts every attempt, not only the ones found');
    assert.deepEqual(found.body.attempts[0].logMatches, ['Block 212 NAK', 'Block 212 NAK']);
    const none = await tech.get(`/api/tickets/${tag}/flash-attempts?q=${encodeURIComponent('50%')}`).expect(200);
    assert.equal(none.body.attempts.length, 0);

    const log = await tech.get(`/api/tickets/${tag}/flash-attempts/1/log`).expect(200);
    assert.equal(log.text, log1.toString('utf8'));
    assert.match(log.headers['content-disposition']!, /^attachment/);
    assert.match(log.headers['content-type']!, /^text\/plain/);
    await tech.get(`/api/tickets/${tag}/flash-attempts/9/log`).expect(404);

    const released = await tech.get(`/api/tickets/${tag}`).expect(200);
    assert.equal(released.body.moves.find((m: { to: string }) => m.to === 'bench_test').allowed, true);
    assert.ok(released.body.events.some((e: { kind: string; note: string }) => e.kind === 'note' && /Flash attempt 2: Main board, image 2\.12 .*verified running/.test(e.note)));
    await tech.post(`/api/tickets/${tag}/moves`, { to: 'bench_test', version: released.body.version }).expect(200);
  });

  it('what worked before: attempts, verified count, success rate and last use per image of a model and unit', async () => {
    const model = 'Marsh Warbler 50 VHF all-mode';
    const tagA = await ticketIn('reflash', { model });
    const tagB = await ticketIn('reflash', { model: 'marsh  warbler 50 vhf ALL-MODE' });
    const good = await image({ model, version: '2.4' });
    const tried = await image({ model, version: '2.5' });
    await image({ model, version: '2.6' });
    const withdrawn = await image({ model, version: '2.3' });
    await tech.post(`/api/firmware/${good}/known-good`, { knownGood: true }).expect(200);
    await tech.post(`/api/firmware/${withdrawn}/withdraw`, { reason: 'Recalled.' }).expect(200);
    const base = { unit: 'main_board', port: 'COM4' };
    await attempt(tech, tagA, { ...base, firmwareId: tried, outcome: 'bootloader_not_entered' }).expect(201);
    await attempt(tech, tagA, { ...base, firmwareId: good, outcome: 'verified_running' }).expect(201);
    await attempt(tech, tagB, { ...base, firmwareId: good, outcome: 'transfer_completed' }).expect(201);
    const res = await tech.get(`/api/firmware/track-record?model=${encodeURIComponent(model)}&unit=main_board`).expect(200);
    const rows = res.body.images as { version: string; attempts: number; verified: number; successRate: number | null; knownGood: boolean; withdrawn: boolean; lastUsedAt: string | null }[];
    assert.deepEqual(rows.map((r) => r.version), ['2.4', '2.5', '2.6', '2.3'], 'known good first, withdrawn last');
    assert.deepEqual(rows.map((r) => [r.attempts, r.verified]), [[2, 1], [1, 0], [0, 0], [0, 0]]);
    assert.equal(rows[0]!.successRate, 0.5);
    assert.equal(rows[1]!.successRate, 0);
    assert.equal(rows[2]!.successRate, null);
    assert.equal(rows[2]!.lastUsedAt, null);
    assert.ok(rows[0]!.lastUsedAt);
    assert.equal(rows[3]!.withdrawn, true);
    await tech.get('/api/firmware/track-record?model=x&unit=tuner').expect(400);
  });
});
