// Anti-forgery (OWASP CSRF Prevention Cheat Sheet, signed double-submit cookie; ASVS 3.5.1):
// a data-driven sweep over every mutating route the app registers (routes added later are
// covered by themselves), plus the cookie's attributes and its binding to the session.
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import express from 'express';
import cookieParser from 'cookie-parser';
import supertest from 'supertest';
import { anonymous, concretePath, createUser, registeredRoutes, setupTestApp, signIn, tableSnapshot, type TestApp, type TestClient } from '../../../test/helpers';
import { createCsrfToken, csrfExemptPaths, csrfProtection, csrfTokenValid } from './csrf';

const apps: TestApp[] = [];
after(async () => {
  for (const a of apps) await a.close();
});

const ADMIN = { email: 'bryony.keel@kestrelfen.example', password: 'tide table almanac', roles: ['admin' as const] };
const MEMBER = { email: 'cass.lowe@kestrelfen.example', password: 'samphire and sea kale', roles: ['member' as const] };

function send(client: TestClient, method: string, url: string, headers: Record<string, string>) {
  const agent = client.agent as unknown as Record<string, (u: string) => supertest.Test>;
  let req = agent[method.toLowerCase()]!(url);
  for (const [k, v] of Object.entries(headers)) req = req.set(k, v);
  return req.send({ email: MEMBER.email, password: MEMBER.password, roles: ['admin'], disabled: true, to: 'closed', version: 0 });
}

test('every mutating route refuses a request without a valid anti-forgery token, and nothing changes', async () => {
  const t = await setupTestApp();
  apps.push(t);
  await createUser(t.sequelize, ADMIN);
  const member = await createUser(t.sequelize, MEMBER);
  // Signed webhooks are exempt (csrfExemptPaths); they are checked below for their own signature instead.
  const routes = registeredRoutes(t.app).filter((r) => r.method !== 'GET' && !csrfExemptPaths.has(r.path.replace(/^\/api/, '')));
  assert.ok(csrfExemptPaths.has('/payments/webhook'), 'the payment webhook is the exempt path');
  // The sweep must see at least the auth, accounts and tickets routes.
  for (const expected of [
    'POST /api/auth/sign-in',
    'POST /api/auth/sign-out',
    'POST /api/auth/password',
    'POST /api/users',
    'PATCH /api/users/:id',
    'POST /api/tickets',
    'POST /api/firmware',
    'POST /api/firmware/:id/known-good',
    'POST /api/firmware/:id/withdraw',
    'POST /api/tickets/:tag/flash-attempts',
    'POST /api/tickets/:tag/repair-log/work',
    'POST /api/tickets/:tag/repair-log/parts',
    'POST /api/tickets/:tag/test-sheets',
    'POST /api/tickets/:tag/hand-back',
    'PATCH /api/test-limits',
    'POST /api/tickets/:tag/moves/:eventId/undo',
    'POST /api/tickets/:tag/parts-on-order',
    'POST /api/tickets/:tag/technician',
    'POST /api/tickets/:tag/ledger/charges',
    'POST /api/tickets/:tag/ledger/checkout',
    'POST /api/charges/:chargeId/waivers',
    'POST /api/payments/:paymentId/refunds',
    'POST /api/reconciliation/:month/close',
    'PATCH /api/tickets/:tag/intake',
    'POST /api/tickets/:tag/photos',
  ]) {
    assert.ok(routes.some((r) => `${r.method} ${r.path}` === expected), `sweep covers ${expected}`);
  }

  const admin = await signIn(t.app, ADMIN.email, ADMIN.password);
  const stranger = await anonymous(t.app); // a genuine token, but for no session
  const anon = await anonymous(t.app);
  const before = await tableSnapshot(t.sequelize);

  for (const route of routes) {
    const url = concretePath(route.path).replace(/\/1(?=\/|$)/g, `/${member.id}`);
    const cases: [string, TestClient, Record<string, string>][] = [
      ['signed in, no header', admin, {}],
      ['signed in, header not matching the cookie', admin, { 'X-XSRF-TOKEN': createCsrfToken(t.config, '') }],
      ['signed in, token of another client in cookie and header', admin, { 'X-XSRF-TOKEN': stranger.cookie('XSRF-TOKEN')!, Cookie: `rw_session=${admin.cookie('rw_session')}; XSRF-TOKEN=${stranger.cookie('XSRF-TOKEN')}` }],
      ['signed in, forged token in cookie and header', admin, { 'X-XSRF-TOKEN': 'abc.def', Cookie: `rw_session=${admin.cookie('rw_session')}; XSRF-TOKEN=abc.def` }],
      ['signed out, no header', anon, {}],
    ];
    for (const [name, client, headers] of cases) {
      const res = await send(client, route.method, url, headers);
      assert.equal(res.status, 403, `${route.method} ${url}: ${name} → ${res.status} ${res.text}`);
      assert.equal(res.body.error.code, 'csrf_token_invalid', `${route.method} ${url}: ${name}`);
    }
  }
  // The exempt webhook without a valid signature is refused too (400), and changes nothing.
  const hook = await send(anon, 'POST', '/api/payments/webhook', {});
  assert.equal(hook.status, 400, hook.text);
  assert.equal(hook.body.error.code, 'webhook_signature_invalid');
  assert.deepEqual(await tableSnapshot(t.sequelize), before, 'no table changed');

  // Control: with the header the same client gets through (here: sign-out ends the session).
  await admin.post('/api/auth/sign-out').expect(204);
});

test('XSRF-TOKEN cookie: readable, SameSite=Strict, Path=/; sign-in issues a new one bound to the session', async () => {
  const t = await setupTestApp();
  apps.push(t);
  await createUser(t.sequelize, MEMBER);
  const anon = await anonymous(t.app);
  const res = await anon.get('/api/auth/session').expect(200);
  const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('XSRF-TOKEN='))!;
  assert.ok(cookie, 'GET /api/auth/session (re)issues the cookie');
  assert.doesNotMatch(cookie, /HttpOnly/i);
  assert.match(cookie, /SameSite=Strict/i);
  assert.match(cookie, /Path=\//);
  const anonymousToken = anon.cookie('XSRF-TOKEN')!;

  await anon.post('/api/auth/sign-in', { email: MEMBER.email, password: MEMBER.password }).expect(200);
  const sessionToken = anon.cookie('XSRF-TOKEN')!;
  assert.notEqual(sessionToken, anonymousToken);
  // The anonymous token no longer passes for the signed-in session.
  await anon.agent
    .post('/api/auth/sign-out')
    .set('Cookie', `rw_session=${anon.cookie('rw_session')}; XSRF-TOKEN=${anonymousToken}`)
    .set('X-XSRF-TOKEN', anonymousToken)
    .expect(403);
  await anon.post('/api/auth/sign-out').expect(204);
});

test('tokens: the MAC binds the token to its session; tampering is detected', () => {
  const config = { RW_JWT_SECRET: 's'.repeat(40) } as Parameters<typeof createCsrfToken>[0];
  const token = createCsrfToken(config, 'session-one-0123456789');
  assert.equal(csrfTokenValid(config, token, 'session-one-0123456789'), true);
  assert.equal(csrfTokenValid(config, token, 'session-two-0123456789'), false);
  assert.equal(csrfTokenValid(config, token, ''), false);
  const [nonce, mac] = token.split('.');
  assert.equal(csrfTokenValid(config, `${nonce}x.${mac}`, 'session-one-0123456789'), false);
  assert.equal(csrfTokenValid(config, `${nonce}.${mac}.extra`, 'session-one-0123456789'), false);
  assert.equal(csrfTokenValid({ RW_JWT_SECRET: 't'.repeat(40) } as typeof config, token, 'session-one-0123456789'), false);
});

test('the exemption hook lets a listed path (a signed webhook) through and nothing else', async () => {
  const config = { RW_JWT_SECRET: 's'.repeat(40), RW_COOKIE_SECURE: false } as never;
  const mini = express();
  mini.use(cookieParser());
  mini.use('/api', csrfProtection({ config } as never, { exemptPaths: ['/payments/webhook'] }));
  mini.post('/api/payments/webhook', (_req, res) => void res.status(200).json({ ok: true }));
  mini.post('/api/payments/other', (_req, res) => void res.status(200).json({ ok: true }));
  mini.use((err: { status?: number; code?: string }, _req: express.Request, res: express.Response, _next: express.NextFunction) => {
    res.status(err.status ?? 500).json({ code: err.code });
  });
  await supertest(mini).post('/api/payments/webhook').expect(200);
  const other = await supertest(mini).post('/api/payments/other').expect(403);
  assert.equal(other.body.code, 'csrf_token_invalid');
});
