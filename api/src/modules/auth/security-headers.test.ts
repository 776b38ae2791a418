// Security headers on every kind of /api answer (OWASP Secure Headers / HTTP Headers Cheat Sheet;
// Express production security guide), bad JSON and forced errors without stack or SQL.
import { test, after, mock } from 'node:test';
import assert from 'node:assert/strict';
import type { Response } from 'supertest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { anonymous, createUser, setupTestApp, signIn, type TestApp } from '../../../test/helpers';
import { User } from '../users/user.model';

let t: TestApp;
// A stand-in for the built client: the static files and the single-page fallback get the headers too.
const dist = mkdtempSync(path.join(tmpdir(), 'rw-dist-'));
writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>Rigwright</title>');
after(async () => {
  rmSync(dist, { recursive: true, force: true });
  mock.restoreAll();
  await t?.close();
});

function assertSecurityHeaders(res: Response, label: string) {
  const csp = String(res.headers['content-security-policy'] ?? '');
  for (const directive of ["object-src 'none'", "base-uri 'none'", "frame-ancestors 'none'", "default-src 'self'"]) {
    assert.ok(csp.includes(directive), `${label}: CSP has ${directive} (got ${csp})`);
  }
  assert.equal(res.headers['x-content-type-options'], 'nosniff', label);
  assert.equal(res.headers['referrer-policy'], 'same-origin', label);
  assert.equal(res.headers['x-powered-by'], undefined, label);
  assert.equal(res.headers['cache-control'], 'no-store', label);
  assert.match(String(res.headers['content-type']), /^application\/json/, label);
  assertPermissionsPolicy(res, label);
}

/** Features the app does not use are off; Web Serial stays on for our own origin (the Flasher). */
function assertPermissionsPolicy(res: Response, label: string) {
  const policy = String(res.headers['permissions-policy'] ?? '');
  const directives = new Map(policy.split(/,\s*/).map((d) => d.split('=') as [string, string]));
  for (const feature of ['camera', 'microphone', 'geolocation', 'payment', 'usb', 'hid', 'midi', 'display-capture']) {
    assert.equal(directives.get(feature), '()', `${label}: Permissions-Policy turns ${feature} off (got ${policy})`);
  }
  assert.equal(directives.get('serial'), '(self)', `${label}: Web Serial stays on for our own origin`);
  // Structured-field syntax (RFC 8941 dictionary): name=(allowlist), comma separated, nothing else.
  assert.match(policy, /^[a-z-]+=\((self)?\)(, [a-z-]+=\((self)?\))*$/, label);
}

test('headers on 200, 401, 403, 404, 400 (bad JSON) and 500 answers, and on the client\'s pages', async () => {
  t = await setupTestApp({ RW_CLIENT_DIST: dist });
  await createUser(t.sequelize, { email: 'ada.pell@kestrelfen.example', password: 'curlew over the flats', roles: ['member'] });
  const anon = await anonymous(t.app);
  const member = await signIn(t.app, 'ada.pell@kestrelfen.example', 'curlew over the flats');

  assertSecurityHeaders(await anon.get('/api/auth/session').expect(200), '200');
  assertSecurityHeaders(await anon.get('/api/users').expect(401), '401');
  assertSecurityHeaders(await member.get('/api/users').expect(403), '403');
  const missing = await anon.get('/api/no-such-route').expect(404);
  assertSecurityHeaders(missing, '404');
  assert.equal(missing.body.error.code, 'route_not_found');

  const bad = await anon.agent
    .post('/api/auth/sign-in')
    .set('Content-Type', 'application/json')
    .set('X-XSRF-TOKEN', anon.cookie('XSRF-TOKEN')!)
    .send('{"email": "ada.pell@kestrelfen.example", "password": ')
    .expect(400);
  assertSecurityHeaders(bad, '400');
  assert.deepEqual(Object.keys(bad.body), ['error']);
  assert.equal(bad.body.error.code, 'invalid_json');
  assert.equal(typeof bad.body.error.message, 'string');

  // The client's pages (static file and single-page fallback) carry the same policy.
  for (const page of ['/', '/board', '/index.html']) {
    const html = await anon.get(page).expect(200);
    assert.match(String(html.headers['content-type']), /^text\/html/);
    assertPermissionsPolicy(html, page);
    assert.ok(String(html.headers['content-security-policy']).includes("frame-ancestors 'none'"), page);
  }

  const invalid = await anon.post('/api/auth/sign-in', { email: 'ada.pell@kestrelfen.example' }).expect(400);
  assert.equal(invalid.body.error.code, 'validation_failed');
  assert.ok(invalid.body.error.fields.password);

  // A forced failure deep in a service: generic 500, no stack, no SQL, no message leak.
  mock.method(User, 'findOne', async () => {
    throw new Error('boom: SELECT password_hash FROM users WHERE email = ?');
  });
  const crash = await anon.post('/api/auth/sign-in', { email: 'ada.pell@kestrelfen.example', password: 'curlew over the flats' }).expect(500);
  mock.restoreAll();
  assertSecurityHeaders(crash, '500');
  assert.deepEqual(crash.body, {
    error: { code: 'internal_error', message: 'Something went wrong on the server. Try again; if it keeps happening, tell a club officer.' },
  });
  for (const leak of ['boom', 'SELECT', 'password_hash', 'at ', '.ts:']) assert.ok(!crash.text.includes(leak), `500 body leaks "${leak}"`);
});
