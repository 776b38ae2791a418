// Repair log, test sheets, test limits and hand-back through HTTP against the real MariaDB: the
// guards they release (Bench test → Return, Bench test → Repair, Return → Closed), validation,
// who may see what, the board's "Test failed" flag, the report PDF read back with an independent
// extractor (pdfjs-dist), and the report mail in the outbox. Workflow rules: product brief,
// section 3 (our own design); guard texts: api/src/domain/workflow.ts.
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { createUser, setClubName, setupTestApp, signIn, tableSnapshot, truncateAll, type TestApp, type TestClient } from '../../../test/helpers';

const PW = 'correct horse battery';
let t: TestApp;
let member: TestClient, member2: TestClient, tech: TestClient, treasurer: TestClient, admin: TestClient;

async function rows<T extends object>(sql: string, replacements: Record<string, unknown> = {}): Promise<T[]> {
  return t.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
}

before(async () => {
  t = await setupTestApp();
});
after(() => t.close());

beforeEach(async () => {
  await truncateAll(t.sequelize);
  await setClubName(t.sequelize, 'Kestrel Fen Radio Society');
  await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow', callSign: 'Q3PSW' });
  await createUser(t.sequelize, { email: 'morwenna@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Morwenna Tulk' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  await createUser(t.sequelize, { email: 'gwilym@kestrelfen.example', password: PW, roles: ['treasurer'], displayName: 'Gwilym Orchard' });
  await createUser(t.sequelize, { email: 'hester@kestrelfen.example', password: PW, roles: ['admin'], displayName: 'Hester Vane' });
  [member, member2, tech, treasurer, admin] = await Promise.all(['perrin', 'morwenna', 'tobin', 'gwilym', 'hester'].map((n) => signIn(t.app, `${n}@kestrelfen.example`, PW)));
});

/** A member's ticket, moved by the technician through `lanes`; answers the tag and its version. */
async function ticketIn(lanes: string[], accessories = ['control cable', 'DC lead']): Promise<{ tag: string; version: number }> {
  const res = await member.post('/api/tickets', {
    equipmentKind: 'transceiver',
    makeModel: 'Fenwick Heron 100 HF transceiver',
    serialNumber: 'FH100-00417',
    units: ['main body'],
    faultReported: 'No transmit output after a lightning storm.',
    accessories,
    reflashConsent: false,
    notifyByEmail: true,
  });
  assert.equal(res.status, 201, res.text);
  let version = res.body.version;
  for (const to of lanes) {
    const moved = await tech.post(`/api/tickets/${res.body.tag}/moves`, { to, version });
    assert.equal(moved.status, 200, `${to}: ${moved.text}`);
    version = moved.body.version;
  }
  return { tag: res.body.tag, version };
}

const TO_BENCH_TEST = ['diagnosis', 'repair', 'bench_test'];

/** A band line; the default is worked by hand: Pf 100 W, Pr 4 W → Γ 0.2, SWR 1.5:1 (at the limit, passes). */
const band = (over: Record<string, unknown> = {}) => ({ band: '20 m', ratedW: 100, forwardW: 100, reflectedW: 4, nominalHz: 14_200_000, measuredHz: 14_200_008, ...over });
const sheet = (over: Record<string, unknown> = {}) => ({ supplyVoltageV: 13.8, receiveCurrentA: 1.4, bands: [band()], reference: 'GPS-disciplined counter', ...over });

async function detail(tag: string, client: TestClient = tech) {
  const res = await client.get(`/api/tickets/${tag}`);
  assert.equal(res.status, 200, res.text);
  return res.body;
}

describe('Bench test → Return needs a passed sheet; a failed sheet sends the ticket to Repair', () => {
  it('refuses Return without a sheet, saying why; allows it once a sheet has passed', async () => {
    const { tag, version } = await ticketIn(TO_BENCH_TEST);
    const refused = await tech.post(`/api/tickets/${tag}/moves`, { to: 'return', version });
    assert.equal(refused.status, 422);
    assert.equal(refused.body.error.message, 'The test sheet has not passed yet.');

    const saved = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet());
    assert.equal(saved.status, 201, saved.text);
    assert.equal(saved.body.sheet.passed, true);
    assert.equal(saved.body.movedTo, null);
    // Figures through rf.ts, worked by hand: Γ = sqrt(4/100) = 0.2; SWR 1.2/0.8 = 1.5; RL 10 log10 25 = 13.98 dB;
    // ML −10 log10 0.96 = 0.177 dB; 100 W = 50 dBm; 8 Hz / 14.2 MHz = 0.563 ppm.
    const b = saved.body.sheet.bands[0];
    assert.ok(Math.abs(b.reflectionCoefficient - 0.2) < 1e-9);
    assert.ok(Math.abs(b.swr - 1.5) < 1e-9);
    assert.ok(Math.abs(b.returnLossDb - 13.979) < 5e-4);
    assert.ok(Math.abs(b.mismatchLossDb - 0.1773) < 5e-5);
    assert.ok(Math.abs(b.forwardDbm - 50) < 1e-9);
    assert.equal(b.frequencyErrorHz, 8);
    assert.ok(Math.abs(b.frequencyErrorPpm - 0.5634) < 5e-5);

    const d = await detail(tag);
    assert.equal(d.moves.find((m: { to: string }) => m.to === 'return').allowed, true);
    const moved = await tech.post(`/api/tickets/${tag}/moves`, { to: 'return', version: d.version });
    assert.equal(moved.status, 200, moved.text);
    assert.equal(moved.body.state, 'return');
  });

  it('a failed sheet moves the ticket to Repair with the failed lines as the move note, and the card shows "Test failed"', async () => {
    const { tag } = await ticketIn(TO_BENCH_TEST);
    // worked by hand: Pr 9 W of 100 W → Γ 0.3, SWR 1.3/0.7 = 1.86:1, over the 1.5:1 limit.
    const saved = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet({ bands: [band({ reflectedW: 9 })] }));
    assert.equal(saved.status, 201, saved.text);
    assert.equal(saved.body.sheet.passed, false);
    assert.equal(saved.body.movedTo, 'repair');
    assert.equal(saved.body.mailed, false, 'a failed sheet is not mailed');
    const d = await detail(tag);
    assert.equal(d.state, 'repair');
    const move = d.events.findLast((e: { kind: string }) => e.kind === 'moved');
    assert.equal(move.fromState, 'bench_test');
    assert.match(move.note, /Test sheet 1 failed: 20 m: SWR 1\.86:1 \(limit at most 1\.50:1\)/);

    const board = await tech.get('/api/board');
    const card = board.body.cards.find((c: { tag: string }) => c.tag === tag);
    assert.deepEqual(card.flags, ['test_failed']);

    // Back on the bench after the repair; a passing sheet clears the flag.
    const again = await tech.post(`/api/tickets/${tag}/moves`, { to: 'bench_test', version: d.version });
    assert.equal(again.status, 200, again.text);
    const passed = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet());
    assert.equal(passed.body.sheet.number, 2);
    const board2 = await tech.get('/api/board');
    assert.deepEqual(board2.body.cards.find((c: { tag: string }) => c.tag === tag).flags, []);
  });

  it('while the latest sheet failed, Bench test → Repair needs no note (the sheet is the reason)', async () => {
    const { tag } = await ticketIn(TO_BENCH_TEST);
    // A quote waiting for the owner holds every move but Return: the automatic move is refused,
    // the sheet stays saved and the answer says why.
    await t.sequelize.query('UPDATE tickets SET awaiting_approval = 1 WHERE id = :id', { replacements: { id: Number(tag.slice(3)) } });
    const saved = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet({ bands: [band({ forwardW: 70, reflectedW: 1 })] }));
    assert.equal(saved.status, 201, saved.text);
    assert.equal(saved.body.movedTo, null);
    assert.match(saved.body.moveRefused, /The sheet is saved, but the ticket was not moved to Repair/);
    let d = await detail(tag);
    assert.equal(d.state, 'bench_test');
    assert.match(saved.body.moveRefused, /The owner has not approved the quote yet/);
    await t.sequelize.query('UPDATE tickets SET awaiting_approval = 0 WHERE id = :id', { replacements: { id: Number(tag.slice(3)) } });
    d = await detail(tag);
    assert.deepEqual(d.moves.find((m: { to: string }) => m.to === 'repair'), { to: 'repair', allowed: true });
    const moved = await tech.post(`/api/tickets/${tag}/moves`, { to: 'repair', version: d.version });
    assert.equal(moved.status, 200, moved.text);
  });

  it('a sheet is refused outside the Bench test lane, and nothing is stored', async () => {
    const { tag } = await ticketIn(['diagnosis', 'repair']);
    const before = await tableSnapshot(t.sequelize);
    const res = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet());
    assert.equal(res.status, 422);
    assert.equal(res.body.error.code, 'not_in_bench_test');
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });
});

describe('test sheet validation: 400 in plain words, nothing stored', () => {
  const cases: [string, Record<string, unknown>, string, RegExp][] = [
    ['negative forward power', sheet({ bands: [band({ forwardW: -5 })] }), 'bands.0.forwardW', /more than 0 W/],
    ['negative reflected power', sheet({ bands: [band({ reflectedW: -1 })] }), 'bands.0.reflectedW', /cannot be negative/],
    ['reflected above forward', sheet({ bands: [band({ reflectedW: 120 })] }), 'bands.0.reflectedW', /above forward power: check the meter direction/],
    ['reflected equal to forward', sheet({ bands: [band(), band({ band: '40 m', reflectedW: 100 })] }), 'bands.1.reflectedW', /Total reflection/],
    ['no bands', sheet({ bands: [] }), 'bands', /at least one band/],
    ['zero supply voltage', sheet({ supplyVoltageV: 0 }), 'supplyVoltageV', /more than 0 V/],
    ['a power as text', sheet({ bands: [band({ ratedW: '100' })] }), 'bands.0.ratedW', /as a number/],
    ['dialled without measured', sheet({ bands: [band({ measuredHz: null })] }), 'bands.0.measuredHz', /both the dialled and the measured/],
    ['the verdict sent by the client', { ...sheet(), passed: true }, '_', /Unrecognized key|passed/],
  ];
  for (const [name, body, field, message] of cases) {
    it(name, async () => {
      const { tag } = await ticketIn(TO_BENCH_TEST);
      const before = await tableSnapshot(t.sequelize);
      const res = await tech.post(`/api/tickets/${tag}/test-sheets`, body);
      assert.equal(res.status, 400, res.text);
      assert.equal(res.body.error.code, 'validation_failed');
      assert.ok(field in (res.body.error.fields ?? {}), `fields: ${JSON.stringify(res.body.error.fields)}`);
      assert.match(JSON.stringify(res.body.error), message);
      assert.deepEqual(await tableSnapshot(t.sequelize), before);
    });
  }
});

describe('who sees test sheets and reports', () => {
  it("the owner reads their sheets and report; another member gets 404 for both; staff read them", async () => {
    const { tag } = await ticketIn(TO_BENCH_TEST);
    const saved = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet());
    const id = saved.body.sheet.id;
    assert.equal((await member.get(`/api/tickets/${tag}/test-sheets`)).status, 200);
    assert.equal((await member.get(`/api/tickets/${tag}/test-sheets/${id}/report.pdf`)).status, 200);
    const other = await member2.get(`/api/tickets/${tag}/test-sheets`);
    assert.equal(other.status, 404);
    assert.equal(other.body.error.code, 'ticket_not_found');
    assert.equal((await member2.get(`/api/tickets/${tag}/test-sheets/${id}/report.pdf`)).status, 404);
    assert.equal((await member.post(`/api/tickets/${tag}/test-sheets`, sheet())).status, 403);
    for (const staff of [tech, treasurer, admin]) assert.equal((await staff.get(`/api/tickets/${tag}/test-sheets/${id}/report.pdf`)).status, 200);
    // A sheet of another ticket is not found under this one.
    const second = await ticketIn(TO_BENCH_TEST);
    assert.equal((await tech.get(`/api/tickets/${second.tag}/test-sheets/${id}/report.pdf`)).status, 404);
  });
});

async function pdfText(bytes: Buffer): Promise<string> {
  const doc = await getDocument({ data: new Uint8Array(bytes), useSystemFonts: false, isEvalSupported: false }).promise;
  const parts: string[] = [];
  for (let p = 1; p <= doc.numPages; p++) {
    const content = await (await doc.getPage(p)).getTextContent();
    parts.push(content.items.map((i) => ('str' in i ? i.str : '')).join(' '));
  }
  await doc.destroy();
  return parts.join('\n').replace(/\s+/g, ' ');
}

describe('the test report PDF, read back with pdfjs-dist', () => {
  it('shows the ticket, the figures worked by hand, each line with PASS or FAIL and its source, and the RF caution', async () => {
    const { tag } = await ticketIn(TO_BENCH_TEST);
    // 40 m: Pf 50 W, Pr 2 W → Γ 0.2, SWR 1.50:1, RL 13.98 dB, 46.99 dBm; against 100 W: 10 log10 0.5 = −3.01 dB (fails −1 dB).
    const saved = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet({ bands: [band(), band({ band: '40 m', forwardW: 50, reflectedW: 2, nominalHz: 7_100_000, measuredHz: 7_100_003 })] }));
    assert.equal(saved.status, 201, saved.text);
    const res = await tech.get(saved.body.sheet.reportUrl).buffer(true).parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    });
    assert.equal(res.status, 200);
    assert.equal(res.headers['content-type'], 'application/pdf');
    assert.match(res.headers['content-disposition'], new RegExp(`attachment; filename="?${tag}-test-sheet-1\\.pdf"?`));
    const text = await pdfText(res.body as Buffer);
    assert.match(text, /Kestrel Fen Radio Society: bench test report/);
    assert.match(text, new RegExp(`Ticket ${tag}, test sheet 1`));
    assert.match(text, /Result: FAILED/);
    assert.match(text, /PASS 20 m: SWR: 1\.50:1 \(limit at most 1\.50:1\)/);
    assert.match(text, /13\.98/); // return loss, worked by hand
    assert.match(text, /0\.177/); // mismatch loss
    assert.match(text, /46\.99/); // 50 W in dBm
    assert.match(text, /FAIL 40 m: output against rating: −3\.01 dB/);
    assert.match(text, /\+3 Hz, \+0\.42 ppm/); // 3 / 7.1 = 0.4225 ppm
    assert.match(text, /Source: Common practice: SWR at most 1\.5:1 into a dummy load/);
    assert.match(text, /Caution: RF power on the bench/);
    assert.match(text, /dummy load rated for the power/);
  });

  it('a passed sheet is mailed to the owner through the outbox with the report attached', async () => {
    const { tag } = await ticketIn(TO_BENCH_TEST);
    const saved = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet());
    assert.equal(saved.body.mailed, true);
    const [mail] = await rows<{ to_address: string; subject: string; attachment_name: string; attachment_type: string; attachment_content: Buffer }>(
      "SELECT to_address, subject, attachment_name, attachment_type, attachment_content FROM outbox WHERE kind = 'test_report'",
    );
    assert.ok(mail);
    assert.equal(mail.to_address, 'perrin@kestrelfen.example');
    assert.equal(mail.subject, `Bench test passed: your Fenwick Heron 100 HF transceiver (${tag})`);
    assert.equal(mail.attachment_name, `${tag}-test-sheet-1.pdf`);
    assert.equal(mail.attachment_type, 'application/pdf');
    const text = await pdfText(Buffer.from(mail.attachment_content));
    assert.match(text, /Result: PASSED/);
  });
});

describe('test limits: admins set them with their sources; a sheet keeps the limits it was judged by', () => {
  it('defaults carry their sources; an admin tightens SWR to 1.3:1; later sheets use it, the earlier one keeps its verdict', async () => {
    const limits = await tech.get('/api/test-limits');
    assert.equal(limits.status, 200);
    assert.equal(limits.body.limits.swrMax.value, 1.5);
    assert.match(limits.body.limits.swrMax.source, /Common practice/);
    assert.deepEqual(limits.body.custom, []);

    const { tag } = await ticketIn(TO_BENCH_TEST);
    const first = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet());
    assert.equal(first.body.sheet.passed, true);

    assert.equal((await tech.patch('/api/test-limits', { swrMax: { value: 1.3, source: 'Club rule' } })).status, 403);
    const set = await admin.patch('/api/test-limits', { swrMax: { value: 1.3, source: 'Club rule, committee minute 2026-11' } });
    assert.equal(set.status, 200, set.text);
    assert.equal(set.body.limits.swrMax.value, 1.3);
    assert.deepEqual(set.body.custom, ['swrMax']);

    const second = await tech.post(`/api/tickets/${tag}/test-sheets`, sheet());
    assert.equal(second.body.sheet.passed, false);
    assert.equal(second.body.sheet.checks.find((c: { line: string }) => c.line === '20 m: SWR').source, 'Club rule, committee minute 2026-11');
    const list = await tech.get(`/api/tickets/${tag}/test-sheets?dir=asc`);
    assert.deepEqual(list.body.sheets.items.map((s: { passed: boolean }) => s.passed), [true, false]);
  });

  it('refuses limits out of range or that cannot stand together, changing nothing', async () => {
    const before = await tableSnapshot(t.sequelize);
    const bad = await admin.patch('/api/test-limits', { swrMax: { value: 0.9, source: 'x y z' } });
    assert.equal(bad.status, 400);
    assert.ok('swrMax.value' in bad.body.error.fields);
    const crossed = await admin.patch('/api/test-limits', { supplyMinV: { value: 16, source: 'Club rule' } });
    assert.equal(crossed.status, 400);
    assert.match(crossed.body.error.message, /lowest supply voltage must be below the highest/);
    const noSource = await admin.patch('/api/test-limits', { swrMax: { value: 1.4, source: '' } });
    assert.equal(noSource.status, 400);
    assert.equal((await admin.patch('/api/test-limits', {})).status, 400);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });
});

describe('repair log', () => {
  it('records work and parts in the Repair lane as internal timeline events, paged, with totals', async () => {
    const { tag } = await ticketIn(['diagnosis', 'repair']);
    for (let i = 1; i <= 3; i++) {
      const w = await tech.post(`/api/tickets/${tag}/repair-log/work`, { description: `Replaced driver transistor, step ${i}`, minutes: 15 * i });
      assert.equal(w.status, 201, w.text);
      assert.equal(w.body.technicianName, 'Tobin Marsh');
    }
    const p = await tech.post(`/api/tickets/${tag}/repair-log/parts`, { description: 'RF power transistor, 13.6 V 100 W pair', quantity: 2, unitCostMinor: 2450 });
    assert.equal(p.status, 201, p.text);
    assert.equal(p.body.costMinor, 4900);

    const page1 = await tech.get(`/api/tickets/${tag}/repair-log?kind=work&pageSize=2`);
    assert.equal(page1.status, 200, page1.text);
    assert.equal(page1.body.work.total, 3);
    assert.equal(page1.body.work.items.length, 2);
    assert.equal(page1.body.work.items[0].description, 'Replaced driver transistor, step 3', 'newest first');
    assert.equal(page1.body.parts, null);
    assert.deepEqual(page1.body.totals, { minutes: 90, workEntries: 3, parts: 2, partsCostMinor: 4900 });

    const events = await rows<{ kind: string; owner_visible: number; note: string }>('SELECT kind, owner_visible, note FROM ticket_events WHERE kind LIKE :k ORDER BY id', { k: 'repair_%' });
    assert.equal(events.length, 4);
    assert.ok(events.every((e) => !e.owner_visible), 'repair records stay internal');
    assert.equal(events[3]!.note, 'Part: 2 × RF power transistor, 13.6 V 100 W pair at 24.50 each (49.00)');

    assert.equal((await treasurer.get(`/api/tickets/${tag}/repair-log`)).status, 200);
    assert.equal((await member.get(`/api/tickets/${tag}/repair-log`)).status, 403, 'the bench log is not the owner’s');
    assert.equal((await member.post(`/api/tickets/${tag}/repair-log/work`, { description: 'x y z', minutes: 1 })).status, 403);
  });

  it('refuses entries outside Repair and bad input, storing nothing', async () => {
    const { tag } = await ticketIn(['diagnosis']);
    const before = await tableSnapshot(t.sequelize);
    const notYet = await tech.post(`/api/tickets/${tag}/repair-log/work`, { description: 'Cleaned the contacts', minutes: 10 });
    assert.equal(notYet.status, 422);
    assert.equal(notYet.body.error.code, 'not_in_repair');
    const { tag: inRepair } = await ticketIn(['diagnosis', 'repair']);
    const snapshot = await tableSnapshot(t.sequelize);
    for (const [path, body, field] of [
      ['work', { description: 'Cleaned', minutes: 0 }, 'minutes'],
      ['work', { description: 'Cleaned', minutes: 12.5 }, 'minutes'],
      ['work', { description: '', minutes: 5 }, 'description'],
      ['parts', { description: 'Fuse 10 A', quantity: 0, unitCostMinor: 20 }, 'quantity'],
      ['parts', { description: 'Fuse 10 A', quantity: 1, unitCostMinor: -20 }, 'unitCostMinor'],
      ['parts', { description: 'Fuse 10 A', quantity: 1, unitCostMinor: 1.5 }, 'unitCostMinor'],
    ] as const) {
      const res = await tech.post(`/api/tickets/${inRepair}/repair-log/${path}`, body);
      assert.equal(res.status, 400, `${path} ${JSON.stringify(body)}: ${res.text}`);
      assert.ok(field in res.body.error.fields, JSON.stringify(res.body.error.fields));
    }
    assert.deepEqual(await tableSnapshot(t.sequelize), snapshot);
    assert.notDeepEqual(before, snapshot);
  });
});

describe('Return → Closed: the returned-items checklist, then fees', () => {
  async function inReturn(accessories?: string[]) {
    const { tag } = await ticketIn(TO_BENCH_TEST, accessories);
    await tech.post(`/api/tickets/${tag}/test-sheets`, sheet());
    const d = await detail(tag);
    const moved = await tech.post(`/api/tickets/${tag}/moves`, { to: 'return', version: d.version });
    assert.equal(moved.status, 200, moved.text);
    return { tag, version: moved.body.version as number };
  }

  it('refuses Closed without the checklist; with it and nothing owed, the ticket closes', async () => {
    const { tag, version } = await inReturn();
    const first = await tech.post(`/api/tickets/${tag}/moves`, { to: 'closed', version });
    assert.equal(first.status, 422);
    assert.equal(first.body.error.message, 'The returned-items checklist is not done yet.');

    const hb = await tech.post(`/api/tickets/${tag}/hand-back`, {
      items: [
        { item: 'control cable', returned: true },
        { item: 'DC lead', returned: false, note: 'Owner took the DC lead home at intake.' },
      ],
      extras: [{ item: 'spare fuse', note: 'Left in the box by the bench.' }],
      collectedBy: 'Perrin Sallow',
    });
    assert.equal(hb.status, 201, hb.text);
    assert.equal(hb.body.current.collectedBy, 'Perrin Sallow');
    assert.equal((await member.get(`/api/tickets/${tag}/hand-back`)).status, 200, 'the owner sees what went back');
    assert.equal((await member2.get(`/api/tickets/${tag}/hand-back`)).status, 404);

    const event = (await detail(tag)).events.findLast((e: { kind: string }) => e.kind === 'hand_back');
    assert.match(event.note, /Handed back to Perrin Sallow; 1 of 2 items handed in went back; DC lead not returned/);
    // Nothing is owed on this ticket, so with the checklist done it closes (a balance due keeps it
    // open: payments/ledger.test.ts and the browser test e2e/bench-test.spec.ts).
    const second = await tech.post(`/api/tickets/${tag}/moves`, { to: 'closed', version });
    assert.equal(second.status, 200, second.text);
    assert.equal(second.body.state, 'closed');
  });

  it('the checklist must match what was handed in, or explain each difference', async () => {
    const { tag } = await inReturn(['control cable', 'DC lead', 'microphone']);
    const before = await tableSnapshot(t.sequelize);
    const missing = await tech.post(`/api/tickets/${tag}/hand-back`, {
      items: [{ item: 'control cable', returned: true }, { item: 'DC lead', returned: true }],
      collectedBy: 'Perrin Sallow',
    });
    assert.equal(missing.status, 400);
    assert.match(missing.body.error.message, /missing: microphone/);
    const unexplained = await tech.post(`/api/tickets/${tag}/hand-back`, {
      items: [{ item: 'control cable', returned: true }, { item: 'DC lead', returned: true }, { item: 'microphone', returned: false }],
      collectedBy: 'Perrin Sallow',
    });
    assert.equal(unexplained.status, 400);
    assert.ok('items.2.note' in unexplained.body.error.fields);
    const stranger = await tech.post(`/api/tickets/${tag}/hand-back`, {
      items: [{ item: 'control cable', returned: true }, { item: 'DC lead', returned: true }, { item: 'microphone', returned: true }, { item: 'antenna', returned: true }],
      collectedBy: 'Perrin Sallow',
    });
    assert.equal(stranger.status, 400);
    assert.ok('items.3.item' in stranger.body.error.fields);
    const noName = await tech.post(`/api/tickets/${tag}/hand-back`, { items: [], collectedBy: '' });
    assert.equal(noName.status, 400);
    const future = await tech.post(`/api/tickets/${tag}/hand-back`, {
      items: [{ item: 'control cable', returned: true }, { item: 'DC lead', returned: true }, { item: 'microphone', returned: true }],
      collectedBy: 'Perrin Sallow',
      collectedAt: new Date(Date.now() + 86_400_000).toISOString(),
    });
    assert.equal(future.status, 400);
    assert.ok('collectedAt' in future.body.error.fields);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('is refused outside the Return lane', async () => {
    const { tag } = await ticketIn(TO_BENCH_TEST);
    const res = await tech.post(`/api/tickets/${tag}/hand-back`, { items: [], collectedBy: 'Perrin Sallow' });
    assert.equal(res.status, 422);
    assert.equal(res.body.error.code, 'not_in_return');
  });
});

describe('closed tickets stay searchable', () => {
  it('the tickets list filters by state, closed included', async () => {
    const { tag } = await ticketIn([]);
    await t.sequelize.query("UPDATE tickets SET state = 'closed' WHERE id = :id", { replacements: { id: Number(tag.slice(3)) } });
    const res = await tech.get('/api/tickets?state=closed&q=Heron');
    assert.equal(res.status, 200, res.text);
    assert.deepEqual(res.body.items.map((r: { tag: string }) => r.tag), [tag]);
    assert.ok(!(await tech.get('/api/board')).body.cards.some((c: { tag: string }) => c.tag === tag), 'closed tickets leave the board');
  });
});
