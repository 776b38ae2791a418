// Session tokens and their end: forged tokens (RFC 7519 / RFC 8725 JWT BCP: algorithm pinned,
// iss/aud/exp checked), revocation by session generation (ASVS 7.4.x), registration and reset.
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import jwt from 'jsonwebtoken';
import { QueryTypes } from 'sequelize';
import { backgroundWork } from '../../background';
import { anonymous, createUser, setupTestApp, signIn, tableCounts, type TestApp, type TestClient } from '../../../test/helpers';

const apps: TestApp[] = [];
after(async () => {
  for (const a of apps) await a.close();
});
async function app(overrides: Parameters<typeof setupTestApp>[0] = {}) {
  const t = await setupTestApp(overrides);
  apps.push(t);
  return t;
}

const ADMIN = { email: 'marta.fenwick@kestrelfen.example', password: 'lantern keeper dusk', roles: ['admin' as const], displayName: 'Marta Fenwick' };
const TECH = { email: 'odo.rushby@kestrelfen.example', password: 'solder fumes rising', roles: ['technician' as const], displayName: 'Odo Rushby' };

const b64 = (o: object) => Buffer.from(JSON.stringify(o)).toString('base64url');

/** A client whose cookie jar holds the given session token (and a fresh anti-forgery cookie). */
async function withToken(t: TestApp, token: string): Promise<TestClient> {
  const c = await anonymous(t.app);
  c.setCookie('rw_session', token);
  return c;
}

test('forged tokens are refused with 401: alg none, edited claims, expired, wrong audience, wrong key', async () => {
  const t = await app();
  const admin = await createUser(t.sequelize, ADMIN);
  const tech = await createUser(t.sequelize, TECH);
  const secret = t.config.RW_JWT_SECRET;
  const now = Math.floor(Date.now() / 1000);
  const good = { gen: 0, sub: String(admin.id), jti: 'abcdefghijklmnopqrstuv', iss: 'rigwright', aud: 'rigwright-web', at: now };

  // Control: a token built the way the server builds it passes, so the refusals below mean something.
  const control = jwt.sign({ ...good, exp: now + 600 }, secret, { algorithm: 'HS256' });
  await (await withToken(t, control)).get('/api/users').expect(200);

  const techSession = await signIn(t.app, TECH.email, TECH.password);
  const techToken = techSession.cookie('rw_session')!;
  const [header, payload, signature] = techToken.split('.');
  const techClaims = JSON.parse(Buffer.from(payload!, 'base64url').toString());
  assert.equal(techClaims.sub, String(tech.id));

  const forged: Record<string, string> = {
    'alg none': `${b64({ alg: 'none', typ: 'JWT' })}.${b64({ ...good, exp: now + 600 })}.`,
    'alg none with the real signature': `${b64({ alg: 'none', typ: 'JWT' })}.${b64({ ...good, exp: now + 600 })}.${signature}`,
    'edited sub (technician made admin), old signature': `${header}.${b64({ ...techClaims, sub: String(admin.id) })}.${signature}`,
    'edited role claim, old signature': `${header}.${b64({ ...techClaims, roles: ['admin'] })}.${signature}`,
    'edited generation, old signature': `${header}.${b64({ ...techClaims, gen: 7 })}.${signature}`,
    expired: jwt.sign({ ...good, exp: now - 10 }, secret, { algorithm: 'HS256' }),
    'wrong audience': jwt.sign({ ...good, aud: 'rigwright-api', exp: now + 600 }, secret, { algorithm: 'HS256' }),
    'wrong issuer': jwt.sign({ ...good, iss: 'elsewhere', exp: now + 600 }, secret, { algorithm: 'HS256' }),
    'another key': jwt.sign({ ...good, exp: now + 600 }, 'x'.repeat(48), { algorithm: 'HS256' }),
    'HS512 with the right key': jwt.sign({ ...good, exp: now + 600 }, secret, { algorithm: 'HS512' }),
    'no exp': jwt.sign(good, secret, { algorithm: 'HS256' }),
    garbage: 'not-a-token',
  };
  for (const [name, token] of Object.entries(forged)) {
    const c = await withToken(t, token);
    const res = await c.get('/api/users');
    assert.equal(res.status, 401, name);
    assert.equal(res.body.error.code, 'not_signed_in', name);
    const session = await c.get('/api/auth/session').expect(200);
    assert.equal(session.body.user, null, name);
  }
  // The technician's own token still works for what a technician may do, and no more.
  await techSession.get('/api/users').expect(403);
  assert.equal((await techSession.get('/api/auth/session')).body.user.id, tech.id);
});

/** Signs in twice (two sessions), runs `act`, and checks both old cookies are dead afterwards. */
async function assertSessionsEnd(t: TestApp, who: { email: string; password: string }, act: (own: TestClient) => Promise<void>) {
  const own = await signIn(t.app, who.email, who.password);
  const other = await signIn(t.app, who.email, who.password);
  const oldToken = own.cookie('rw_session')!;
  const oldXsrf = own.cookie('XSRF-TOKEN')!;
  assert.ok((await other.get('/api/auth/session')).body.user, 'signed in before');
  await act(own);
  // The other session ends.
  assert.equal((await other.get('/api/auth/session')).body.user, null);
  await other.post('/api/auth/password', { currentPassword: who.password, newPassword: 'any new thing at all' }).expect(401);
  // The old cookie, replayed with its own anti-forgery token, is refused too.
  const replay = await anonymous(t.app);
  replay.setCookie('rw_session', oldToken);
  replay.setCookie('XSRF-TOKEN', oldXsrf);
  const res = await replay.post('/api/auth/sign-out');
  assert.equal(res.status, 401);
  assert.equal(res.body.error.code, 'not_signed_in');
  return own;
}

test('sign-out ends the session: the old cookie is refused', async () => {
  const t = await app();
  await createUser(t.sequelize, TECH);
  await assertSessionsEnd(t, TECH, async (own) => {
    const res = await own.post('/api/auth/sign-out').expect(204);
    assert.ok((res.headers['set-cookie'] as unknown as string[]).some((c) => /^rw_session=;/.test(c)), 'cookie cleared');
    assert.equal((await own.get('/api/auth/session')).body.user, null);
  });
});

test('password change ends other sessions and gives this one a new cookie', async () => {
  const t = await app();
  await createUser(t.sequelize, TECH);
  const own = await assertSessionsEnd(t, TECH, async (c) => {
    await c.post('/api/auth/password', { currentPassword: 'not my password', newPassword: 'tidal creek osprey' }).expect(400);
    await c.post('/api/auth/password', { currentPassword: TECH.password, newPassword: 'Password123' }).expect(400);
    await c.post('/api/auth/password', { currentPassword: TECH.password, newPassword: 'tidal creek osprey' }).expect(204);
  });
  assert.equal((await own.get('/api/auth/session')).body.user.email, TECH.email, 'this session continues');
  await own.post('/api/auth/sign-out').expect(204); // its new anti-forgery cookie works too
  await (await anonymous(t.app)).post('/api/auth/sign-in', { email: TECH.email, password: TECH.password }).expect(401);
  await signIn(t.app, TECH.email, 'tidal creek osprey');
});

test('demotion by an admin ends the person\'s sessions', async () => {
  const t = await app();
  await createUser(t.sequelize, ADMIN);
  const tech = await createUser(t.sequelize, TECH);
  const admin = await signIn(t.app, ADMIN.email, ADMIN.password);
  await assertSessionsEnd(t, TECH, async () => {
    const res = await admin.patch(`/api/users/${tech.id}`, { roles: ['member'] }).expect(200);
    assert.deepEqual(res.body.roles, ['member']);
  });
  const again = await signIn(t.app, TECH.email, TECH.password);
  assert.deepEqual((await again.get('/api/auth/session')).body.user.roles, ['member']);
});

test('disabling an account ends its sessions and refuses sign-in alike', async () => {
  const t = await app();
  await createUser(t.sequelize, ADMIN);
  const tech = await createUser(t.sequelize, TECH);
  const admin = await signIn(t.app, ADMIN.email, ADMIN.password);
  await assertSessionsEnd(t, TECH, async () => {
    await admin.patch(`/api/users/${tech.id}`, { disabled: true }).expect(200);
  });
  const res = await (await anonymous(t.app)).post('/api/auth/sign-in', { email: TECH.email, password: TECH.password }).expect(401);
  assert.equal(res.body.error.code, 'invalid_credentials');
});

test('a name change does not end sessions', async () => {
  const t = await app();
  await createUser(t.sequelize, ADMIN);
  const tech = await createUser(t.sequelize, TECH);
  const admin = await signIn(t.app, ADMIN.email, ADMIN.password);
  const techClient = await signIn(t.app, TECH.email, TECH.password);
  await admin.patch(`/api/users/${tech.id}`, { displayName: 'Odo R. Rushby' }).expect(200);
  assert.equal((await techClient.get('/api/auth/session')).body.user.displayName, 'Odo R. Rushby');
});

test('register: 201 with role member and a session; roles in the body are refused; e-mail taken is 409', async () => {
  const t = await app();
  const anon = await anonymous(t.app);
  const res = await anon
    .post('/api/auth/register', { email: 'Nell.Tarrant@kestrelfen.example', password: 'fen mist at dawn', displayName: 'Nell Tarrant', callSign: 'q2kfn' })
    .expect(201);
  assert.deepEqual(res.body, { user: { id: res.body.user.id, email: 'nell.tarrant@kestrelfen.example', displayName: 'Nell Tarrant', callSign: 'Q2KFN', roles: ['member'] } });
  assert.ok((res.headers['set-cookie'] as unknown as string[]).some((c) => /^rw_session=[^;]/.test(c)));
  assert.equal((await anon.get('/api/auth/session')).body.user.email, 'nell.tarrant@kestrelfen.example');

  const before = await tableCounts(t.sequelize);
  const other = await anonymous(t.app);
  const mass = await other
    .post('/api/auth/register', { email: 'sly@kestrelfen.example', password: 'fen mist at dawn', displayName: 'Sly', roles: ['admin'] })
    .expect(400);
  assert.equal(mass.body.error.code, 'validation_failed');
  const taken = await other.post('/api/auth/register', { email: 'nell.tarrant@kestrelfen.example', password: 'another fine phrase', displayName: 'Nell T' }).expect(409);
  assert.equal(taken.body.error.code, 'email_taken');
  assert.deepEqual(await tableCounts(t.sequelize), before);
});

test('password reset: 202 always; one outbox mail with a single-use link; confirm ends sessions', async () => {
  const t = await app({ RW_PUBLIC_URL: 'http://127.0.0.1:4300' });
  await createUser(t.sequelize, TECH);
  const session = await signIn(t.app, TECH.email, TECH.password);
  const anon = await anonymous(t.app);

  const unknown = await anon.post('/api/auth/password-reset/request', { email: 'nobody@kestrelfen.example' }).expect(202);
  const known = await anon.post('/api/auth/password-reset/request', { email: TECH.email.toUpperCase() }).expect(202);
  assert.deepEqual(unknown.body, known.body);
  await backgroundWork.idle(); // the work behind the answer

  const mails = await t.sequelize.query<{ kind: string; to_address: string; subject: string; text_body: string; status: string }>(
    'SELECT kind, to_address, subject, text_body, status FROM outbox',
    { type: QueryTypes.SELECT },
  );
  assert.equal(mails.length, 1);
  assert.equal(mails[0]!.kind, 'password_reset');
  assert.equal(mails[0]!.to_address, TECH.email);
  assert.equal(mails[0]!.status, 'pending');
  const link = /http:\/\/127\.0\.0\.1:4300\/reset-password\?token=([\w-]+)/.exec(mails[0]!.text_body);
  assert.ok(link, mails[0]!.text_body);
  const token = link[1]!;
  const [stored] = await t.sequelize.query<{ token_hash: string }>('SELECT token_hash FROM password_resets', { type: QueryTypes.SELECT });
  assert.match(stored!.token_hash, /^[0-9a-f]{64}$/);
  assert.ok(!stored!.token_hash.includes(token), 'only a hash of the token is stored');

  const weak = await anon.post('/api/auth/password-reset/confirm', { token, newPassword: 'password1' }).expect(400);
  assert.equal(weak.body.error.fields.newPassword !== undefined, true);
  await anon.post('/api/auth/password-reset/confirm', { token, newPassword: 'shingle beach walk' }).expect(204);
  const reused = await anon.post('/api/auth/password-reset/confirm', { token, newPassword: 'another shingle walk' }).expect(400);
  assert.equal(reused.body.error.code, 'reset_token_invalid');
  assert.equal((await session.get('/api/auth/session')).body.user, null, 'sessions ended');
  await signIn(t.app, TECH.email, 'shingle beach walk');

  // An expired token is refused.
  await anon.post('/api/auth/password-reset/request', { email: TECH.email }).expect(202);
  await backgroundWork.idle();
  const [second] = await t.sequelize.query<{ text_body: string }>('SELECT text_body FROM outbox ORDER BY id DESC LIMIT 1', { type: QueryTypes.SELECT });
  const token2 = /token=([\w-]+)/.exec(second!.text_body)![1]!;
  await t.sequelize.query('UPDATE password_resets SET expires_at = ? WHERE used_at IS NULL', { replacements: [new Date(Date.now() - 1000)] });
  const expired = await anon.post('/api/auth/password-reset/confirm', { token: token2, newPassword: 'yet another walk' }).expect(400);
  assert.equal(expired.body.error.code, 'reset_token_invalid');
  const forged = await anon.post('/api/auth/password-reset/confirm', { token: 'A'.repeat(43), newPassword: 'yet another walk' }).expect(400);
  assert.equal(forged.body.error.code, 'reset_token_invalid');
});

test('a session past half its life is renewed on use, keeping its id, but never past the maximum', async () => {
  const t = await app();
  const admin = await createUser(t.sequelize, ADMIN);
  const secret = t.config.RW_JWT_SECRET;
  const now = Math.floor(Date.now() / 1000);
  const life = t.config.RW_SESSION_MINUTES * 60;
  const claims = { gen: 0, sub: String(admin.id), jti: 'renewal-session-id-0001', iss: 'rigwright', aud: 'rigwright-web' };

  // Fresh (most of its life left): no new cookie.
  const fresh = await withToken(t, jwt.sign({ ...claims, at: now, exp: now + life - 60 }, secret, { algorithm: 'HS256' }));
  const freshRes = await fresh.get('/api/users').expect(200);
  assert.ok(!(freshRes.headers['set-cookie'] as unknown as string[] | undefined)?.some((c) => c.startsWith('rw_session=')));

  // A quarter of its life left: a new token for the same session, with a later expiry.
  const old = await withToken(t, jwt.sign({ ...claims, at: now - 3600, exp: now + Math.floor(life / 4) }, secret, { algorithm: 'HS256' }));
  await old.get('/api/users').expect(200);
  const renewed = jwt.decode(old.cookie('rw_session')!) as jwt.JwtPayload;
  assert.equal(renewed.jti, claims.jti, 'same session id, so the anti-forgery token stays valid');
  assert.equal(renewed.at, now - 3600, 'sign-in time carried over');
  assert.ok(renewed.exp! >= now + life - 5, 'expiry pushed out by a full session length');

  // Signed in 12 hours ago: still valid until it expires, but not renewed.
  const ancient = await withToken(t, jwt.sign({ ...claims, jti: 'renewal-session-id-0002', at: now - 12 * 3600, exp: now + 60 }, secret, { algorithm: 'HS256' }));
  const ancientRes = await ancient.get('/api/auth/session').expect(200);
  assert.equal(ancientRes.body.user?.id, admin.id);
  assert.ok(!((ancientRes.headers['set-cookie'] as unknown as string[] | undefined) ?? []).some((c) => c.startsWith('rw_session=')));
});
