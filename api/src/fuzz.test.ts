// Fuzzing every route with fast-check (reliability.md, test 17: zero 5xx on fuzzed JSON, with
// prototype-pollution and CRLF payloads), and the client mistakes that used to answer 500
// (issue 6): a JSON body in another charset, a Content-Encoding the server does not take, bytes
// that do not decode, broken percent-encoding in a path, ids spelt other than in plain digits.
// Every answer must be below 500 and, when it is an error, in the one shape { error: { code, message } }.
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { brotliCompressSync, deflateSync, gzipSync } from 'node:zlib';
import fc from 'fast-check';
import type { Response, Test } from 'supertest';
import { clientErrorAnswer } from './client-errors';
import { anonymous, concretePath, createUser, registeredRoutes, setupTestApp, signIn, type TestApp, type TestClient } from '../test/helpers';

const PASSWORD = 'fuzzing the bench all night';
// A stand-in for the built client, so the static files and the single-page fallback are fuzzed too.
const dist = mkdtempSync(path.join(tmpdir(), 'rw-fuzz-dist-'));
writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>Rigwright</title>');

let t: TestApp;
let staff: TestClient; // admin and technician: past the role checks of every route
let anon: TestClient;
let tag = '';
let otherUserId = 0;
const prototypeBefore = Object.getOwnPropertyNames(Object.prototype).sort();

const intake = {
  equipmentKind: 'transceiver',
  makeModel: 'Fuzzbox FT-1 HF transceiver',
  units: ['main body'],
  faultReported: 'Relay clicks, display stays dark.',
  accessories: ['DC lead'],
  reflashConsent: true,
  notifyByEmail: true,
};

before(async () => {
  t = await setupTestApp({ RW_CLIENT_DIST: dist, RW_SIGNIN_MAX_PER_ADDRESS: '100000', RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS: '100000' });
  await createUser(t.sequelize, { email: 'fuzz.staff@kestrelfen.example', password: PASSWORD, roles: ['admin', 'technician'] });
  otherUserId = (await createUser(t.sequelize, { email: 'fuzz.member@kestrelfen.example', password: PASSWORD, roles: ['member'] })).id;
  staff = await signIn(t.app, 'fuzz.staff@kestrelfen.example', PASSWORD);
  anon = await anonymous(t.app);
  tag = (await staff.post('/api/tickets', intake).expect(201)).body.tag;
});
after(async () => {
  rmSync(dist, { recursive: true, force: true });
  await t?.close();
});

/** Below 500 and, for an error, exactly { error: { code, message[, fields] } } with strings. */
function assertClientAnswer(res: Response, label: string): void {
  assert.ok(res.status < 500, `${label}: answered ${res.status} ${String(res.text ?? "").slice(0, 300)}`);
  if (res.status >= 400) {
    assert.match(String(res.headers['content-type']), /^application\/json/, `${label}: JSON error`);
    assert.deepEqual(Object.keys(res.body), ['error'], label);
    assert.equal(typeof res.body.error.code, 'string', label);
    assert.equal(typeof res.body.error.message, 'string', label);
    for (const key of Object.keys(res.body.error)) assert.ok(['code', 'message', 'fields'].includes(key), `${label}: unexpected ${key}`);
  }
}

function assertNoPollution(): void {
  assert.deepEqual(Object.getOwnPropertyNames(Object.prototype).sort(), prototypeBefore, 'Object.prototype unchanged');
  assert.equal(({} as Record<string, unknown>).polluted, undefined);
  assert.equal(({} as Record<string, unknown>).isAdmin, undefined);
}

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** A raw request from a client: its cookies and anti-forgery header, our own body and headers. */
function raw(client: TestClient, method: Method, url: string, headers: Record<string, string> = {}, body?: string | Buffer): Test {
  let req = client.agent[method](url);
  const token = client.cookie('XSRF-TOKEN');
  if (token && method !== 'get') req = req.set('X-XSRF-TOKEN', token);
  for (const [k, v] of Object.entries(headers)) req = req.set(k, v);
  // Bytes go out as they are (superagent would otherwise serialise a Buffer as a JSON object).
  if (Buffer.isBuffer(body)) req = req.serialize((b: unknown) => b as string);
  return body === undefined ? req : req.send(body as never);
}

// ---- arbitraries -------------------------------------------------------------------------------

const NASTY_KEYS = ['__proto__', 'constructor', 'prototype', 'polluted', 'isAdmin', 'toString', 'hasOwnProperty', 'valueOf'];
const FIELD_NAMES = [
  'email', 'password', 'newPassword', 'currentPassword', 'token', 'displayName', 'callSign', 'roles', 'disabled',
  'to', 'version', 'note', 'equipmentKind', 'makeModel', 'serialNumber', 'units', 'faultReported', 'accessories',
  'firmwareVersions', 'reflashConsent', 'notifyByEmail', 'owner', 'name', 'phone', 'state', 'ownerUserId',
];
const CRLF_AND_CONTROL = [
  'line one\r\nX-Injected: yes',
  'Subject: hi\r\n\r\nforged body',
  '\r\n{"level":60,"msg":"forged log line"}',
  'bell\u0007 nul\u0000 esc\u001b[31m',
  'C1 \u0085 next line, \u009b CSI',
  'separators \u2028 and \u2029',
  'bidi \u202e evil \u2066 isolate',
  'lone \ud800 surrogate',
  '%0d%0aSet-Cookie: rw_session=x',
  '<script>alert(1)</script>',
  "'; DROP TABLE users; --",
  '{"__proto__":{"polluted":true}}',
  'x'.repeat(5000),
];

const key = fc.oneof(fc.constantFrom(...NASTY_KEYS), fc.constantFrom(...FIELD_NAMES), fc.string({ maxLength: 12 }));
const leafText = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.string({ unit: 'binary', maxLength: 20 }),
  fc.constantFrom(...CRLF_AND_CONTROL),
  fc.constantFrom('diagnosis', 'intake', 'closed', 'admin', 'member', 'RW-0001', 'fuzz.member@kestrelfen.example'),
);
const leaf = fc.oneof(
  leafText.map((s) => JSON.stringify(s)),
  fc.oneof(fc.integer(), fc.double(), fc.constantFrom(0, -1, 1e308, 2 ** 53, 4294967296, 0.5)).map((n) => JSON.stringify(n)),
  fc.constantFrom('true', 'false', 'null', '-0', '1e400', '[]', '{}'),
);
/**
 * JSON text built by hand, so keys such as "__proto__" reach the server as own keys (an object
 * literal or JSON.stringify would have turned them into the prototype or dropped them).
 */
const objectText = (value: fc.Arbitrary<string>) =>
  fc.array(fc.tuple(key, value), { maxLength: 6 }).map((entries) => `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${v}`).join(',')}}`);
const jsonText: fc.Arbitrary<string> = fc.letrec<{ value: string }>((tie) => ({
  value: fc.oneof(
    { depthSize: 'small' },
    leaf,
    fc.array(tie('value'), { maxLength: 4 }).map((items) => `[${items.join(',')}]`),
    objectText(tie('value')),
  ),
})).value;
const pollution = fc.constantFrom(
  '{"__proto__":{"polluted":true,"isAdmin":true}}',
  '{"constructor":{"prototype":{"polluted":true}}}',
  '{"email":"a@b.example","password":"x","__proto__":{"roles":["admin"]}}',
  '{"to":"diagnosis","version":0,"__proto__":{"note":"x"}}',
  '{"owner":{"__proto__":{"isAdmin":true},"name":"x","email":"a@b.example"}}',
  '[{"__proto__":{"polluted":1}}]',
);

/** A valid body for the route, with one field replaced or added with fuzz: reaches deeper checks. */
function validBody(route: string): Record<string, unknown> {
  switch (route) {
    case 'POST /api/tickets':
      return intake;
    case 'POST /api/tickets/:tag/moves':
      return { to: 'diagnosis', version: 0, note: 'Checked the supply.' };
    case 'POST /api/users':
      return { email: 'new.fuzz@kestrelfen.example', displayName: 'New Fuzz', roles: ['member'], password: 'a long fuzzing phrase' };
    case 'PATCH /api/users/:id':
      return { displayName: 'Renamed by fuzz' };
    case 'POST /api/auth/password':
      return { currentPassword: 'not the password at all', newPassword: 'another long phrase' };
    case 'POST /api/auth/register':
      return { email: 'reg.fuzz@kestrelfen.example', password: 'a long fuzzing phrase', displayName: 'Reg Fuzz' };
    case 'POST /api/auth/sign-in':
      return { email: 'nobody@kestrelfen.example', password: 'wrong' };
    case 'POST /api/auth/password-reset/request':
      return { email: 'nobody@kestrelfen.example' };
    case 'POST /api/auth/password-reset/confirm':
      return { token: 'A'.repeat(43), newPassword: 'a long fuzzing phrase' };
    default:
      return {};
  }
}
const mutatedBody = (route: string) =>
  fc.tuple(key, jsonText).map(([k, v]) => {
    const entries = Object.entries(validBody(route)).filter(([name]) => name !== k).map(([name, value]) => `${JSON.stringify(name)}:${JSON.stringify(value)}`);
    return `{${[...entries, `${JSON.stringify(k)}:${v}`].join(',')}}`;
  });

/** Values for :tag and :id, raw (sent as they are) or percent-encoded from any string. */
const ID_SPELLINGS = ['0x11', '+17', '017', '17.0', '1e1', '-1', '0', ' 1', '1 ', '١٧', '99999999999999999999', '4294967296', 'Infinity', 'NaN', '%', '%E0%A4%A', '%ZZ', '%00', '%C0%AF', '..', '%2e%2e%2f'];
const TAG_SPELLINGS = ['RW-0x11', 'RW-+017', 'RW-00017', 'RW-17.0', 'RW-١٧', 'rw-0001', 'RW-%30%30%30%31', ...ID_SPELLINGS];
const pathValue = (route: string) =>
  fc.oneof(
    fc.constantFrom(...(route.includes(':tag') ? [tag, ...TAG_SPELLINGS] : [String(otherUserId), ...ID_SPELLINGS])),
    fc.string({ minLength: 1, maxLength: 20 }).map(encodeURIComponent),
  );

const QUERY_KEYS = [
  'page', 'pageSize', 'sort', 'dir', 'q', 'state', 'technician', 'bytes', 'block', 'check', 'baud', 'forwardW', 'reflectedW',
  'currentA', 'lengthM', 'awg', 'mm2', 'supplyV', 'nominalV', 'tolerancePct', '__proto__', 'constructor', 'a[b]', 'page[]',
];
const queryValue = fc.oneof(
  fc.constantFrom('1', '25', '0x11', '+17', '017', '17.0', '-1', '1e3', '', '%', '%E0%A4%A', 'none', 'asc', 'tag', 'crc', '115200', '100', '4'),
  fc.string({ maxLength: 12 }).map(encodeURIComponent),
);
const queryString = fc.array(fc.tuple(fc.constantFrom(...QUERY_KEYS), queryValue), { maxLength: 5 }).map((pairs) => pairs.map(([k, v]) => `${k}=${v}`).join('&'));

// ---- properties --------------------------------------------------------------------------------

// Left out: sign-out (it would end the sweep's session) and the board's event stream, which stays open
// by design and takes no input (its own tests are in board-events.test.ts).
const ROUTES = () => registeredRoutes(t.app).filter((r) => r.path !== '/api/auth/sign-out' && r.path !== '/api/board/events');
// Runs per property (per route for the first two); raise RW_FUZZ_RUNS for a longer hunt.
const RUNS = Number(process.env.RW_FUZZ_RUNS ?? 15);

describe('fuzzed requests to every route', () => {
  it('JSON bodies (random, prototype pollution, CRLF, mutated valid bodies): never 5xx, always the error shape', async () => {
    const routes = ROUTES();
    assert.ok(routes.length >= 15, `found ${routes.length} routes`);
    for (const route of routes) {
      const name = `${route.method} ${route.path}`;
      const method = route.method.toLowerCase() as Method;
      const client = route.path.startsWith('/api/auth/') ? anon : staff;
      await fc.assert(
        fc.asyncProperty(fc.oneof(jsonText, pollution, mutatedBody(name)), pathValue(route.path), async (body, value) => {
          const url = concretePath(route.path, value);
          const res = await raw(client, method, url, { 'Content-Type': 'application/json' }, body);
          assertClientAnswer(res, `${name} ${url} ${body.slice(0, 200)}`);
        }),
        { numRuns: RUNS },
      );
    }
    assertNoPollution();
    // Still signed in as staff: the sweep did not quietly lose its reach half way.
    await staff.get('/api/users').expect(200);
  });

  it('query strings on every GET route (odd numbers, arrays, __proto__, broken escapes): never 5xx', async () => {
    for (const route of ROUTES().filter((r) => r.method === 'GET')) {
      await fc.assert(
        fc.asyncProperty(queryString, pathValue(route.path), async (query, value) => {
          const url = `${concretePath(route.path, value)}?${query}`;
          assertClientAnswer(await raw(staff, 'get', url), url);
        }),
        { numRuns: RUNS },
      );
    }
    assertNoPollution();
  });

  it('raw bodies in any charset and Content-Encoding, valid or not: never 5xx', async () => {
    const charsets = [undefined, 'utf-8', 'UTF-8', 'utf8', '"utf-8"', 'latin1', 'iso-8859-1', 'windows-1252', 'us-ascii', 'utf-16le', 'utf-16', 'utf-32', 'utf-7', 'utf-bogus', 'klingon', ''];
    const encodings = [undefined, 'identity', 'gzip', 'deflate', 'br', 'x-gzip', 'compress', 'zstd', 'gzip, gzip', 'bogus', 'GZIP'];
    const payload = fc.oneof(
      jsonText.map((s) => Buffer.from(s, 'utf8')),
      fc.constant(Buffer.from(JSON.stringify(intake), 'latin1')),
      fc.constant(Buffer.from(JSON.stringify({ ...intake, makeModel: 'Rádio Ürsa' }), 'latin1')),
      fc.constant(Buffer.from(JSON.stringify(intake), 'utf16le')),
      fc.uint8Array({ maxLength: 200 }).map((a) => Buffer.from(a)),
    );
    const compress: Record<string, (b: Buffer) => Buffer> = { gzip: gzipSync, 'x-gzip': gzipSync, GZIP: gzipSync, deflate: deflateSync, br: brotliCompressSync };
    const targets = ['/api/tickets', `/api/tickets/${tag}/moves`, '/api/auth/sign-in'];
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...charsets), fc.constantFrom(...encodings), payload, fc.boolean(), fc.constantFrom(...targets), async (charset, encoding, body, honest, target) => {
        const headers: Record<string, string> = { 'Content-Type': charset === undefined ? 'application/json' : `application/json; charset=${charset}` };
        if (encoding) headers['Content-Encoding'] = encoding;
        const sent = honest && encoding && compress[encoding] ? compress[encoding](body) : body;
        const res = await raw(target.startsWith('/api/auth') ? anon : staff, 'post', target, headers, sent);
        assertClientAnswer(res, `${target} charset=${charset} encoding=${encoding} honest=${honest} ${body.toString('hex').slice(0, 80)}`);
      }),
      { numRuns: RUNS * 6 },
    );
  });

  it('paths with broken percent-encoding, under /api and under the client: never 5xx', async () => {
    const piece = fc.constantFrom('%', '%E0', '%A4', '%A', '%ZZ', '%00', '%2F', '%C0%AF', '%F0%9F%98', '%ED%A0%80', 'a', '..', '%2e%2e', 'tickets', 'RW-0001', '%25');
    const prefix = fc.constantFrom('/', '/api/', '/api/tickets/', '/api/users/', `/api/tickets/${tag}/`, '/api/calc/', '/board/', '/assets/');
    await fc.assert(
      fc.asyncProperty(prefix, fc.array(piece, { minLength: 1, maxLength: 6 }), fc.constantFrom('get', 'post', 'patch') as fc.Arbitrary<Method>, async (p, pieces, method) => {
        const url = p + pieces.join('');
        const res = await raw(staff, method, url, { 'Content-Type': 'application/json' }, method === 'get' ? undefined : '{}');
        assertClientAnswer(res, `${method.toUpperCase()} ${url}`);
      }),
      { numRuns: RUNS * 6 },
    );
  });
});

describe('client mistakes answer 4xx in the one shape (issue 6 findings)', () => {
  it('a JSON body declared in another charset: 415 unsupported_charset', async () => {
    for (const charset of ['latin1', 'iso-8859-1', 'utf-16le', 'utf-7']) {
      const body = Buffer.from(JSON.stringify(intake), charset === 'utf-16le' ? 'utf16le' : 'latin1');
      const res = await raw(staff, 'post', '/api/tickets', { 'Content-Type': `application/json; charset=${charset}` }, body);
      assert.equal(res.status, 415, `${charset}: ${res.text}`);
      assert.equal(res.body.error.code, 'unsupported_charset');
      assert.match(res.body.error.message, /UTF-8/);
    }
    // UTF-8 by its registered name, in either case, is fine.
    for (const charset of ['utf-8', 'UTF-8']) {
      await raw(staff, 'post', '/api/tickets', { 'Content-Type': `application/json; charset=${charset}` }, JSON.stringify(intake)).expect(201);
    }
  });

  it('a Content-Encoding the server does not take: 415; a body that does not decode: 400; honest gzip works', async () => {
    const body = JSON.stringify(intake);
    for (const encoding of ['compress', 'bogus', 'zstd']) {
      const res = await raw(staff, 'post', '/api/tickets', { 'Content-Type': 'application/json', 'Content-Encoding': encoding }, body);
      assert.equal(res.status, 415, `${encoding}: ${res.text}`);
      assert.equal(res.body.error.code, 'unsupported_encoding');
    }
    const garbage = await raw(staff, 'post', '/api/tickets', { 'Content-Type': 'application/json', 'Content-Encoding': 'gzip' }, Buffer.from('not gzip at all'));
    assert.equal(garbage.status, 400, garbage.text);
    assert.equal(garbage.body.error.code, 'invalid_encoding');
    // Bytes that are not UTF-8 at all (a lone continuation byte, an overlong slash, a truncated sequence).
    for (const bytes of [[0x80], [0xc0, 0xaf], [0xe0, 0xa4]]) {
      const text = Buffer.concat([Buffer.from('{"makeModel":"'), Buffer.from(bytes), Buffer.from('"}')]);
      const res = await raw(staff, 'post', '/api/tickets', { 'Content-Type': 'application/json' }, text);
      assert.equal(res.status, 400, res.text);
      assert.equal(res.body.error.code, 'invalid_encoding');
    }
    await raw(staff, 'post', '/api/tickets', { 'Content-Type': 'application/json', 'Content-Encoding': 'gzip' }, gzipSync(body)).expect(201);
  });

  it('broken percent-encoding in a path: 400 invalid_path', async () => {
    for (const url of ['/%E0%A4%A', '/api/tickets/%', `/api/tickets/%E0%A4%A/moves`, '/api/users/%ZZ']) {
      const res = await raw(staff, url.includes('users') ? 'patch' : url.endsWith('moves') ? 'post' : 'get', url, { 'Content-Type': 'application/json' }, url.includes('users') || url.endsWith('moves') ? '{}' : undefined);
      assert.equal(res.status, 400, `${url}: ${res.text}`);
      assert.equal(res.body.error.code, 'invalid_path', url);
      assertClientAnswer(res, url);
    }
  });

  it('a 4xx from below our code keeps its status: a body above the limit is 413', async () => {
    const big = await raw(staff, 'post', '/api/tickets', { 'Content-Type': 'application/json' }, JSON.stringify({ ...intake, faultReported: 'x'.repeat(70_000) }));
    assert.equal(big.status, 413);
    assert.equal(big.body.error.code, 'too_large');
    assertClientAnswer(big, '413');
  });

  it('any error with a status or statusCode below 500 keeps it, in our words; 5xx and odd values are not the client\'s', () => {
    const httpError = (props: object) => Object.assign(new Error('raw message that may echo <input>'), props);
    assert.deepEqual(clientErrorAnswer(httpError({ status: 416 })), { status: 416, body: { error: { code: 'range_not_satisfiable', message: 'That part of the file does not exist.' } } });
    assert.equal(clientErrorAnswer(httpError({ statusCode: 405 }))?.status, 405);
    assert.equal(clientErrorAnswer(httpError({ status: 418 }))?.body.error.code, 'bad_request', 'an unlisted 4xx keeps its status');
    assert.equal(clientErrorAnswer(httpError({ status: 418 }))?.status, 418);
    assert.ok(!JSON.stringify(clientErrorAnswer(httpError({ status: 400 }))).includes('<input>'), 'the raw message is not echoed');
    for (const props of [{ status: 500 }, { status: 503 }, { status: '400' }, { status: 399 }, { status: 400.5 }, {}]) {
      assert.equal(clientErrorAnswer(httpError(props)), undefined, JSON.stringify(props));
    }
    assert.equal(clientErrorAnswer(null), undefined);
    assert.equal(clientErrorAnswer('400'), undefined);
  });
});
