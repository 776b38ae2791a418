// Role x route x owner matrix over every route the app registers (reliability.md, test 8):
// deny by default, and the database unchanged after every denial. A route added without a row in
// ACCESS fails the first test, so new routes cannot slip past this sweep.
import { after, before, test } from 'node:test';
import assert from 'node:assert/strict';
import type { IncomingMessage } from 'node:http';
import { QueryTypes } from 'sequelize';
import { anonymous, createUser, registeredRoutes, setupTestApp, signIn, tableSnapshot, type TestApp, type TestClient } from '../test/helpers';
import type { Role } from './contracts/accounts';
import { benchWithSession, insertBooking } from '../test/bench-fixtures';
import { issueOwnerLink } from './modules/owner-links/owner-link-tokens';
import { parseTag } from './modules/tickets/tag';

type Actor = 'anonymous' | 'owner' | 'otherMember' | 'technician' | 'treasurer' | 'admin';
const ACTORS: Actor[] = ['anonymous', 'owner', 'otherMember', 'technician', 'treasurer', 'admin'];
const SIGNED_IN: Actor[] = ['owner', 'otherMember', 'technician', 'treasurer', 'admin'];
/** The Firmware library and flash attempts: technicians and admins only (members never, not even on their own ticket). */
const BENCH: Actor[] = ['technician', 'admin'];

/** Who gets past the access checks of each route; everyone else is refused (401, 403, or 404 for someone else's object). */
const ACCESS: Record<string, Actor[]> = {
  'GET /api/auth/session': ACTORS,
  'POST /api/auth/sign-in': ACTORS,
  'POST /api/auth/sign-out': SIGNED_IN,
  'POST /api/auth/register': ACTORS,
  'POST /api/auth/password': SIGNED_IN,
  'POST /api/auth/password-reset/request': ACTORS,
  'POST /api/auth/password-reset/confirm': ACTORS,
  'GET /api/users': ['admin'],
  'POST /api/users': ['admin'],
  'PATCH /api/users/:id': ['admin'],
  'POST /api/tickets': ['owner', 'otherMember', 'technician', 'admin'],
  'GET /api/tickets': SIGNED_IN,
  'GET /api/tickets/:tag': ['owner', 'technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/moves': ['technician', 'admin'],
  'POST /api/tickets/:tag/moves/:eventId/undo': ['technician', 'admin'], // and only the mover or an admin: moves.router.test.ts
  'POST /api/tickets/:tag/parts-on-order': ['technician', 'admin'],
  'POST /api/tickets/:tag/technician': ['technician', 'admin'],
  'GET /api/technicians': ['technician', 'admin'],
  'GET /api/tickets/owners': BENCH,
  'PATCH /api/tickets/:tag/intake': BENCH,
  'GET /api/tickets/:tag/intake-tag.pdf': ['owner', 'technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/photos': ['owner', 'technician', 'admin'], // the owner at intake only
  'GET /api/tickets/:tag/photos': ['owner', 'technician', 'treasurer', 'admin'],
  'GET /api/tickets/:tag/photos/:photoId': ['owner', 'technician', 'treasurer', 'admin'],
  'GET /api/board': ['technician', 'admin'],
  'GET /api/board/events': ['technician', 'admin'],
  'GET /api/calc/xmodem': SIGNED_IN,
  'GET /api/calc/rf': SIGNED_IN,
  'GET /api/calc/dc-drop': SIGNED_IN,
  'GET /api/calc/level': SIGNED_IN,
  'GET /api/calc/dummy-load': SIGNED_IN,
  'GET /api/calc/attenuator': SIGNED_IN,
  'GET /api/calc/line-loss': SIGNED_IN,
  'GET /api/calc/discharge': SIGNED_IN,
  'POST /api/firmware': BENCH,
  'GET /api/firmware': BENCH,
  'GET /api/firmware/models': BENCH,
  'GET /api/firmware/track-record': BENCH,
  'GET /api/firmware/:id': BENCH,
  'POST /api/firmware/:id/known-good': BENCH,
  'POST /api/firmware/:id/withdraw': BENCH,
  'GET /api/firmware/:id/download': BENCH,
  'GET /api/tickets/:tag/flash-attempts': BENCH,
  'POST /api/tickets/:tag/flash-attempts': BENCH,
  'GET /api/tickets/:tag/flash-attempts/:number/log': BENCH,
  'GET /api/benches': SIGNED_IN,
  'POST /api/benches': ['admin'],
  'PATCH /api/benches/:benchId': ['admin'],
  'GET /api/benches/settings': SIGNED_IN,
  'PATCH /api/benches/settings': ['admin'],
  'GET /api/benches/opening-rules': ['admin'],
  'POST /api/benches/opening-rules': ['admin'],
  'DELETE /api/benches/opening-rules/:ruleId': ['admin'],
  'GET /api/bookings/calendar/sessions.ics': ACTORS,
  'GET /api/bookings/calendar/member.ics': ACTORS, // the secret token is the key (no token: 400, wrong: 404)
  'GET /api/bookings/calendar': SIGNED_IN,
  'POST /api/bookings/calendar/reset': SIGNED_IN,
  'GET /api/bookings/slots': SIGNED_IN,
  'GET /api/bookings/schedule': ['technician', 'admin'],
  'GET /api/bookings': SIGNED_IN, // each person's own
  'POST /api/bookings': ['owner', 'otherMember', 'technician', 'admin'],
  'GET /api/bookings/:bookingId': ['owner', 'technician', 'treasurer', 'admin'],
  'PATCH /api/bookings/:bookingId': ['owner'],
  'POST /api/bookings/:bookingId/cancel': ['owner', 'admin'],
  'POST /api/bookings/:bookingId/no-show': ['technician', 'admin'],
  // Repair log: the bench's internal record (treasurers read it for parts at cost; owners never).
  'GET /api/tickets/:tag/repair-log': ['technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/repair-log/work': BENCH,
  'POST /api/tickets/:tag/repair-log/parts': BENCH,
  // Test sheets and the hand-back: the owner reads their own ticket's; the bench records them.
  'GET /api/tickets/:tag/test-sheets': ['owner', 'technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/test-sheets': BENCH,
  'GET /api/tickets/:tag/test-sheets/:sheetId/report.pdf': ['owner', 'technician', 'treasurer', 'admin'],
  'GET /api/tickets/:tag/hand-back': ['owner', 'technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/hand-back': BENCH,
  'GET /api/test-limits': SIGNED_IN,
  'PATCH /api/test-limits': ['admin'],
  'GET /api/tickets/:tag/notes': ['owner', 'technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/notes': BENCH,
  'GET /api/tickets/:tag/quotes': ['owner', 'technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/quotes': BENCH,
  'GET /api/tickets/:tag/diagnosis': BENCH,
  'PUT /api/tickets/:tag/diagnosis': BENCH,
  'GET /api/tickets/:tag/reflash-consent': BENCH,
  'POST /api/tickets/:tag/reflash-consent': BENCH,
  'GET /api/club/quote-settings': SIGNED_IN,
  'PATCH /api/club/quote-settings': ['admin'],
  // The owner's links need no account: the random token in the path is the key (a wrong one: 404).
  'GET /api/owner/status/:tag/:token': ACTORS,
  'POST /api/owner/status/:tag/:token/consent': ACTORS,
  'POST /api/owner/status/:tag/:token/checkout': ACTORS,
  'GET /api/owner/approval/:tag/:token': ACTORS,
  'POST /api/owner/approval/:tag/:token': ACTORS,
  'GET /api/fees': SIGNED_IN,
  'POST /api/fees': ['treasurer'],
  'POST /api/fees/:feeId/prices': ['treasurer'],
  'GET /api/tickets/:tag/ledger': ['owner', 'technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/ledger/charges': ['technician', 'treasurer', 'admin'],
  'POST /api/tickets/:tag/ledger/payments': ['treasurer'],
  'POST /api/tickets/:tag/ledger/checkout': ['owner'], // members only, and only their own ticket
  'GET /api/bookings/:bookingId/charges': ['owner', 'technician', 'treasurer', 'admin'],
  'POST /api/bookings/:bookingId/charges': ['technician', 'treasurer', 'admin'],
  'POST /api/charges/:chargeId/waivers': ['treasurer'],
  'POST /api/payments/webhook': ACTORS, // signed by the provider instead (no signature: 400)
  'POST /api/payments/:paymentId/refunds': ['treasurer'],
  'GET /api/payments/:paymentId/receipt.pdf': ['owner', 'treasurer', 'admin'],
  'GET /api/reconciliation/:month': ['treasurer'],
  'GET /api/reconciliation/:month/csv': ['treasurer'],
  'POST /api/reconciliation/:month/close': ['treasurer'],
};

/** Writes open to a ticket's owner: another member's ticket answers 404 there (roles without the route still 403). */
const OWNER_WRITES = new Set(['POST /api/tickets/:tag/photos']);
/** Routes on a ticket still at intake (the owner may add photos only then). */
const ON_INTAKE_TICKET = (path: string) => path.includes('/photos') || path.endsWith('/intake');

/** Routes where someone else's object answers 404 (it is not theirs to know about), not 403. */
const NOT_YOURS = new Set([
  'GET /api/bookings/:bookingId',
  'PATCH /api/bookings/:bookingId',
  'POST /api/bookings/:bookingId/cancel',
  'GET /api/bookings/:bookingId/charges',
  'GET /api/payments/:paymentId/receipt.pdf',
]);
/** Routes that refuse a role with 403 and someone else's object (with the role) with 404. */
const ROLE_THEN_OWNER = new Set(['POST /api/tickets/:tag/ledger/checkout']);

const PASSWORD = 'matrix-sweep-passphrase';
const ACCOUNTS: Record<Exclude<Actor, 'anonymous'>, Role[]> = {
  owner: ['member'],
  otherMember: ['member'],
  technician: ['technician'],
  treasurer: ['treasurer'],
  admin: ['admin'],
};

let t: TestApp;
let ticketTag = '';
let intakeTag = '';
let photoId = 0;
let otherMemberId = 0;
let firmwareId = 0;
let bench = { benchId: 0, ruleId: 0, bookingId: 0 };
let sheetId = 0;
let sheetTag = '';
const ownerTokens = { status: '', approve: '' };
let paymentId = 0;

before(async () => {
  // Every request below signs in afresh; lift the per-address throttle for this sweep only.
  t = await setupTestApp({ RW_SIGNIN_MAX_PER_ADDRESS: '100000', RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS: '100000' });
  for (const [actor, roles] of Object.entries(ACCOUNTS)) {
    const user = await createUser(t.sequelize, { email: `${actor.toLowerCase()}@matrix.example`, password: PASSWORD, roles });
    if (actor === 'otherMember') otherMemberId = user.id;
  }
  const owner = await client('owner');
  const res = await owner.post('/api/tickets', {
    equipmentKind: 'transceiver',
    makeModel: 'Matrix test transceiver',
    units: ['main body'],
    faultReported: 'Display stays dark after power-on.',
    accessories: [],
    reflashConsent: true,
    notifyByEmail: false,
  });
  assert.equal(res.status, 201, res.text);
  ticketTag = res.body.tag;

  // A firmware image and one flash attempt with a serial log, so the routes that name them have rows to find.
  const tech = await client('technician');
  let version = res.body.version;
  for (const to of ['diagnosis', 'reflash']) {
    const moved = await tech.post(`/api/tickets/${ticketTag}/moves`, { to, version });
    assert.equal(moved.status, 200, moved.text);
    version = moved.body.version;
  }
  const image = await tech
    .post('/api/firmware')
    .field('model', 'Matrix test transceiver')
    .field('unit', 'main_board')
    .field('version', '1.0')
    .attach('image', Buffer.from('matrix sweep image bytes'), 'image.bin');
  assert.equal(image.status, 201, image.text);
  firmwareId = image.body.id;
  const attempt = await tech
    .post(`/api/tickets/${ticketTag}/flash-attempts`)
    .field('unit', 'main_board')
    .field('firmwareId', String(firmwareId))
    .field('port', 'COM3')
    .field('outcome', 'transfer_completed')
    .attach('serialLog', Buffer.from('Erase OK\nTransfer complete\n'), 'log.txt');
  assert.equal(attempt.status, 201, attempt.text);
  // A second ticket with a test sheet, so the report route has a sheet to find.
  const second = await owner.post('/api/tickets', {
    equipmentKind: 'transceiver',
    makeModel: 'Matrix test transceiver',
    units: ['main body'],
    faultReported: 'No transmit output.',
    accessories: [],
    reflashConsent: false,
    notifyByEmail: false,
  });
  assert.equal(second.status, 201, second.text);
  let secondVersion = second.body.version;
  for (const to of ['diagnosis', 'repair', 'bench_test']) {
    const moved = await tech.post(`/api/tickets/${second.body.tag}/moves`, { to, version: secondVersion });
    assert.equal(moved.status, 200, moved.text);
    secondVersion = moved.body.version;
  }
  const sheet = await tech.post(`/api/tickets/${second.body.tag}/test-sheets`, {
    supplyVoltageV: 13.8,
    receiveCurrentA: 1.2,
    bands: [{ band: '20 m', ratedW: 100, forwardW: 100, reflectedW: 1 }],
  });
  assert.equal(sheet.status, 201, sheet.text);
  sheetId = sheet.body.sheet.id;
  sheetTag = second.body.tag;
  // A second ticket of the owner's, still at intake, with a photo: the intake and photo routes use it.
  const atIntake = await owner.post('/api/tickets', {
    equipmentKind: 'tuner',
    makeModel: 'Matrix test tuner',
    units: [],
    faultReported: 'Relay stuck on one band.',
    accessories: [],
    reflashConsent: false,
    updatesBy: 'none',
  });
  assert.equal(atIntake.status, 201, atIntake.text);
  intakeTag = atIntake.body.tag;
  const png = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAIAAACQd1PeAAAADElEQVR4nGNgYGAAAAAEAAH2FzhVAAAAAElFTkSuQmCC', 'base64');
  const photo = await tech.post(`/api/tickets/${intakeTag}/photos`).field('stage', 'intake').attach('photo', png, 'matrix.png');
  assert.equal(photo.status, 201, photo.text);
  photoId = photo.body.id;
  const fixture = await benchWithSession();
  const ownerId = (await t.sequelize.query<{ id: number }>("SELECT id FROM users WHERE email = 'owner@matrix.example'", { type: QueryTypes.SELECT }))[0]!.id;
  const booking = await insertBooking(t.sequelize, { benchId: fixture.bench.id, userId: ownerId, start: fixture.at('19:00') });
  bench = { benchId: fixture.bench.id, ruleId: fixture.rule.id, bookingId: booking.id };
  // Owner links for the public routes (an approval link without a quote answers 410, past the access checks).
  await t.sequelize.transaction(async (transaction) => {
    const ticketId = parseTag(ticketTag)!;
    ownerTokens.status = await issueOwnerLink(transaction, { purpose: 'status', ticketId }, new Date());
    ownerTokens.approve = await issueOwnerLink(transaction, { purpose: 'approve', ticketId }, new Date());
  });

  // A charge and a cash payment on the owner's ticket, so the receipt route has a payment to find.
  const treasurer = await client('treasurer');
  const today = new Date().toISOString().slice(0, 10);
  const fees = await treasurer.post('/api/fees', { code: 'diagnosis', name: 'Diagnosis', unit: 'each', memberPrice: 500, nonMemberPrice: 800, effectiveFrom: today });
  assert.equal(fees.status, 201, fees.text);
  const charged = await tech.post(`/api/tickets/${ticketTag}/ledger/charges`, { feeItemId: fees.body.items[0].id, quantity: 1 });
  assert.equal(charged.status, 201, charged.text);
  const paid = await treasurer.post(`/api/tickets/${ticketTag}/ledger/payments`, { method: 'cash', amount: 500, reference: 'Matrix cash book' });
  assert.equal(paid.status, 201, paid.text);
  paymentId = paid.body.payments[0].id;
});

after(() => t.close());

async function client(actor: Actor): Promise<TestClient> {
  if (actor === 'anonymous') return anonymous(t.app);
  return signIn(t.app, `${actor.toLowerCase()}@matrix.example`, PASSWORD);
}

function urlFor(path: string): string {
  const id = path.startsWith('/api/firmware/') ? firmwareId : otherMemberId;
  return path
    .replace(':tag', path.includes(':sheetId') ? sheetTag : ON_INTAKE_TICKET(path) ? intakeTag : ticketTag)
    .replace(':sheetId', String(sheetId))
    .replace(':token', path.includes('/approval/') ? ownerTokens.approve : ownerTokens.status)
    .replace(':photoId', String(photoId))
    .replace(':id', String(id))
    .replace(':number', '1')
    .replace(':eventId', '1')
    .replace(':benchId', String(bench.benchId))
    .replace(':ruleId', String(bench.ruleId))
    .replace(':bookingId', String(bench.bookingId))
    .replace(':feeId', '1')
    .replace(':chargeId', '1')
    .replace(':paymentId', String(paymentId))
    .replace(':month', '2026-01');
}

test('every registered API route has a row in the access matrix', () => {
  const routes = registeredRoutes(t.app)
    .filter((r) => r.path.startsWith('/api'))
    .map((r) => `${r.method} ${r.path}`);
  assert.ok(routes.length >= Object.keys(ACCESS).length, `found only ${routes.length} routes`);
  const missing = routes.filter((r) => !(r in ACCESS));
  assert.deepEqual(missing, [], `routes without a row in ACCESS: ${missing.join(', ')}`);
  const stale = Object.keys(ACCESS).filter((r) => !routes.includes(r));
  assert.deepEqual(stale, [], `rows for routes that no longer exist: ${stale.join(', ')}`);
});

for (const [route, allowed] of Object.entries(ACCESS)) {
  test(`${route}: ${allowed.length === ACTORS.length ? 'anyone gets' : `only ${allowed.join(', ')} get`} past the access checks`, async () => {
    const [method, path] = route.split(' ') as [string, string];
    for (const actor of ACTORS) {
      const c = await client(actor);
      const before = await tableSnapshot(t.sequelize);
      // An empty body: an allowed actor meets validation (or succeeds), a refused one meets the guard.
      const url = urlFor(path);
      const res =
        method === 'GET'
          ? await streamSafeGet(c, url)
          : method === 'PATCH'
            ? await c.patch(url, {})
            : method === 'DELETE'
              ? await c.delete(url)
              : method === 'PUT'
                ? await c.put(url, {})
                : await c.post(url, {});
      const refused = res.status === 401 || res.status === 403 || (res.status === 404 && path.includes(':'));
      if (allowed.includes(actor)) {
        assert.ok(!refused, `${actor} was refused ${route} with ${res.status}: ${res.text}`);
        assert.ok(res.status < 500, `${actor} got ${res.status} from ${route}`);
      } else {
        // Someone else's ticket reads as "not found"; routes closed to a role answer 403 before looking.
        // Routes under a ticket closed to members refuse the role first (403); someone else's booking is 404 too.
        const expected =
          actor === 'anonymous'
            ? [401]
            : NOT_YOURS.has(route) || (OWNER_WRITES.has(route) && actor === 'otherMember')
              ? [404]
              : ROLE_THEN_OWNER.has(route)
                ? [403, 404]
              : path.includes(':tag') && method === 'GET'
                ? allowed.includes('owner')
                  ? [404]
                  : [403]
                : [403];
        assert.ok(expected.includes(res.status), `${actor} got ${res.status} from ${route}, expected ${expected.join(' or ')}`);
        assert.equal(typeof res.body?.error?.message, 'string', 'a refusal carries a message');
        assert.deepEqual(await tableSnapshot(t.sequelize), before, `${actor}'s refused ${route} changed the database`);
      }
    }
  });
}

/**
 * A GET that also works on an event stream (GET /api/board/events never ends by itself): the body
 * of a text/event-stream answer is read up to its first chunk and then dropped; any other answer
 * is read whole, as usual.
 */
function streamSafeGet(c: TestClient, url: string) {
  return c
    .get(url)
    .buffer(true)
    .parse((response, done) => {
      const res = response as unknown as IncomingMessage;
      const type = String(res.headers['content-type'] ?? '');
      let text = '';
      res.setEncoding('utf8');
      if (type.startsWith('text/event-stream')) {
        res.once('data', (chunk: string) => {
          res.destroy();
          done(null, { stream: chunk });
        });
        return;
      }
      res.on('data', (chunk: string) => (text += chunk));
      res.on('end', () => {
        let body: unknown = text;
        try {
          body = JSON.parse(text);
        } catch {
          // not JSON: keep the text
        }
        done(null, body);
      });
    });
}
