// Password storage and policy. Sources: OWASP Password Storage Cheat Sheet and ASVS 5.0.0
// Appendix C (argon2id m=19456 KiB, t=2, p=1 as a minimum row); ASVS 6.2.1 (8+ characters),
// 6.2.9 (64+ allowed), 6.2.5 (no composition rules), 6.2.4 (common passwords refused),
// 6.2.11 (context-specific words), 11.4.2 (argon2id or equivalent). The PHC string format
// `$argon2id$v=19$m=...,t=...,p=...$salt$hash` is from the argon2 reference implementation.
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import { hash } from '@node-rs/argon2';
import { QueryTypes } from 'sequelize';
import { clubWords, hashPassword, needsRehash, parseHashParams, passwordProblem, verifyPassword } from './passwords';
import { anonymous, createUser, setClubName, setupTestApp, signIn } from '../../../test/helpers';

const FLOOR = { memoryCost: 19456, timeCost: 2, parallelism: 1 };
const apps: { close(): Promise<void> }[] = [];
after(async () => {
  for (const a of apps) await a.close();
});

async function storedHash(sequelize: import('sequelize').Sequelize, email: string): Promise<string> {
  const [row] = await sequelize.query<{ password_hash: string }>('SELECT password_hash FROM users WHERE email = ?', {
    replacements: [email],
    type: QueryTypes.SELECT,
  });
  return row!.password_hash;
}

test('a stored hash is argon2id with m=19456 KiB, t=2, p=1 (parsed from the PHC string)', async () => {
  const t = await setupTestApp();
  apps.push(t);
  const client = await anonymous(t.app);
  await client
    .post('/api/auth/register', { email: 'wren.hollis@kestrelfen.example', password: 'amber valve heater glow', displayName: 'Wren Hollis' })
    .expect(201);
  const stored = await storedHash(t.sequelize, 'wren.hollis@kestrelfen.example');
  assert.match(stored, /^\$argon2id\$v=19\$m=19456,t=2,p=1\$[A-Za-z0-9+/]{22}\$[A-Za-z0-9+/]{43}$/);
  assert.deepEqual(parseHashParams(stored), { algorithm: 'argon2id', ...FLOOR });
  assert.equal(needsRehash(stored, FLOOR), false);
  assert.equal(needsRehash(stored, { ...FLOOR, timeCost: 3 }), true);
  assert.equal(needsRehash(stored, { ...FLOOR, memoryCost: 47104 }), true);
  // An argon2i hash (algorithm 1) is always replaced by argon2id.
  const argon2i = await hash('amber valve heater glow', { algorithm: 1 as never, ...FLOOR });
  assert.match(argon2i, /^\$argon2i\$/);
  assert.equal(needsRehash(argon2i, FLOOR), true);
  assert.equal(parseHashParams('not a hash'), undefined);
});

test('sign-in rehashes a stored hash after the costs were raised, and only on a right password', async () => {
  const t = await setupTestApp({ RW_ARGON2_TIME_COST: '3', RW_ARGON2_MEMORY_KIB: '24576' });
  apps.push(t);
  await createUser(t.sequelize, { email: 'ivo.marsh@kestrelfen.example', password: 'copper lead voltage drop', roles: ['member'], argon2: FLOOR });
  const before = await storedHash(t.sequelize, 'ivo.marsh@kestrelfen.example');
  assert.deepEqual(parseHashParams(before), { algorithm: 'argon2id', ...FLOOR });

  const anon = await anonymous(t.app);
  await anon.post('/api/auth/sign-in', { email: 'ivo.marsh@kestrelfen.example', password: 'wrong password here' }).expect(401);
  assert.equal(await storedHash(t.sequelize, 'ivo.marsh@kestrelfen.example'), before, 'a wrong password changes nothing');

  await signIn(t.app, 'ivo.marsh@kestrelfen.example', 'copper lead voltage drop');
  const after = await storedHash(t.sequelize, 'ivo.marsh@kestrelfen.example');
  assert.notEqual(after, before);
  assert.deepEqual(parseHashParams(after), { algorithm: 'argon2id', memoryCost: 24576, timeCost: 3, parallelism: 1 });
  // The new hash still signs the person in.
  await signIn(t.app, 'ivo.marsh@kestrelfen.example', 'copper lead voltage drop');
});

test('length: 7 code points refused, 8 accepted, 128 accepted, 129 refused', () => {
  assert.match(passwordProblem('bq7#Lzp') ?? '', /at least 8/);
  assert.equal(passwordProblem('bq7#Lzpx'), undefined);
  const base = 'tuner dummy load swr bridge '; // no composition rules: lower-case words are fine
  const p128 = base.repeat(5).slice(0, 128);
  assert.equal([...p128].length, 128);
  assert.equal(passwordProblem(p128), undefined);
  assert.match(passwordProblem(`${p128}x`) ?? '', /at most 128/);
  // 64+ characters allowed (ASVS 6.2.9)
  assert.equal(passwordProblem(base.repeat(3)), undefined);
});

test('Unicode: length counts code points, and NFC and NFD spellings verify alike', async () => {
  // 8 emoji are 8 code points but 16 UTF-16 units: accepted; 7 emoji (14 units) refused.
  assert.equal(passwordProblem('🔧📻🔧📻🔧📻🔧📻'), undefined);
  assert.match(passwordProblem('🔧📻🔧📻🔧📻🔧') ?? '', /at least 8/);
  const composed = 'Fréquence élevée'; // é as U+00E9
  const decomposed = composed.normalize('NFD'); // e + U+0301
  assert.notEqual(composed, decomposed);
  const stored = await hashPassword(composed, FLOOR);
  assert.equal(await verifyPassword(stored, decomposed), true);
  assert.equal(await verifyPassword(stored, 'Frequence elevee'), false);
});

test('no truncation: a 100-character password differing only in its last byte does not verify', async () => {
  const long = `${'x7Q'.repeat(33)}a`; // 100 ASCII characters, so character = byte
  assert.equal(long.length, 100);
  const probe = `${long.slice(0, 99)}b`;
  const stored = await hashPassword(long, FLOOR);
  assert.equal(await verifyPassword(stored, long), true);
  assert.equal(await verifyPassword(stored, probe), false);
});

test('no truncation through the API: registration with 100 characters, sign-in with the last byte changed is refused', async () => {
  const t = await setupTestApp();
  apps.push(t);
  const long = `${'k3Fen-bench-'.repeat(8)}abcd`; // 100 characters
  assert.equal(long.length, 100);
  const anon = await anonymous(t.app);
  await anon.post('/api/auth/register', { email: 'lena.quill@kestrelfen.example', password: long, displayName: 'Lena Quill' }).expect(201);
  const other = await anonymous(t.app);
  await other.post('/api/auth/sign-in', { email: 'lena.quill@kestrelfen.example', password: `${long.slice(0, 99)}e` }).expect(401);
  await other.post('/api/auth/sign-in', { email: 'lena.quill@kestrelfen.example', password: long }).expect(200);
});

test('common passwords are refused, also with digits and symbols around them', () => {
  for (const pw of ['password', 'Password1', 'PASSWORD123', 'qwertyuiop', '12345678', 'iloveyou', 'Summer2024!', 'letmein123', 'p@ssw0rd!']) {
    assert.match(passwordProblem(pw) ?? '', /too common/, pw);
  }
  // A few unrelated words are fine, with or without capitals (no composition rules).
  assert.equal(passwordProblem('marsh heron sideband'), undefined);
});

test('club words and the person\'s own details are refused', () => {
  // The club's name comes from the club settings (the API reads it per request; see below).
  const me = { email: 'tamsin.gale@kestrelfen.example', displayName: 'Tamsin Gale', callSign: 'Q2KFT', clubName: 'Kestrel Fen Radio Society' };
  for (const pw of ['Rigwright2024', 'rigwright!!', 'Kestrel Fen 1', 'kestrelfen-bench', 'tamsin.gale@kestrelfen.example', 'TamsinGale99', 'q2kft-q2kft', 'Q2KFT12345']) {
    assert.match(passwordProblem(pw, me) ?? '', /too easy to guess/, pw);
  }
  // The same words are not the person's for someone else, and long passphrases that merely
  // include a club word still pass.
  assert.equal(passwordProblem('TamsinGale99', { email: 'ivo@kestrelfen.example', displayName: 'Ivo Marsh' }), undefined);
  assert.equal(passwordProblem('my rigwright bench has a lovely old scope', me), undefined);
});

test('the club words come from the club\'s name, not from the code', () => {
  assert.deepEqual(clubWords('Kestrel Fen Radio Society').sort(), [
    'fenradio',
    'fenradiosociety',
    'kestrel',
    'kestrelfen',
    'kestrelfenradio',
    'kestrelfenradiosociety',
    'kfrs',
    'radio',
    'radiosociety',
    'society',
  ]);
  assert.deepEqual(clubWords('our club').sort(), ['club', 'ourclub']);
  // Another club's name guards that club, and the demo club's words are nobody's business there.
  const saltmarsh = { clubName: 'Saltmarsh Amateur Radio Group' };
  for (const pw of ['Saltmarsh2024', 'saltmarsh-radio', 'SARG-1234!', 'radiogroup-77']) {
    assert.match(passwordProblem(pw, saltmarsh) ?? '', /too easy to guess/, pw);
  }
  assert.equal(passwordProblem('kestrelfen-bench', saltmarsh), undefined);
  assert.equal(passwordProblem('kestrelfen-bench'), undefined, 'without a club name only the product and the person count');
  assert.match(passwordProblem('Rigwright2024', saltmarsh) ?? '', /too easy to guess/, 'the product name in any club');
});

test('the API refuses words of the club named in the club settings', async () => {
  const t = await setupTestApp();
  apps.push(t);
  await setClubName(t.sequelize, 'Saltmarsh Amateur Radio Group');
  const anon = await anonymous(t.app);
  const res = await anon
    .post('/api/auth/register', { email: 'orla.vance@kestrelfen.example', password: 'Saltmarsh2024', displayName: 'Orla Vance' })
    .expect(400);
  assert.match(res.body.error.fields.password, /too easy to guess/);
  await anon.post('/api/auth/register', { email: 'orla.vance@kestrelfen.example', password: 'kestrelfen-bench', displayName: 'Orla Vance' }).expect(201);
});

test('the API refuses policy failures with a 400 on the password field and stores nothing', async () => {
  const t = await setupTestApp();
  apps.push(t);
  const anon = await anonymous(t.app);
  const cases: [string, RegExp][] = [
    ['bq7#Lzp', /at least 8/],
    ['y'.repeat(129), /at most 128/],
    ['Password1', /too common/],
    ['Rigwright2024', /too easy to guess/],
    ['Orla Vance 1', /too easy to guess/],
  ];
  for (const [password, message] of cases) {
    const res = await anon
      .post('/api/auth/register', { email: 'orla.vance@kestrelfen.example', password, displayName: 'Orla Vance' })
      .expect(400);
    assert.equal(res.body.error.code, 'validation_failed');
    assert.match(res.body.error.fields.password, message, password);
  }
  const [row] = await t.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM users', { type: QueryTypes.SELECT });
  assert.equal(Number(row!.n), 0);
});
