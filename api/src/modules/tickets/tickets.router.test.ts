// Tickets through HTTP against the real MariaDB (rigwright_test): intake, visibility, moves with
// optimistic locking, audit events and outbox rows. Workflow rules are the product brief's
// section 3 (our own design); the guard texts come from api/src/domain/workflow.ts.
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { OptimisticLockError, QueryTypes } from 'sequelize';
import { anonymous, createTestClock, createUser, setClubName, setupTestApp, signIn, tableCounts, tableSnapshot, truncateAll, type TestApp, type TestClient } from '../../../test/helpers';
import { createApp } from '../../app';
import { STATES } from '../../domain/workflow';
import { formatTag, parseTag } from './tag';
import { Ticket } from './ticket.model';

const PW = 'correct horse battery';

const intake = (extra: Record<string, unknown> = {}) => ({
  equipmentKind: 'transceiver',
  makeModel: 'Fenwick Heron 100 HF transceiver',
  serialNumber: 'FH100-00001',
  units: ['display head', 'main body'],
  faultReported: 'Display dark after a power cut; the relay clicks.',
  accessories: ['control cable', 'DC lead'],
  firmwareVersions: 'Head 1.07',
  reflashConsent: true,
  notifyByEmail: true,
  ...extra,
});

let t: TestApp;
let member: TestClient, member2: TestClient, tech: TestClient, tech2: TestClient, treasurer: TestClient, admin: TestClient;

async function rows<T extends object>(sql: string, replacements: Record<string, unknown> = {}): Promise<T[]> {
  return t.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
}

before(async () => {
  t = await setupTestApp();
});
after(() => t.close());

beforeEach(async () => {
  await truncateAll(t.sequelize);
  await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow', callSign: 'Q3PSW' });
  await createUser(t.sequelize, { email: 'morwenna@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Morwenna Tulk' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  await createUser(t.sequelize, { email: 'ysolde@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Ysolde Crane' });
  await createUser(t.sequelize, { email: 'gwilym@kestrelfen.example', password: PW, roles: ['treasurer'], displayName: 'Gwilym Orchard' });
  await createUser(t.sequelize, { email: 'hester@kestrelfen.example', password: PW, roles: ['admin'], displayName: 'Hester Vane' });
  [member, member2, tech, tech2, treasurer, admin] = await Promise.all(
    ['perrin', 'morwenna', 'tobin', 'ysolde', 'gwilym', 'hester'].map((n) => signIn(t.app, `${n}@kestrelfen.example`, PW)),
  );
});

describe('tags', () => {
  it('formats and parses RW- tags, four digits at least', () => {
    assert.equal(formatTag(42), 'RW-0042');
    assert.equal(formatTag(12345), 'RW-12345');
    assert.equal(parseTag('RW-0042'), 42);
    assert.equal(parseTag('rw-0042'), 42);
    assert.equal(parseTag('RW-12345'), 12345);
    assert.equal(parseTag('RW-42'), null);
    assert.equal(parseTag('RW-00042'), null);
    assert.equal(parseTag('RW-0000'), null);
    assert.equal(parseTag('42'), null);
  });
});

describe('POST /api/tickets (intake)', () => {
  it('opens a member’s ticket as their own, with an opened event and a mail in the outbox', async () => {
    const res = await member.post('/api/tickets', intake()).expect(201);
    assert.match(res.body.tag, /^RW-\d{4}$/);
    assert.equal(res.body.tag, formatTag(res.body.id));
    assert.equal(res.body.state, 'intake');
    assert.equal(res.body.version, 0);
    assert.equal(res.body.ownerName, 'Perrin Sallow');
    assert.equal(res.body.ownerEmail, 'perrin@kestrelfen.example');
    assert.equal(res.body.ownerCallSign, 'Q3PSW');
    assert.deepEqual(res.body.units, ['display head', 'main body']);
    assert.deepEqual(res.body.accessories, ['control cable', 'DC lead']);
    assert.equal(res.body.technicianName, null);
    assert.equal(res.body.events.length, 1);
    assert.deepEqual(
      { kind: res.body.events[0].kind, actorName: res.body.events[0].actorName, toState: res.body.events[0].toState },
      { kind: 'opened', actorName: 'Perrin Sallow', toState: 'intake' },
    );
    assert.deepEqual(res.body.moves.map((m: { to: string }) => m.to), [...STATES]);
    // A member sees the lanes but may move nothing.
    assert.ok(res.body.moves.every((m: { allowed: boolean; reason: string }) => !m.allowed && m.reason.length > 0));
    const [ticket] = await rows<{ owner_user_id: number }>('SELECT owner_user_id FROM tickets');
    const [me] = await rows<{ id: number }>("SELECT id FROM users WHERE email = 'perrin@kestrelfen.example'");
    assert.equal(ticket.owner_user_id, me.id);
    const mails = await rows<{ to_address: string; subject: string; text_body: string; status: string; ticket_id: number }>('SELECT * FROM outbox');
    assert.equal(mails.length, 1);
    assert.equal(mails[0].to_address, 'perrin@kestrelfen.example');
    assert.equal(mails[0].subject, `Ticket ${res.body.tag} opened`);
    assert.ok(mails[0].text_body.includes(res.body.tag));
    assert.equal(mails[0].status, 'pending');
    assert.equal(mails[0].ticket_id, res.body.id);
  });

  it('queues no mail when the owner did not ask for e-mail', async () => {
    await member.post('/api/tickets', intake({ notifyByEmail: false })).expect(201);
    assert.deepEqual(await tableCounts(t.sequelize).then((c) => [c.tickets, c.ticket_events, c.outbox]), [1, 1, 0]);
  });

  it('refuses a member who tries to hand in for someone else, storing nothing', async () => {
    const before = await tableSnapshot(t.sequelize);
    const res = await member
      .post('/api/tickets', intake({ owner: { name: 'Someone Else', email: 'else@fenmail.example' } }))
      .expect(403);
    assert.equal(res.body.error.code, 'owner_not_allowed');
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('refuses fields that are not part of the form (no mass assignment of state, version, owner id)', async () => {
    const before = await tableCounts(t.sequelize);
    for (const extra of [{ state: 'closed' }, { version: 7 }, { ownerUserId: 1 }, { technicianId: 3 }]) {
      const res = await member.post('/api/tickets', intake(extra)).expect(400);
      assert.equal(res.body.error.code, 'validation_failed');
    }
    assert.deepEqual(await tableCounts(t.sequelize), before);
  });

  it('answers 400 with a message per field and stores nothing', async () => {
    const before = await tableCounts(t.sequelize);
    const res = await member
      .post('/api/tickets', intake({ equipmentKind: 'toaster', makeModel: '', faultReported: 'bad', units: Array(9).fill('unit'), reflashConsent: 'yes' }))
      .expect(400);
    assert.equal(res.body.error.code, 'validation_failed');
    assert.deepEqual(Object.keys(res.body.error.fields).sort(), ['equipmentKind', 'faultReported', 'makeModel', 'reflashConsent', 'units']);
    assert.equal(res.body.error.fields.faultReported, 'Describe the fault in a few words (at least 5 characters).');
    assert.deepEqual(await tableCounts(t.sequelize), before);
  });

  it('says in plain words which fields are missing or of the wrong type', async () => {
    const res = await member.post('/api/tickets', { equipmentKind: 'transceiver', units: 'display head' }).expect(400);
    assert.equal(res.body.error.fields.makeModel, 'This is required.');
    assert.equal(res.body.error.fields.units, 'Send a list here.');
    assert.doesNotMatch(JSON.stringify(res.body), /Invalid input|received undefined/);
  });

  it('refuses line breaks and control characters in single-line fields (they reach e-mail subjects), storing nothing', async () => {
    const before = await tableCounts(t.sequelize);
    const res = await member
      .post('/api/tickets', intake({ makeModel: 'Heron 100\r\nBcc: someone@elsewhere.example', serialNumber: 'A\u0000B', units: ['main\nbody'] }))
      .expect(400);
    assert.deepEqual(Object.keys(res.body.error.fields).sort(), ['makeModel', 'serialNumber', 'units.0']);
    assert.match(res.body.error.fields.makeModel, /one line/);
    assert.deepEqual(await tableCounts(t.sequelize), before);
  });

  it('lets a technician hand in for an owner without an account', async () => {
    const res = await tech
      .post('/api/tickets', intake({ owner: { name: 'Edmund Rushby', email: 'e.rushby@fenmail.example', phone: '01632 960417', callSign: 'q4erb' } }))
      .expect(201);
    assert.equal(res.body.ownerName, 'Edmund Rushby');
    assert.equal(res.body.ownerEmail, 'e.rushby@fenmail.example');
    assert.equal(res.body.ownerPhone, '01632 960417');
    assert.equal(res.body.ownerCallSign, 'Q4ERB');
    assert.equal(res.body.events[0].actorName, 'Tobin Marsh');
    const [row] = await rows<{ owner_user_id: number | null }>('SELECT owner_user_id FROM tickets');
    assert.equal(row.owner_user_id, null);
    const [mail] = await rows<{ to_address: string }>('SELECT to_address FROM outbox');
    assert.equal(mail.to_address, 'e.rushby@fenmail.example');
  });

  it('is refused to a treasurer-only account and to anyone signed out', async () => {
    const before = await tableCounts(t.sequelize);
    await treasurer.post('/api/tickets', intake()).expect(403);
    const anon = await anonymous(t.app);
    await anon.post('/api/tickets', intake()).expect(401);
    assert.deepEqual(await tableCounts(t.sequelize), before);
  });
});

describe('GET /api/tickets and /api/tickets/:tag (visibility)', () => {
  it('shows members only their own tickets; technicians, treasurers and admins see all', async () => {
    const mine = (await member.post('/api/tickets', intake()).expect(201)).body;
    const theirs = (await member2.post('/api/tickets', intake({ makeModel: 'Carrow Avocet 5 QRP transceiver', serialNumber: 'CAV5-9' })).expect(201)).body;

    const list = (await member.get('/api/tickets').expect(200)).body;
    assert.equal(list.total, 1);
    assert.deepEqual(list.items.map((i: { tag: string }) => i.tag), [mine.tag]);
    assert.deepEqual(Object.keys(list.items[0]).sort(), ['createdAt', 'equipmentKind', 'id', 'makeModel', 'ownerName', 'state', 'stateSince', 'tag']);

    for (const who of [tech, treasurer, admin]) {
      const all = (await who.get('/api/tickets?sort=tag&dir=asc').expect(200)).body;
      assert.equal(all.total, 2);
      assert.deepEqual(all.items.map((i: { tag: string }) => i.tag), [mine.tag, theirs.tag]);
    }

    const other = await member.get(`/api/tickets/${theirs.tag}`).expect(404);
    assert.equal(other.body.error.code, 'ticket_not_found');
    await member.get(`/api/tickets/${mine.tag}`).expect(200);
    await treasurer.get(`/api/tickets/${theirs.tag}`).expect(200);
    await member.get('/api/tickets/RW-9999').expect(404);
    await member.get('/api/tickets/not-a-tag').expect(400); // not shaped like a tag: refused at the edge
    await member.get('/api/tickets/RW-00042').expect(404); // shaped like one, but not its spelling
    const anon = await anonymous(t.app);
    await anon.get('/api/tickets').expect(401);
    await anon.get(`/api/tickets/${mine.tag}`).expect(401);
  });

  it('pages, sorts and searches by tag, make/model, serial, owner name and call sign', async () => {
    const a = (await member.post('/api/tickets', intake()).expect(201)).body;
    const b = (await tech.post('/api/tickets', intake({ makeModel: 'Saltmead Bittern 600 linear amplifier', equipmentKind: 'amplifier', serialNumber: 'SB600-77', owner: { name: 'Edmund Rushby', email: 'e@fenmail.example', callSign: 'Q4ERB' } })).expect(201)).body;
    const c = (await member2.post('/api/tickets', intake({ makeModel: 'Marram PS-30 supply', equipmentKind: 'power_supply', serialNumber: '50%_off' })).expect(201)).body;

    const search = async (q: string) =>
      (await tech.get(`/api/tickets?q=${encodeURIComponent(q)}&sort=tag&dir=asc`).expect(200)).body.items.map((i: { tag: string }) => i.tag);
    assert.deepEqual(await search(b.tag), [b.tag]);
    assert.deepEqual(await search(b.tag.toLowerCase()), [b.tag]);
    assert.deepEqual(await search('bittern'), [b.tag]);
    assert.deepEqual(await search('SB600'), [b.tag]);
    assert.deepEqual(await search('Rushby'), [b.tag]);
    assert.deepEqual(await search('q4erb'), [b.tag]);
    assert.deepEqual(await search('Q3PSW'), [a.tag]);
    assert.deepEqual(await search('50%'), [c.tag]);
    assert.deepEqual(await search('%'), [c.tag], 'a % is a character to find, not a wildcard');
    assert.deepEqual(await search('Nothing like this'), []);
    // A member's search stays inside their own tickets.
    assert.deepEqual((await member.get('/api/tickets?q=Marram').expect(200)).body.items, []);

    const page2 = (await tech.get('/api/tickets?page=2&pageSize=2&sort=tag&dir=asc').expect(200)).body;
    assert.deepEqual({ total: page2.total, page: page2.page, pageSize: page2.pageSize }, { total: 3, page: 2, pageSize: 2 });
    assert.deepEqual(page2.items.map((i: { tag: string }) => i.tag), [c.tag]);
    const desc = (await tech.get('/api/tickets?sort=tag&dir=desc').expect(200)).body.items.map((i: { tag: string }) => i.tag);
    assert.deepEqual(desc, [c.tag, b.tag, a.tag]);
    await tech.get('/api/tickets?sort=password').expect(400);
    await tech.get('/api/tickets?pageSize=1000').expect(400);
  });
});

describe('POST /api/tickets/:tag/moves', () => {
  async function openOne(extra: Record<string, unknown> = {}) {
    return (await member.post('/api/tickets', intake(extra)).expect(201)).body as { tag: string; id: number; version: number };
  }
  const move = (who: TestClient, tag: string, body: Record<string, unknown>) => who.post(`/api/tickets/${tag}/moves`, body);

  it('refuses members (403) and changes nothing', async () => {
    const tk = await openOne();
    const before = await tableSnapshot(t.sequelize);
    const res = await move(member, tk.tag, { to: 'diagnosis', version: 0 }).expect(403);
    assert.equal(res.body.error.code, 'forbidden');
    await move(treasurer, tk.tag, { to: 'diagnosis', version: 0 }).expect(403);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('moves intake → diagnosis: state, version, technician, moved event and owner mail in one go', async () => {
    const tk = await openOne();
    const res = await move(tech, tk.tag, { to: 'diagnosis', version: 0, note: 'On the bench tonight.' }).expect(200);
    assert.equal(res.body.state, 'diagnosis');
    assert.equal(res.body.version, 1);
    assert.equal(res.body.technicianName, 'Tobin Marsh', 'the mover takes the ticket out of intake');
    const moved = res.body.events.filter((e: { kind: string }) => e.kind === 'moved');
    assert.equal(moved.length, 1);
    assert.deepEqual(
      { actorName: moved[0].actorName, fromState: moved[0].fromState, toState: moved[0].toState, note: moved[0].note },
      { actorName: 'Tobin Marsh', fromState: 'intake', toState: 'diagnosis', note: 'On the bench tonight.' },
    );
    assert.ok(Date.parse(moved[0].at) > 0);
    const byTo = Object.fromEntries(res.body.moves.map((m: { to: string; allowed: boolean }) => [m.to, m.allowed]));
    assert.deepEqual(byTo, { intake: true, diagnosis: false, reflash: true, repair: true, return: true, closed: false, bench_test: false });
    // Back to Intake, where it came from, is a send-back: allowed with a note saying why.
    const back = res.body.moves.find((m: { to: string }) => m.to === 'intake');
    assert.deepEqual(back, { to: 'intake', allowed: true, noteRequired: true, reason: 'Say why it goes back to Intake in the note.' });
    assert.equal(res.body.previousState, 'intake');
    // diagnosis → return is allowed with a note saying why it goes back unrepaired.
    const toReturn = res.body.moves.find((m: { to: string }) => m.to === 'return');
    assert.equal(toReturn.noteRequired, true);
    assert.match(toReturn.reason, /Say why it goes back unrepaired/);
    const mails = await rows<{ subject: string; to_address: string }>("SELECT subject, to_address FROM outbox WHERE kind = 'ticket_moved'");
    assert.deepEqual(mails, [{ subject: `Your Fenwick Heron 100 HF transceiver (${tk.tag}) has moved to Diagnosis`, to_address: 'perrin@kestrelfen.example' }]);

    // A second technician moving it on does not take it over.
    const next = await move(tech2, tk.tag, { to: 'repair', version: 1 }).expect(200);
    assert.equal(next.body.technicianName, 'Tobin Marsh');
    assert.equal(next.body.version, 2);
  });

  it('queues no move mail when the owner did not ask for e-mail', async () => {
    const tk = await openOne({ notifyByEmail: false });
    await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200);
    assert.equal((await tableCounts(t.sequelize)).outbox, 0);
  });

  it('refuses moves the workflow does not allow (422, with the reason) and changes nothing', async () => {
    const tk = await openOne({ reflashConsent: false });
    let before = await tableSnapshot(t.sequelize);
    let res = await move(tech, tk.tag, { to: 'return', version: 0 }).expect(422);
    assert.equal(res.body.error.code, 'move_not_allowed');
    assert.equal(res.body.error.message, 'A ticket cannot go from Intake to Return. From Intake it can go to: Diagnosis.');
    assert.deepEqual(await tableSnapshot(t.sequelize), before);

    await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200);
    before = await tableSnapshot(t.sequelize);
    res = await move(tech, tk.tag, { to: 'reflash', version: 1 }).expect(422);
    assert.match(res.body.error.message, /not consented to a reflash/);
    res = await move(tech, tk.tag, { to: 'return', version: 1 }).expect(422);
    assert.match(res.body.error.message, /Say why it goes back unrepaired/);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
    await move(tech, tk.tag, { to: 'return', version: 1, note: 'No fault found on the bench.' }).expect(200);
  });

  it('refuses reflash → bench test until a flash attempt is verified', async () => {
    const tk = await openOne({ reflashConsent: true });
    await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200);
    await move(tech, tk.tag, { to: 'reflash', version: 1 }).expect(200);
    const before = await tableSnapshot(t.sequelize);
    const res = await move(tech, tk.tag, { to: 'bench_test', version: 2 }).expect(422);
    assert.equal(res.body.error.message, 'No flash attempt is recorded as verified running yet.');
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
    const detail = (await tech.get(`/api/tickets/${tk.tag}`).expect(200)).body;
    const benchTest = detail.moves.find((m: { to: string }) => m.to === 'bench_test');
    assert.deepEqual(benchTest, { to: 'bench_test', allowed: false, reason: 'No flash attempt is recorded as verified running yet.' });
  });

  it('answers 409 stale_version to a move made against an old version, changing nothing', async () => {
    const tk = await openOne();
    await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200);
    const before = await tableSnapshot(t.sequelize);
    const res = await move(tech2, tk.tag, { to: 'repair', version: 0 }).expect(409);
    assert.deepEqual(res.body.error, {
      code: 'stale_version',
      message: 'Someone else moved this ticket a moment ago; the board has been refreshed.',
    });
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('lets exactly one of two concurrent moves of one version win: one 200, one 409, one event, one mail', async () => {
    const tk = await openOne();
    const mailsBefore = (await tableCounts(t.sequelize)).outbox;
    const [a, b] = await Promise.all([
      move(tech, tk.tag, { to: 'diagnosis', version: 0 }),
      move(tech2, tk.tag, { to: 'diagnosis', version: 0 }),
    ]);
    assert.deepEqual([a.status, b.status].sort(), [200, 409]);
    const [moved] = await rows<{ n: number }>("SELECT COUNT(*) AS n FROM ticket_events WHERE kind = 'moved'");
    assert.equal(Number(moved.n), 1);
    assert.equal((await tableCounts(t.sequelize)).outbox, mailsBefore + 1);
    const [row] = await rows<{ version: number; state: string }>('SELECT version, state FROM tickets');
    assert.deepEqual({ ...row }, { version: 1, state: 'diagnosis' });
  });

  it('validates the move body: unknown lane, missing version, extra fields → 400', async () => {
    const tk = await openOne();
    const before = await tableSnapshot(t.sequelize);
    for (const body of [{ to: 'scrapyard', version: 0 }, { to: 'diagnosis' }, { to: 'diagnosis', version: 0, state: 'closed' }, { to: 'diagnosis', version: -1 }]) {
      const res = await move(tech, tk.tag, body).expect(400);
      assert.equal(res.body.error.code, 'validation_failed');
    }
    await move(tech, 'RW-9999', { to: 'diagnosis', version: 0 }).expect(404);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('lets an admin move a ticket too', async () => {
    const tk = await openOne();
    const res = await move(admin, tk.tag, { to: 'diagnosis', version: 0 }).expect(200);
    assert.equal(res.body.technicianName, 'Hester Vane');
  });

  it('lets exactly one of eight concurrent moves of one version win, with one event and one mail', async () => {
    const tk = await openOne();
    const mailsBefore = (await tableCounts(t.sequelize)).outbox;
    const answers = await Promise.all(
      Array.from({ length: 8 }, (_, i) => move(i % 2 ? tech : tech2, tk.tag, { to: 'diagnosis', version: 0 })),
    );
    assert.deepEqual(answers.map((a) => a.status).sort(), [200, 409, 409, 409, 409, 409, 409, 409]);
    assert.ok(answers.filter((a) => a.status === 409).every((a) => a.body.error.code === 'stale_version'));
    const [moved] = await rows<{ n: number }>("SELECT COUNT(*) AS n FROM ticket_events WHERE kind = 'moved'");
    assert.equal(Number(moved.n), 1);
    assert.equal((await tableCounts(t.sequelize)).outbox, mailsBefore + 1);
    const [row] = await rows<{ version: number }>('SELECT version FROM tickets');
    assert.equal(row.version, 1);
  });

  it('the ticket model refuses to save a stale copy over a newer one (version: true, OptimisticLockError)', async () => {
    const tk = await openOne();
    const first = (await Ticket.findByPk(tk.id))!;
    const second = (await Ticket.findByPk(tk.id))!;
    first.partsOnOrder = true;
    await first.save();
    assert.equal(first.version, 1);
    second.awaitingApproval = true;
    await assert.rejects(second.save(), OptimisticLockError);
    const [row] = await rows<{ version: number; parts_on_order: number; awaiting_approval: number }>(
      'SELECT version, parts_on_order, awaiting_approval FROM tickets',
    );
    assert.deepEqual({ ...row, parts_on_order: Boolean(row.parts_on_order), awaiting_approval: Boolean(row.awaiting_approval) }, {
      version: 1,
      parts_on_order: true,
      awaiting_approval: false,
    });
  });
});

describe('time and the club in what tickets store and send', () => {
  it('stamps intake, moves, their events and their mails with the app\'s clock', async () => {
    const clock = createTestClock(new Date('2026-03-14T18:00:00.000Z'));
    const app = createApp({ config: t.config, sequelize: t.sequelize, logger: t.logger, clock });
    const [owner, bench] = await Promise.all([signIn(app, 'perrin@kestrelfen.example', PW), signIn(app, 'tobin@kestrelfen.example', PW)]);
    const opened = (await owner.post('/api/tickets', intake()).expect(201)).body;
    assert.deepEqual([opened.createdAt, opened.stateSince, opened.events[0].at], Array(3).fill('2026-03-14T18:00:00.000Z'));
    clock.advance(5 * 3_600_000);
    const moved = (await bench.post(`/api/tickets/${opened.tag}/moves`, { to: 'diagnosis', version: 0 }).expect(200)).body;
    assert.equal(moved.stateSince, '2026-03-14T23:00:00.000Z');
    assert.deepEqual(moved.events.map((e: { at: string }) => e.at), ['2026-03-14T18:00:00.000Z', '2026-03-14T23:00:00.000Z']);
    const mails = await rows<{ next_attempt_at: Date }>('SELECT next_attempt_at FROM outbox ORDER BY id');
    // The move's mail waits out the undo grace period (RW_UNDO_GRACE_SECONDS, 10 s by default).
    assert.deepEqual(mails.map((m) => m.next_attempt_at.toISOString()), ['2026-03-14T18:00:00.000Z', '2026-03-14T23:00:10.000Z']);
    const listed = (await bench.get('/api/tickets').expect(200)).body.items[0];
    assert.deepEqual([listed.createdAt, listed.stateSince], ['2026-03-14T18:00:00.000Z', '2026-03-14T23:00:00.000Z']);
  });

  it('signs ticket mail with the club\'s name from the club settings', async () => {
    const mailText = async () => (await rows<{ text_body: string }>('SELECT text_body FROM outbox ORDER BY id DESC LIMIT 1'))[0].text_body;
    const tk = (await member.post('/api/tickets', intake()).expect(201)).body;
    assert.match(await mailText(), /\nRigwright, the repair bench of our club$/, 'the migration\'s neutral name when none is set');
    await setClubName(t.sequelize, 'Saltmarsh Amateur Radio Group');
    await tech.post(`/api/tickets/${tk.tag}/moves`, { to: 'diagnosis', version: 0 }).expect(200);
    assert.match(await mailText(), /\nRigwright, the repair bench of Saltmarsh Amateur Radio Group$/);
  });
});
