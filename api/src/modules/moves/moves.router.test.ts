// Moves through HTTP against the real MariaDB: every allowed and refused move with its guard,
// sending a ticket back to the lane it came from, undo within the grace period, the parts-on-order
// flag and technician assignment. Rules: the product brief's section 3 and issue 7 (our own design,
// no published source); guard texts come from api/src/domain/workflow.ts. Time is a test clock
// the test moves: nothing sleeps.
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import { createTestClock, createUser, setupTestApp, signIn, tableSnapshot, type TestApp, type TestClient, type TestClock } from '../../../test/helpers';
import { STATES, type TicketState } from '../../domain/workflow';
import { parseTag } from '../tickets/tag';

const PW = 'correct horse battery';
let t: TestApp;
let clock: TestClock;
let member: TestClient, tech: TestClient, tech2: TestClient, treasurer: TestClient, admin: TestClient;
const ids: Record<string, number> = {};

async function rows<T extends object>(sql: string, replacements: Record<string, unknown> = {}): Promise<T[]> {
  return t.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
}

before(async () => {
  clock = createTestClock(new Date('2026-05-09T19:00:00.000Z'));
  t = await setupTestApp({}, { clock });
  for (const [name, roles, displayName] of [
    ['perrin', ['member'], 'Perrin Sallow'],
    ['tobin', ['technician'], 'Tobin Marsh'],
    ['ysolde', ['technician'], 'Ysolde Crane'],
    ['gwilym', ['treasurer'], 'Gwilym Orchard'],
    ['hester', ['admin'], 'Hester Vane'],
    ['olwen', ['technician'], 'Olwen Reed (left the club)'],
  ] as const) {
    const u = await createUser(t.sequelize, { email: `${name}@kestrelfen.example`, password: PW, roles: [...roles], displayName, disabled: name === 'olwen' });
    ids[name] = u.id;
  }
  [member, tech, tech2, treasurer, admin] = await Promise.all(['perrin', 'tobin', 'ysolde', 'gwilym', 'hester'].map((n) => signIn(t.app, `${n}@kestrelfen.example`, PW)));
});
after(() => t.close());

interface Setup {
  consent?: boolean;
  awaitingApproval?: boolean;
  /** A 'moved' event into `state` from this lane (what "the lane it came from" reads). */
  previous?: TicketState;
}

/** A ticket handed in by the member, then put straight into `state` as the features before it would. */
async function ticketIn(state: TicketState, setup: Setup = {}): Promise<{ tag: string; id: number; version: number }> {
  const res = await member
    .post('/api/tickets', {
      equipmentKind: 'transceiver',
      makeModel: 'Fenwick Heron 100 HF transceiver',
      units: ['main body'],
      faultReported: 'No transmit on any band.',
      accessories: ['DC lead'],
      reflashConsent: setup.consent ?? true,
      notifyByEmail: false,
    })
    .expect(201);
  const id = parseTag(res.body.tag)!;
  await t.sequelize.query('UPDATE tickets SET state = :state, awaiting_approval = :held WHERE id = :id', {
    replacements: { state, held: setup.awaitingApproval ?? false, id },
  });
  if (setup.previous) {
    await t.sequelize.query(
      "INSERT INTO ticket_events (ticket_id, actor_id, kind, from_state, to_state, owner_visible, took_ticket, created_at) VALUES (:id, :actor, 'moved', :from, :to, 1, 0, :at)",
      { replacements: { id, actor: ids.tobin, from: setup.previous, to: state, at: clock() } },
    );
  }
  return { tag: res.body.tag, id, version: 0 };
}

const move = (who: TestClient, tag: string, body: Record<string, unknown>) => who.post(`/api/tickets/${tag}/moves`, body);

describe('every move and its guard (brief §3, issue 7)', () => {
  // With consent given and nothing recorded yet (no verified flash, no test sheet, no checklist).
  const allowedBare: [TicketState, TicketState][] = [
    ['intake', 'diagnosis'],
    ['diagnosis', 'reflash'],
    ['diagnosis', 'repair'],
    ['reflash', 'repair'],
    ['repair', 'bench_test'],
  ];
  const guarded: [TicketState, TicketState, RegExp][] = [
    ['diagnosis', 'return', /^Say why it goes back unrepaired/],
    ['reflash', 'bench_test', /^No flash attempt is recorded as verified running yet\.$/],
    ['bench_test', 'return', /^The test sheet has not passed yet\.$/],
    ['bench_test', 'repair', /^Say what failed on the bench in the note/],
    ['return', 'closed', /^The returned-items checklist is not done yet\.$/],
  ];

  for (const [from, to] of allowedBare) {
    it(`allows ${from} → ${to}, with its moved event`, async () => {
      const tk = await ticketIn(from);
      const res = await move(tech, tk.tag, { to, version: 0 }).expect(200);
      assert.equal(res.body.state, to);
      assert.equal(res.body.version, 1);
      const last = res.body.events.at(-1);
      assert.deepEqual([last.kind, last.fromState, last.toState], ['moved', from, to]);
    });
  }
  for (const [from, to, reason] of guarded) {
    it(`refuses ${from} → ${to} with 422 and the guard's reason, storing nothing`, async () => {
      const tk = await ticketIn(from);
      const before = await tableSnapshot(t.sequelize);
      const res = await move(tech, tk.tag, { to, version: 0 }).expect(422);
      assert.equal(res.body.error.code, 'move_not_allowed');
      assert.match(res.body.error.message, reason);
      assert.deepEqual(await tableSnapshot(t.sequelize), before);
    });
  }
  it('lifts the note guards with a note: diagnosis → return and bench test → repair', async () => {
    const a = await ticketIn('diagnosis');
    assert.equal((await move(tech, a.tag, { to: 'return', version: 0, note: 'No fault found on the bench.' }).expect(200)).body.state, 'return');
    const b = await ticketIn('bench_test');
    assert.equal((await move(tech, b.tag, { to: 'repair', version: 0, note: 'No output on 40 m.' }).expect(200)).body.state, 'repair');
  });
  it('diagnosis → reflash needs the owner’s consent', async () => {
    const tk = await ticketIn('diagnosis', { consent: false });
    const res = await move(tech, tk.tag, { to: 'reflash', version: 0 }).expect(422);
    assert.match(res.body.error.message, /has not consented to a reflash/);
  });
  it('a quote awaiting approval holds every forward move except back to the owner', async () => {
    const tk = await ticketIn('diagnosis', { awaitingApproval: true });
    assert.match((await move(tech, tk.tag, { to: 'repair', version: 0 }).expect(422)).body.error.message, /not approved the quote/);
    await move(tech, tk.tag, { to: 'return', version: 0, note: 'Owner declined the quote.' }).expect(200);
  });
  it('refuses every pair outside the table (no lane it came from) with the reason', async () => {
    const allowed = new Set([...allowedBare, ...guarded].map(([f, to]) => `${f}>${to}`));
    for (const from of STATES) {
      const tk = await ticketIn(from);
      for (const to of STATES) {
        if (allowed.has(`${from}>${to}`)) continue;
        const res = await move(tech, tk.tag, { to, version: 0, note: 'A note that does not help.' }).expect(422);
        assert.match(res.body.error.message, from === to ? /already in/ : /cannot go from/, `${from} → ${to}`);
      }
    }
  });
  it('refuses a stale version with 409 and members, treasurers with 403', async () => {
    const tk = await ticketIn('intake');
    await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200);
    assert.equal((await move(tech2, tk.tag, { to: 'repair', version: 0 }).expect(409)).body.error.code, 'stale_version');
    await move(member, tk.tag, { to: 'repair', version: 1 }).expect(403);
    await move(treasurer, tk.tag, { to: 'repair', version: 1 }).expect(403);
  });
});

describe('sending a ticket back to the lane it came from', () => {
  it('is offered on the ticket with a note asked for, and made with the note', async () => {
    const tk = await ticketIn('repair', { previous: 'diagnosis' });
    const detail = (await tech.get(`/api/tickets/${tk.tag}`).expect(200)).body;
    assert.equal(detail.previousState, 'diagnosis');
    assert.deepEqual(detail.moves.find((m: { to: string }) => m.to === 'diagnosis'), {
      to: 'diagnosis', allowed: true, noteRequired: true, reason: 'Say why it goes back to Diagnosis in the note.',
    });
    const refused = await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(422);
    assert.equal(refused.body.error.message, 'Say why it goes back to Diagnosis in the note.');
    const res = await move(tech, tk.tag, { to: 'diagnosis', version: 0, note: 'Finals are fine: the fault is in the supply. Diagnose again.' }).expect(200);
    assert.equal(res.body.state, 'diagnosis');
    const last = res.body.events.at(-1);
    assert.deepEqual([last.kind, last.fromState, last.toState, last.note], ['moved', 'repair', 'diagnosis', 'Finals are fine: the fault is in the supply. Diagnose again.']);
    // From Diagnosis the lane it came from is now Repair, which the table allows anyway.
    assert.equal(res.body.previousState, 'repair');
  });
  it('goes only to the previous lane, not to any earlier one', async () => {
    const tk = await ticketIn('bench_test', { previous: 'reflash' });
    const res = await move(tech, tk.tag, { to: 'diagnosis', version: 0, note: 'Start again from the top.' }).expect(422);
    assert.equal(res.body.error.message, 'A ticket cannot go from Bench test to Diagnosis. From Bench test it can go to: Return, Repair (or back to Reflash, with a note).');
    await move(tech, tk.tag, { to: 'reflash', version: 0, note: 'Wrong image for the display head.' }).expect(200);
  });
  it('never takes a ticket out of Closed, even to the lane it came from and with a note', async () => {
    const tk = await ticketIn('closed', { previous: 'return' });
    const before = await tableSnapshot(t.sequelize);
    const res = await move(admin, tk.tag, { to: 'return', version: 0, note: 'The owner came back: it fails again.' }).expect(422);
    assert.match(res.body.error.message, /Closed tickets stay closed\./);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
    const detail = (await admin.get(`/api/tickets/${tk.tag}`).expect(200)).body;
    assert.ok(detail.moves.every((m: { allowed: boolean }) => !m.allowed));
  });
});

describe('undo (grace period RW_UNDO_GRACE_SECONDS, 10 s by default)', () => {
  const GRACE_MS = 10_000;
  const undo = (who: TestClient, tag: string, eventId: number, version: number) => who.post(`/api/tickets/${tag}/moves/${eventId}/undo`, { version });

  it('puts the ticket back: lane, time in it, technician; both events stay on the timeline, hidden from the owner', async () => {
    const tk = await ticketIn('intake');
    const handedIn = (await tech.get(`/api/tickets/${tk.tag}`).expect(200)).body.stateSince;
    clock.advance(60_000);
    const moved = (await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200)).body;
    assert.equal(moved.technicianName, 'Tobin Marsh');
    assert.ok(moved.undo, 'the mover is offered the undo');
    assert.equal(moved.undo.fromState, 'intake');
    assert.equal(moved.undo.until, new Date(clock().getTime() + GRACE_MS).toISOString());
    clock.advance(GRACE_MS - 1);
    const res = await undo(tech, tk.tag, moved.undo.eventId, moved.version).expect(200);
    assert.equal(res.body.state, 'intake');
    assert.equal(res.body.stateSince, handedIn, 'back to the time it entered Intake');
    assert.equal(res.body.technicianName, null, 'the move had taken the ticket: the undo hands it back');
    assert.equal(res.body.version, 2);
    assert.equal(res.body.undo, null);
    assert.equal(res.body.previousState, null);
    assert.deepEqual(res.body.events.map((e: { kind: string }) => e.kind), ['opened', 'moved', 'move_undone']);
    const undone = res.body.events.at(-1);
    assert.deepEqual([undone.actorName, undone.fromState, undone.toState], ['Tobin Marsh', 'diagnosis', 'intake']);
    const visible = await rows<{ kind: string; owner_visible: number }>('SELECT kind, owner_visible FROM ticket_events WHERE ticket_id = :id ORDER BY id', { id: tk.id });
    assert.deepEqual(visible.map((e) => [e.kind, Boolean(e.owner_visible)]), [['opened', true], ['moved', false], ['move_undone', false]]);
  });

  it('answers 410 once the grace period is over, and changes nothing', async () => {
    const tk = await ticketIn('intake');
    const moved = (await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200)).body;
    clock.advance(GRACE_MS);
    assert.equal((await tech.get(`/api/tickets/${tk.tag}`).expect(200)).body.undo, null, 'no longer offered');
    const before = await tableSnapshot(t.sequelize);
    const res = await undo(tech, tk.tag, moved.undo.eventId, moved.version).expect(410);
    assert.equal(res.body.error.code, 'undo_expired');
    assert.equal(res.body.error.message, 'The time to undo this move has passed (10 seconds). Move the ticket back from the board instead; a note says why.');
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('answers 409 when the move is not the latest one, or already undone, or the version is stale', async () => {
    const tk = await ticketIn('intake');
    const first = (await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200)).body;
    const second = (await move(tech, tk.tag, { to: 'repair', version: 1 }).expect(200)).body;
    const notLatest = await undo(tech, tk.tag, first.undo.eventId, second.version).expect(409);
    assert.equal(notLatest.body.error.code, 'not_latest_move');
    assert.match(notLatest.body.error.message, /it is in Repair now.*only its latest move can be undone/);
    const stale = await undo(tech, tk.tag, second.undo.eventId, 1).expect(409);
    assert.equal(stale.body.error.code, 'stale_version');
    const back = (await undo(tech, tk.tag, second.undo.eventId, second.version).expect(200)).body;
    assert.equal(back.state, 'diagnosis');
    assert.equal(back.technicianName, 'Tobin Marsh', 'the undone move had not taken the ticket');
    assert.equal(back.previousState, 'intake', 'the undone move no longer counts as where it came from');
    assert.equal((await undo(tech, tk.tag, second.undo.eventId, back.version).expect(409)).body.error.code, 'already_undone');
    // The first move is the latest that stands, but an undo is a lane change after it.
    assert.equal((await undo(tech, tk.tag, first.undo.eventId, back.version).expect(409)).body.error.code, 'not_latest_move');
  });

  it('is for the technician who made the move, or an admin (another technician: 403)', async () => {
    const tk = await ticketIn('intake');
    const moved = (await move(tech, tk.tag, { to: 'diagnosis', version: 0 }).expect(200)).body;
    const seen = (await tech2.get(`/api/tickets/${tk.tag}`).expect(200)).body;
    assert.equal(seen.undo, null, 'not offered to another technician');
    const before = await tableSnapshot(t.sequelize);
    const res = await undo(tech2, tk.tag, moved.undo.eventId, moved.version).expect(403);
    assert.deepEqual(res.body.error, { code: 'not_your_move', message: 'Only the technician who made a move, or an admin, can undo it.' });
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
    await undo(member, tk.tag, moved.undo.eventId, moved.version).expect(403);
    assert.ok((await admin.get(`/api/tickets/${tk.tag}`).expect(200)).body.undo, 'offered to an admin');
    const res2 = await undo(admin, tk.tag, moved.undo.eventId, moved.version).expect(200);
    assert.equal(res2.body.events.at(-1).actorName, 'Hester Vane');
  });

  it('restores without asking the forward guards in reverse, and undoes a send-back too', async () => {
    const tk = await ticketIn('repair', { previous: 'diagnosis' });
    const sent = (await move(tech, tk.tag, { to: 'diagnosis', version: 0, note: 'Diagnose the supply again.' }).expect(200)).body;
    const back = (await undo(tech, tk.tag, sent.undo.eventId, sent.version).expect(200)).body;
    assert.equal(back.state, 'repair', 'Diagnosis → Repair guard-free; repair is restored even though no table move leads back');
    assert.equal(back.previousState, 'diagnosis');
  });

  it('refuses an unknown move or one of another ticket with 404, and a body without a version with 400', async () => {
    const a = await ticketIn('intake');
    const b = await ticketIn('intake');
    const moved = (await move(tech, a.tag, { to: 'diagnosis', version: 0 }).expect(200)).body;
    assert.equal((await undo(tech, b.tag, moved.undo.eventId, 0).expect(404)).body.error.code, 'move_not_found');
    assert.equal((await undo(tech, a.tag, 999_999, 1).expect(404)).body.error.code, 'move_not_found');
    const opened = moved.events[0].id;
    assert.equal((await undo(tech, a.tag, opened, 1).expect(404)).body.error.code, 'move_not_found', 'only moves are undone');
    await tech.post(`/api/tickets/${a.tag}/moves/${moved.undo.eventId}/undo`, {}).expect(400);
    await tech.post(`/api/tickets/${a.tag}/moves/0x1/undo`, { version: 1 }).expect(400);
  });
});

describe('parts on order', () => {
  it('is set and cleared by technicians, each change an event, shown as a flag on the card', async () => {
    const tk = await ticketIn('repair', { previous: 'diagnosis' });
    const set = (await tech.post(`/api/tickets/${tk.tag}/parts-on-order`, { partsOnOrder: true, note: 'Final transistor pair ordered.' }).expect(200)).body;
    assert.equal(set.partsOnOrder, true);
    const ev = set.events.at(-1);
    assert.deepEqual([ev.kind, ev.actorName, ev.note], ['parts_on_order_set', 'Tobin Marsh', 'Final transistor pair ordered.']);
    const board = (await tech.get('/api/board').expect(200)).body;
    assert.deepEqual(board.cards.find((c: { tag: string }) => c.tag === tk.tag).flags, ['parts_on_order']);
    // Setting it again changes nothing and records nothing.
    const again = (await tech2.post(`/api/tickets/${tk.tag}/parts-on-order`, { partsOnOrder: true }).expect(200)).body;
    assert.equal(again.events.length, set.events.length);
    assert.equal(again.version, set.version);
    const cleared = (await tech2.post(`/api/tickets/${tk.tag}/parts-on-order`, { partsOnOrder: false }).expect(200)).body;
    assert.equal(cleared.partsOnOrder, false);
    assert.deepEqual([cleared.events.at(-1).kind, cleared.events.at(-1).actorName], ['parts_on_order_cleared', 'Ysolde Crane']);
    const internal = await rows<{ n: number }>("SELECT COUNT(*) AS n FROM ticket_events WHERE ticket_id = :id AND kind LIKE 'parts%' AND owner_visible = 1", { id: tk.id });
    assert.equal(Number(internal[0].n), 0, 'bench records, not for the owner');
  });
  it('refuses members, bad bodies and closed tickets, storing nothing', async () => {
    const tk = await ticketIn('closed');
    const before = await tableSnapshot(t.sequelize);
    await member.post(`/api/tickets/${tk.tag}/parts-on-order`, { partsOnOrder: true }).expect(403);
    await tech.post(`/api/tickets/${tk.tag}/parts-on-order`, { partsOnOrder: 'yes' }).expect(400);
    await tech.post(`/api/tickets/${tk.tag}/parts-on-order`, { partsOnOrder: true, version: 3 }).expect(400);
    assert.equal((await tech.post(`/api/tickets/${tk.tag}/parts-on-order`, { partsOnOrder: true }).expect(422)).body.error.code, 'ticket_closed');
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });
});

describe('technician assignment', () => {
  it('lists active technicians only, by name', async () => {
    const res = await tech.get('/api/technicians').expect(200);
    assert.deepEqual(res.body.items.map((x: { displayName: string }) => x.displayName), ['Tobin Marsh', 'Ysolde Crane']);
    await member.get('/api/technicians').expect(403);
    await treasurer.get('/api/technicians').expect(403);
  });
  it('assigns to oneself, to another technician and to nobody, each an event naming the technician', async () => {
    const tk = await ticketIn('diagnosis', { previous: 'intake' });
    const mine = (await tech.post(`/api/tickets/${tk.tag}/technician`, { technicianId: ids.tobin }).expect(200)).body;
    assert.deepEqual([mine.technicianId, mine.technicianName], [ids.tobin, 'Tobin Marsh']);
    assert.deepEqual([mine.events.at(-1).kind, mine.events.at(-1).note], ['technician_assigned', 'Tobin Marsh']);
    const handed = (await tech.post(`/api/tickets/${tk.tag}/technician`, { technicianId: ids.ysolde }).expect(200)).body;
    assert.equal(handed.technicianName, 'Ysolde Crane');
    const board = (await tech.get(`/api/board?technician=${ids.ysolde}`).expect(200)).body;
    assert.deepEqual(board.cards.map((c: { tag: string }) => c.tag), [tk.tag]);
    const none = (await admin.post(`/api/tickets/${tk.tag}/technician`, { technicianId: null }).expect(200)).body;
    assert.deepEqual([none.technicianId, none.events.at(-1).kind, none.events.at(-1).actorName], [null, 'technician_unassigned', 'Hester Vane']);
  });
  it('refuses someone who is not an active technician (400), closed tickets (422) and members (403)', async () => {
    const tk = await ticketIn('repair');
    const closed = await ticketIn('closed');
    const before = await tableSnapshot(t.sequelize);
    for (const who of [ids.perrin, ids.hester, ids.olwen, 4_000_000]) {
      const res = await tech.post(`/api/tickets/${tk.tag}/technician`, { technicianId: who }).expect(400);
      assert.equal(res.body.error.fields.technicianId, 'Choose an active technician of the bench.');
    }
    await tech.post(`/api/tickets/${tk.tag}/technician`, { technicianId: '7' }).expect(400);
    await tech.post(`/api/tickets/${tk.tag}/technician`, {}).expect(400);
    assert.equal((await tech.post(`/api/tickets/${closed.tag}/technician`, { technicianId: ids.tobin }).expect(422)).body.error.code, 'ticket_closed');
    await member.post(`/api/tickets/${tk.tag}/technician`, { technicianId: ids.tobin }).expect(403);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });
});
