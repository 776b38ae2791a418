// Intake, complete (issue 7) through HTTP against the real MariaDB: the owner rules (a member chosen
// from the accounts, or someone at the bench with a name and an e-mail or a phone), symptoms and
// accessories, how the owner wants updates (no mail without an address), and intake edits with the
// ticket's version and a bench-only timeline event. The rules are our own design (issue 7).
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import { createUser, setupTestApp, signIn, tableSnapshot, truncateAll, type TestApp, type TestClient } from '../../../test/helpers';
import { CONTACT_MESSAGE } from '../tickets/tickets.schemas';
import { describeIntakeChanges } from './intake.service';

const PW = 'correct horse battery';

const intake = (extra: Record<string, unknown> = {}) => ({
  equipmentKind: 'transceiver',
  makeModel: 'Fenwick Heron 100 HF transceiver',
  serialNumber: 'FH100-20931',
  units: ['display head', 'main body'],
  symptoms: ['relay_clicks_no_display'],
  faultReported: 'Display dark after a power cut; the relay clicks.',
  accessories: ['Control cable', 'Microphone'],
  accessoriesNote: 'Mic cord taped near the plug.',
  firmwareVersions: 'Head 1.07',
  reflashConsent: true,
  updatesBy: 'email',
  ...extra,
});

let t: TestApp;
let member: TestClient, member2: TestClient, tech: TestClient, treasurer: TestClient;
let memberId = 0;

async function rows<T extends object>(sql: string, replacements: Record<string, unknown> = {}): Promise<T[]> {
  return t.sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
}

before(async () => {
  t = await setupTestApp();
});
after(() => t.close());

beforeEach(async () => {
  await truncateAll(t.sequelize);
  memberId = (await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow', callSign: 'Q3PSW' })).id;
  await createUser(t.sequelize, { email: 'morwenna@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Morwenna Tulk' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  await createUser(t.sequelize, { email: 'gwilym@kestrelfen.example', password: PW, roles: ['treasurer'], displayName: 'Gwilym Orchard' });
  [member, member2, tech, treasurer] = await Promise.all(['perrin', 'morwenna', 'tobin', 'gwilym'].map((n) => signIn(t.app, `${n}@kestrelfen.example`, PW)));
});

describe('POST /api/tickets: the owner', () => {
  it('refuses a walk-in owner with neither e-mail nor phone, naming both fields, and stores nothing', async () => {
    const before = await tableSnapshot(t.sequelize);
    const res = await tech.post('/api/tickets', intake({ owner: { name: 'Edmund Rushby' }, updatesBy: 'none' })).expect(400);
    assert.equal(res.body.error.code, 'validation_failed');
    assert.equal(res.body.error.fields['owner.email'], CONTACT_MESSAGE);
    assert.equal(res.body.error.fields['owner.phone'], CONTACT_MESSAGE);
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('refuses a walk-in owner without a name', async () => {
    const res = await tech.post('/api/tickets', intake({ owner: { email: 'e@fenmail.example' } })).expect(400);
    assert.equal(res.body.error.fields['owner.name'], 'Give the owner’s name.');
  });

  it('refuses a phone number that is not one, in plain words', async () => {
    const res = await tech.post('/api/tickets', intake({ owner: { name: 'Edmund Rushby', phone: 'call me' }, updatesBy: 'none' })).expect(400);
    assert.match(res.body.error.fields['owner.phone'], /phone number in digits/);
  });

  it('takes a walk-in owner with a phone only: no e-mail stored, no mail queued', async () => {
    const res = await tech.post('/api/tickets', intake({ owner: { name: 'Edmund Rushby', phone: '01632 960417' }, updatesBy: 'phone' })).expect(201);
    assert.equal(res.body.ownerEmail, null);
    assert.equal(res.body.ownerPhone, '01632 960417');
    assert.equal(res.body.updatesBy, 'phone');
    assert.equal(res.body.notifyByEmail, false);
    assert.deepEqual(await rows('SELECT id FROM outbox'), []);
  });

  it('refuses updates by e-mail for an owner who gave only a phone', async () => {
    const res = await tech.post('/api/tickets', intake({ owner: { name: 'Edmund Rushby', phone: '01632 960417' }, updatesBy: 'email' })).expect(400);
    assert.match(res.body.error.fields.updatesBy, /need the owner’s e-mail address/);
  });

  it('takes a walk-in owner with an e-mail only, and mails the equipment, serial and accessories', async () => {
    const res = await tech.post('/api/tickets', intake({ owner: { name: 'Edmund Rushby', email: 'e.rushby@fenmail.example' } })).expect(201);
    assert.equal(res.body.ownerPhone, null);
    const [mail] = await rows<{ recipient: string; body_text: string }>('SELECT * FROM outbox');
    assert.ok(mail, 'one mail queued');
    const text = Object.values(mail).join('\n');
    assert.match(text, /e\.rushby@fenmail\.example/);
    assert.match(text, /Equipment: Fenwick Heron 100 HF transceiver \(display head, main body\)/);
    assert.match(text, /Serial number: FH100-20931/);
    assert.match(text, /Accessories handed in: Control cable, Microphone/);
    assert.match(text, /Symptoms: Relay clicks, no display/);
  });

  it('lets a technician choose a member from the accounts; the ticket is theirs', async () => {
    const found = await tech.get('/api/tickets/owners?q=Sallow').expect(200);
    assert.deepEqual(found.body.items.map((u: { displayName: string }) => u.displayName), ['Perrin Sallow']);
    const res = await tech.post('/api/tickets', intake({ owner: { accountId: found.body.items[0].id } })).expect(201);
    assert.equal(res.body.ownerName, 'Perrin Sallow');
    assert.equal(res.body.ownerEmail, 'perrin@kestrelfen.example');
    assert.equal(res.body.ownerCallSign, 'Q3PSW');
    const [row] = await rows<{ owner_user_id: number }>('SELECT owner_user_id FROM tickets');
    assert.equal(row!.owner_user_id, memberId);
    await member.get(`/api/tickets/${res.body.tag}`).expect(200);
  });

  it('refuses an account id together with walk-in details, and an account that does not exist', async () => {
    const both = await tech.post('/api/tickets', intake({ owner: { accountId: memberId, name: 'Someone' } })).expect(400);
    assert.match(both.body.error.fields['owner.accountId'], /not both/);
    const missing = await tech.post('/api/tickets', intake({ owner: { accountId: 999999 } })).expect(400);
    assert.equal(missing.body.error.fields['owner.accountId'], 'Choose the member from the list.');
  });

  it('keeps the member search to technicians and admins', async () => {
    await member.get('/api/tickets/owners?q=a').expect(403);
    await treasurer.get('/api/tickets/owners?q=a').expect(403);
  });
});

describe('POST /api/tickets: symptoms, accessories, updates', () => {
  it('stores ticked symptoms as codes, accessories and their note', async () => {
    const res = await member.post('/api/tickets', intake({ symptoms: ['no_transmit', 'other'] })).expect(201);
    assert.deepEqual(res.body.symptoms, ['no_transmit', 'other']);
    assert.deepEqual(res.body.accessories, ['Control cable', 'Microphone']);
    assert.equal(res.body.accessoriesNote, 'Mic cord taped near the plug.');
  });

  it('refuses unknown and repeated symptoms, and an unknown way of updates', async () => {
    let res = await member.post('/api/tickets', intake({ symptoms: ['smoke'] })).expect(400);
    assert.equal(res.body.error.fields['symptoms.0'], 'Choose symptoms from the list.');
    res = await member.post('/api/tickets', intake({ symptoms: ['no_power', 'no_power'] })).expect(400);
    assert.equal(res.body.error.fields.symptoms, 'Tick each symptom once.');
    res = await member.post('/api/tickets', intake({ updatesBy: 'pigeon' })).expect(400);
    assert.match(res.body.error.fields.updatesBy, /e-mail, phone or none/);
    const { updatesBy: _omitted, ...noChannel } = intake();
    res = await member.post('/api/tickets', noChannel).expect(400);
    assert.match(res.body.error.fields.updatesBy, /Choose how the owner wants updates/);
  });

  it('sends no mail when the owner wants updates by phone or none', async () => {
    await member.post('/api/tickets', intake({ updatesBy: 'none' })).expect(201);
    await member.post('/api/tickets', intake({ updatesBy: 'phone' })).expect(201);
    assert.deepEqual(await rows('SELECT id FROM outbox'), []);
  });
});

describe('PATCH /api/tickets/:tag/intake', () => {
  it('changes what was sent, bumps the version and records a bench-only event saying what changed', async () => {
    const opened = (await member.post('/api/tickets', intake()).expect(201)).body;
    const res = await tech
      .patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, serialNumber: 'FH100-20932', accessories: ['Control cable', 'Manual'] })
      .expect(200);
    assert.equal(res.body.serialNumber, 'FH100-20932');
    assert.deepEqual(res.body.accessories, ['Control cable', 'Manual']);
    assert.equal(res.body.version, opened.version + 1);
    assert.equal(res.body.makeModel, opened.makeModel, 'fields not sent stay as they were');
    const edited = res.body.events.find((e: { kind: string }) => e.kind === 'intake_edited');
    assert.equal(edited.actorName, 'Tobin Marsh');
    assert.equal(edited.note, 'Intake details changed. Serial number: “FH100-20931” → “FH100-20932”. Accessories: added Manual; removed Microphone.');
    const [row] = await rows<{ owner_visible: number }>("SELECT owner_visible FROM ticket_events WHERE kind = 'intake_edited'");
    assert.equal(Number(row!.owner_visible), 0, 'an edit is a bench record, not the owner’s to read');
  });

  it('answers 409 on a stale version and changes nothing', async () => {
    const opened = (await member.post('/api/tickets', intake()).expect(201)).body;
    await tech.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, makeModel: 'Fenwick Heron 100 mk II' }).expect(200);
    const before = await tableSnapshot(t.sequelize);
    const stale = await tech.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, makeModel: 'Fenwick Heron 100' }).expect(409);
    assert.equal(stale.body.error.code, 'stale_version');
    assert.deepEqual(await tableSnapshot(t.sequelize), before);
  });

  it('validates like intake: a walk-in owner keeps a name and an e-mail or phone; unknown fields are refused', async () => {
    const opened = (await tech.post('/api/tickets', intake({ owner: { name: 'Edmund Rushby', phone: '01632 960417' }, updatesBy: 'phone' })).expect(201)).body;
    let res = await tech.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, owner: { name: 'Edmund Rushby' } }).expect(400);
    assert.equal(res.body.error.fields['owner.phone'], CONTACT_MESSAGE);
    res = await tech.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, state: 'closed' }).expect(400);
    assert.equal(res.body.error.code, 'validation_failed');
    res = await tech.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version }).expect(400);
    assert.match(res.body.error.message, /Change at least one detail/);
    res = await tech.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, updatesBy: 'email' }).expect(422);
    assert.equal(res.body.error.code, 'no_email_address');
    // Adding the address makes e-mail updates possible, in one edit.
    res = await tech
      .patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, owner: { name: 'Edmund Rushby', phone: '01632 960417', email: 'e.rushby@fenmail.example' }, updatesBy: 'email' })
      .expect(200);
    assert.equal(res.body.notifyByEmail, true);
    assert.match(res.body.events.at(-1).note, /Owner’s e-mail: nothing → “e\.rushby@fenmail\.example”/);
  });

  it('does not change the details of an owner who has an account', async () => {
    const opened = (await member.post('/api/tickets', intake()).expect(201)).body;
    const res = await tech.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, owner: { name: 'Someone Else', phone: '01632 960001' } }).expect(422);
    assert.equal(res.body.error.code, 'owner_has_account');
  });

  it('is for technicians: the owner and other roles are refused, another member cannot even see it', async () => {
    const opened = (await member.post('/api/tickets', intake()).expect(201)).body;
    await member.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, serialNumber: 'X' }).expect(403);
    await member2.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, serialNumber: 'X' }).expect(403);
    await treasurer.patch(`/api/tickets/${opened.tag}/intake`, { version: opened.version, serialNumber: 'X' }).expect(403);
  });
});

describe('describeIntakeChanges', () => {
  const before = {
    equipmentKind: 'transceiver' as const,
    makeModel: 'Heron 100',
    serialNumber: null,
    units: ['main body'],
    symptoms: ['no_power' as const],
    faultReported: 'Dead.',
    accessories: [],
    accessoriesNote: null,
    firmwareVersions: null,
    updatesBy: 'email' as const,
    ownerName: 'A',
    ownerEmail: 'a@example.org',
    ownerPhone: null,
    ownerCallSign: null,
  };
  it('says nothing for values sent unchanged, and one line per real change', () => {
    assert.deepEqual(describeIntakeChanges(before, { makeModel: 'Heron 100', units: ['main body'] }), []);
    assert.deepEqual(describeIntakeChanges(before, { equipmentKind: 'tuner', serialNumber: 'S-1', symptoms: ['no_power', 'no_receive'] }), [
      'Kind: Transceiver → Antenna tuner',
      'Serial number: nothing → “S-1”',
      'Symptoms: added No receive',
    ]);
  });
});
