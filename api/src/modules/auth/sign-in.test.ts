// Sign-in: same answer for unknown e-mail and wrong password, cookie attributes, no token in any
// body, and throttling per address and per account+address (ASVS 6.3.1, 6.1.1; OWASP
// Authentication Cheat Sheet "Login Throttling"; RFC 6265bis for the cookie attributes).
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Request } from 'express';
import { anonymous, createUser, setupTestApp, signIn, type TestApp } from '../../../test/helpers';
import type { Options } from 'express-rate-limit';
import { SqlRateLimitStore, accountAddressKey } from './throttle';

const apps: TestApp[] = [];
after(async () => {
  for (const a of apps) await a.close();
});
async function app(overrides: Parameters<typeof setupTestApp>[0] = {}) {
  const t = await setupTestApp(overrides);
  apps.push(t);
  return t;
}

const PIP = { email: 'pip.ashdown@kestrelfen.example', password: 'heron marsh sideband', roles: ['member' as const] };

test('right password: 200 with the User fields only; wrong password and unknown e-mail answer alike', async () => {
  const t = await app();
  await createUser(t.sequelize, { ...PIP, displayName: 'Pip Ashdown', callSign: 'Q2KFP' });
  const anon = await anonymous(t.app);
  const ok = await anon.post('/api/auth/sign-in', { email: 'Pip.Ashdown@kestrelfen.example ', password: PIP.password }).expect(200);
  assert.deepEqual(Object.keys(ok.body.user).sort(), ['callSign', 'displayName', 'email', 'id', 'roles']);
  assert.deepEqual(ok.body.user.roles, ['member']);
  assert.equal(ok.body.user.callSign, 'Q2KFP');

  const wrong = await (await anonymous(t.app)).post('/api/auth/sign-in', { email: PIP.email, password: 'heron marsh sidebanD' }).expect(401);
  const unknown = await (await anonymous(t.app)).post('/api/auth/sign-in', { email: 'nobody@kestrelfen.example', password: PIP.password }).expect(401);
  assert.deepEqual(wrong.body, unknown.body);
  assert.equal(wrong.body.error.code, 'invalid_credentials');
  for (const res of [wrong, unknown]) {
    const cookies = (res.headers['set-cookie'] ?? []) as unknown as string[];
    assert.ok(!cookies.some((c) => /^rw_session=[^;]/.test(c)), 'no session cookie on a refused sign-in');
  }
});

test('unknown e-mail takes about as long as a wrong password (a dummy hash is verified)', async () => {
  const t = await app();
  await createUser(t.sequelize, PIP);
  const time = async (email: string) => {
    const anon = await anonymous(t.app);
    const start = process.hrtime.bigint();
    await anon.post('/api/auth/sign-in', { email, password: 'not the password at all' }).expect(401);
    return Number(process.hrtime.bigint() - start) / 1e6;
  };
  await time('warm-up@kestrelfen.example');
  const wrong: number[] = [];
  const unknown: number[] = [];
  for (let i = 0; i < 3; i++) {
    wrong.push(await time(PIP.email));
    unknown.push(await time(`nobody${i}@kestrelfen.example`));
  }
  const median = (xs: number[]) => xs.sort((a, b) => a - b)[1]!;
  // argon2id at m=19456,t=2 costs tens of milliseconds; a lookup alone costs about one. Without
  // the dummy hash, the unknown e-mail would answer many times faster.
  assert.ok(median(unknown) > median(wrong) * 0.5, `unknown ${median(unknown)} ms vs wrong ${median(wrong)} ms`);
});

test('session cookie: HttpOnly, SameSite=Strict, Path=/, Max-Age = session minutes; token in no body', async () => {
  const t = await app();
  await createUser(t.sequelize, PIP);
  const anon = await anonymous(t.app);
  const res = await anon.post('/api/auth/sign-in', { email: PIP.email, password: PIP.password }).expect(200);
  const cookies: string[] = res.headers['set-cookie'] as unknown as string[];
  const session = cookies.find((c) => c.startsWith('rw_session='))!;
  assert.ok(session, 'session cookie set');
  const attrs = session.split(';').map((s) => s.trim().toLowerCase());
  assert.ok(attrs.includes('httponly'));
  assert.ok(attrs.includes('samesite=strict'));
  assert.ok(attrs.includes('path=/'));
  assert.ok(attrs.includes(`max-age=${t.config.RW_SESSION_MINUTES * 60}`));
  const token = session.split(';')[0]!.slice('rw_session='.length);
  assert.match(token, /^[\w-]+\.[\w-]+\.[\w-]+$/);
  // The token appears in no response body of the session's routes.
  const bodies = [res.text, (await anon.get('/api/auth/session')).text, (await anon.post('/api/auth/password', { currentPassword: PIP.password, newPassword: 'bittern reed bed' })).text];
  for (const body of bodies) assert.ok(!body.includes(token) && !body.includes(token.split('.')[1]!), body);
  assert.ok(!(await anon.get('/api/auth/session')).text.includes(anon.cookie('rw_session')!));
});

test('with RW_COOKIE_SECURE the session and anti-forgery cookies are Secure', async () => {
  const t = await app({ RW_COOKIE_SECURE: 'true' });
  await createUser(t.sequelize, PIP);
  const anon = await anonymous(t.app); // XSRF-TOKEN is Secure, so the client must echo it by hand
  const first = await anon.get('/api/auth/session');
  const xsrf = (first.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('XSRF-TOKEN='))!;
  assert.match(xsrf, /; Secure/i);
  const value = xsrf.split(';')[0]!.slice('XSRF-TOKEN='.length);
  const res = await anon.agent
    .post('/api/auth/sign-in')
    .set('Cookie', `XSRF-TOKEN=${value}`)
    .set('X-XSRF-TOKEN', value)
    .send({ email: PIP.email, password: PIP.password })
    .expect(200);
  const session = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('rw_session='))!;
  assert.match(session, /; Secure/i);
  assert.match(session, /; HttpOnly/i);
});

// ---- throttling ----

/** A tiny cookie-keeping HTTP client that connects from a chosen loopback address. */
/** The parts of the API's JSON answers these tests read. */
interface ApiBody {
  user: { callSign: string | null; email: string; roles: string[] };
  error: { code: string; message: string };
}

class FromAddress {
  private cookies = new Map<string, string>();
  constructor(
    private readonly port: number,
    readonly localAddress: string,
  ) {}

  request(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<{ status: number; body: ApiBody; headers: http.IncomingHttpHeaders }> {
    const payload = body === undefined ? undefined : JSON.stringify(body);
    const h: Record<string, string> = { ...headers };
    if (this.cookies.size) h.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    if (payload) h['content-type'] = 'application/json';
    const xsrf = this.cookies.get('XSRF-TOKEN');
    if (method !== 'GET' && xsrf) h['x-xsrf-token'] = xsrf;
    return new Promise((resolve, reject) => {
      const req = http.request({ host: '127.0.0.1', port: this.port, method, path, headers: h, localAddress: this.localAddress }, (res) => {
        let text = '';
        res.setEncoding('utf8');
        res.on('data', (c) => (text += c));
        res.on('end', () => {
          for (const c of res.headers['set-cookie'] ?? []) {
            const [pair] = c.split(';');
            const eq = pair!.indexOf('=');
            const value = pair!.slice(eq + 1);
            if (value === '') this.cookies.delete(pair!.slice(0, eq));
            else this.cookies.set(pair!.slice(0, eq), value);
          }
          resolve({ status: res.statusCode ?? 0, body: text ? JSON.parse(text) : undefined, headers: res.headers });
        });
      });
      req.on('error', reject);
      req.end(payload);
    });
  }

  async signIn(email: string, password: string, headers: Record<string, string> = {}) {
    if (!this.cookies.has('XSRF-TOKEN')) await this.request('GET', '/api/auth/session');
    return this.request('POST', '/api/auth/sign-in', { email, password }, headers);
  }
}

async function listen(t: TestApp): Promise<{ port: number; close: () => Promise<void> }> {
  const server = t.app.listen(0, '127.0.0.1');
  await new Promise<void>((resolve) => server.once('listening', () => resolve()));
  return { port: (server.address() as AddressInfo).port, close: () => new Promise((r) => server.close(() => r())) };
}

test('one account from many addresses: failures lock that account only from the failing address', async () => {
  const t = await app({ RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS: '3', RW_SIGNIN_MAX_PER_ADDRESS: '50' });
  await createUser(t.sequelize, PIP);
  const server = await listen(t);
  try {
    const attacker = new FromAddress(server.port, '127.0.0.2');
    for (let i = 0; i < 3; i++) assert.equal((await attacker.signIn(PIP.email, `guess number ${i}`)).status, 401);
    const blocked = await attacker.signIn(PIP.email, `guess number 4`);
    assert.equal(blocked.status, 429);
    assert.equal(blocked.body.error.code, 'too_many_attempts');
    assert.match(blocked.body.error.message, /Try again in \d+ minutes|Try again in a minute/);
    assert.ok(Number(blocked.headers['retry-after']) > 0);
    // The right password while throttled is still refused, and no session cookie is set.
    const right = await attacker.signIn(PIP.email, PIP.password);
    assert.equal(right.status, 429);
    assert.ok(!(right.headers['set-cookie'] ?? []).some((c) => /^rw_session=[^;]/.test(c)));

    // The owner, from their own address, is not locked out.
    const owner = new FromAddress(server.port, '127.0.0.3');
    assert.equal((await owner.signIn(PIP.email, PIP.password)).status, 200);
    // Nor from a third address, after a typo there.
    const club = new FromAddress(server.port, '127.0.0.4');
    assert.equal((await club.signIn(PIP.email, 'typo typo typo')).status, 401);
    assert.equal((await club.signIn(PIP.email, PIP.password)).status, 200);
  } finally {
    await server.close();
  }
});

test('successful sign-ins do not count toward the per-account limit', async () => {
  const t = await app({ RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS: '2' });
  await createUser(t.sequelize, PIP);
  const server = await listen(t);
  try {
    const c = new FromAddress(server.port, '127.0.0.5');
    for (let i = 0; i < 4; i++) assert.equal((await c.signIn(PIP.email, PIP.password)).status, 200);
    assert.equal((await c.signIn(PIP.email, 'wrong one')).status, 401);
    assert.equal((await c.signIn(PIP.email, PIP.password)).status, 200);
  } finally {
    await server.close();
  }
});

test('one address against many accounts: the address is throttled, other addresses are not', async () => {
  const t = await app({ RW_SIGNIN_MAX_PER_ADDRESS: '5', RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS: '3' });
  await createUser(t.sequelize, PIP);
  const server = await listen(t);
  try {
    const sprayer = new FromAddress(server.port, '127.0.0.6');
    for (let i = 0; i < 5; i++) assert.equal((await sprayer.signIn(`member${i}@kestrelfen.example`, 'heron marsh sideband')).status, 401);
    const blocked = await sprayer.signIn('member9@kestrelfen.example', 'heron marsh sideband');
    assert.equal(blocked.status, 429);
    assert.equal(blocked.body.error.code, 'too_many_attempts');
    // Even a right password from that address waits.
    assert.equal((await sprayer.signIn(PIP.email, PIP.password)).status, 429);
    assert.equal((await new FromAddress(server.port, '127.0.0.7').signIn(PIP.email, PIP.password)).status, 200);
  } finally {
    await server.close();
  }
});

test('a spoofed X-Forwarded-For does not reset the counters', async () => {
  const t = await app({ RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS: '3', RW_SIGNIN_MAX_PER_ADDRESS: '6' });
  await createUser(t.sequelize, PIP);
  const anon = await anonymous(t.app);
  for (let i = 0; i < 3; i++) {
    await anon.post('/api/auth/sign-in', { email: PIP.email, password: `guess ${i} abc` }).set('X-Forwarded-For', `203.0.113.${i + 1}`).expect(401);
  }
  const res = await anon.post('/api/auth/sign-in', { email: PIP.email, password: PIP.password }).set('X-Forwarded-For', '198.51.100.77').expect(429);
  assert.equal(res.body.error.code, 'too_many_attempts');
  // Per-address limit too (6, and 4 attempts so far): other accounts from the same socket
  // address, each with a new header, reach it all the same.
  for (let i = 5; i <= 6; i++) {
    await anon.post('/api/auth/sign-in', { email: `x${i}@kestrelfen.example`, password: 'whatever it is' }).set('X-Forwarded-For', `203.0.113.${i}`).expect(401);
  }
  const spread = await anon.post('/api/auth/sign-in', { email: 'x7@kestrelfen.example', password: 'whatever it is' }).set('X-Forwarded-For', '203.0.113.7').expect(429);
  assert.equal(spread.body.error.code, 'too_many_attempts');
});

test('the per-account key ignores e-mail case and spacing but separates addresses', () => {
  const req = (email: string, ip: string) => ({ body: { email }, ip, socket: {} }) as unknown as Request;
  assert.equal(accountAddressKey(req(' Pip@Kestrelfen.example', '127.0.0.2')), accountAddressKey(req('pip@kestrelfen.example', '127.0.0.2')));
  assert.notEqual(accountAddressKey(req('pip@kestrelfen.example', '127.0.0.2')), accountAddressKey(req('pip@kestrelfen.example', '127.0.0.3')));
  assert.notEqual(accountAddressKey(req('pip@kestrelfen.example', '127.0.0.2')), accountAddressKey(req('wren@kestrelfen.example', '127.0.0.2')));
});

test('sign-in still works for a signed-in client switching accounts', async () => {
  const t = await app();
  await createUser(t.sequelize, PIP);
  await createUser(t.sequelize, { email: 'wren@kestrelfen.example', password: 'reed warbler song', roles: ['technician'] });
  const c = await signIn(t.app, PIP.email, PIP.password);
  const res = await c.post('/api/auth/sign-in', { email: 'wren@kestrelfen.example', password: 'reed warbler song' }).expect(200);
  assert.deepEqual(res.body.user.roles, ['technician']);
  assert.equal((await c.get('/api/auth/session')).body.user.email, 'wren@kestrelfen.example');
});

test('throttle counters: a fixed window by the clock, shared by every store on the table (every replica)', async () => {
  const t = await app();
  let ms = Date.parse('2026-03-14T19:30:00Z');
  const clock = () => new Date(ms);
  const windowMs = 15 * 60_000;
  const a = new SqlRateLimitStore(t.sequelize, 'window-test', clock);
  const b = new SqlRateLimitStore(t.sequelize, 'window-test', clock); // a second replica
  for (const store of [a, b]) store.init({ windowMs } as Options);

  assert.equal((await a.increment('198.51.100.7')).totalHits, 1);
  assert.equal((await b.increment('198.51.100.7')).totalHits, 2, 'the other replica counts on the same row');
  ms += windowMs - 1000; // one second before the window closes
  const late = await a.increment('198.51.100.7');
  assert.equal(late.totalHits, 3);
  assert.equal(late.resetTime?.getTime(), Date.parse('2026-03-14T19:45:00Z'), 'the window is fixed from the first hit');
  assert.equal((await b.get('198.51.100.7'))?.totalHits, 3);
  ms += 2000; // one second after
  assert.equal(await b.get('198.51.100.7'), undefined, 'an expired window counts nothing');
  const fresh = await b.increment('198.51.100.7');
  assert.equal(fresh.totalHits, 1, 'a new window starts');
  assert.equal(fresh.resetTime?.getTime(), ms + windowMs);
  assert.equal((await a.increment('203.0.113.9')).totalHits, 1, 'another address has its own count');
});
