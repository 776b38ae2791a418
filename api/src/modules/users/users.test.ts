// Admin accounts routes: deny by default for every other role (database unchanged), paging,
// sorting and search, creation, changes, self-protection, no mass assignment, no field leaks.
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import { anonymous, createUser, setupTestApp, signIn, tableSnapshot, type TestApp } from '../../../test/helpers';

let t: TestApp;
const apps: TestApp[] = [];
after(async () => {
  for (const a of apps) await a.close();
});
async function fresh(): Promise<TestApp> {
  t = await setupTestApp();
  apps.push(t);
  return t;
}

const ADMIN = { email: 'rhoswen.pike@kestrelfen.example', password: 'estuary night net', roles: ['admin' as const], displayName: 'Rhoswen Pike', callSign: 'Q2KFR' };
const ROW_KEYS = ['callSign', 'createdAt', 'disabled', 'displayName', 'email', 'id', 'roles'];

test('members, technicians and treasurers get 403 on every accounts route; signed out gets 401; nothing changes', async () => {
  await fresh();
  const admin = await createUser(t.sequelize, ADMIN);
  const others = [
    { email: 'member@kestrelfen.example', password: 'moorhen in reeds', roles: ['member' as const] },
    { email: 'tech@kestrelfen.example', password: 'flux and braid', roles: ['technician' as const, 'member' as const] },
    { email: 'treasurer@kestrelfen.example', password: 'ledger and tally', roles: ['treasurer' as const] },
  ];
  for (const o of others) await createUser(t.sequelize, o);
  const before = await tableSnapshot(t.sequelize);
  const newAccount = { email: 'sneaky@kestrelfen.example', displayName: 'Sneaky', roles: ['admin'], password: 'sneaky sneaky fox' };
  for (const o of others) {
    const c = await signIn(t.app, o.email, o.password);
    for (const res of [
      await c.get('/api/users'),
      await c.post('/api/users', newAccount),
      await c.patch(`/api/users/${admin.id}`, { disabled: true }),
      await c.patch(`/api/users/${admin.id + 1}`, { roles: ['admin'] }),
    ]) {
      assert.equal(res.status, 403, `${o.email}: ${res.status} ${res.text}`);
      assert.equal(res.body.error.code, 'forbidden');
    }
  }
  const anon = await anonymous(t.app);
  for (const res of [await anon.get('/api/users'), await anon.post('/api/users', newAccount), await anon.patch(`/api/users/${admin.id}`, { disabled: true })]) {
    assert.equal(res.status, 401);
  }
  assert.deepEqual(await tableSnapshot(t.sequelize), before);
});

test('list: paged, sorted, searchable; rows carry only the UserRow fields', async () => {
  await fresh();
  await createUser(t.sequelize, ADMIN);
  for (let i = 1; i <= 12; i++) {
    await createUser(t.sequelize, {
      email: `member${String(i).padStart(2, '0')}@kestrelfen.example`,
      password: 'x',
      roles: i % 3 === 0 ? ['technician', 'member'] : ['member'],
      displayName: `Member ${String.fromCharCode(76 - i)}`, // K, J, I, ... reverse of e-mail order
      callSign: i === 7 ? 'Q2KFZ' : null,
    });
  }
  const admin = await signIn(t.app, ADMIN.email, ADMIN.password);
  const page = await admin.get('/api/users?page=2&pageSize=5&sort=email&dir=asc').expect(200);
  assert.equal(page.body.total, 13);
  assert.equal(page.body.page, 2);
  assert.equal(page.body.pageSize, 5);
  assert.deepEqual(
    page.body.items.map((u: { email: string }) => u.email),
    // page 1 is member01..05; rhoswen.pike sorts after every member
    ['member06@kestrelfen.example', 'member07@kestrelfen.example', 'member08@kestrelfen.example', 'member09@kestrelfen.example', 'member10@kestrelfen.example'],
  );
  for (const row of page.body.items) assert.deepEqual(Object.keys(row).sort(), ROW_KEYS);
  assert.deepEqual(page.body.items.find((u: { email: string }) => u.email === 'member06@kestrelfen.example').roles, ['member', 'technician']);

  const byName = await admin.get('/api/users?sort=displayName&dir=desc&pageSize=3').expect(200);
  assert.deepEqual(byName.body.items.map((u: { displayName: string }) => u.displayName), ['Rhoswen Pike', 'Member K', 'Member J']);

  const search = await admin.get('/api/users?q=q2kfz').expect(200);
  assert.equal(search.body.total, 1);
  assert.equal(search.body.items[0].email, 'member07@kestrelfen.example');
  assert.equal((await admin.get('/api/users?q=%25').expect(200)).body.total, 0, '% is a literal, not a wildcard');

  for (const bad of ['sort=password_hash', 'dir=sideways', 'pageSize=1000', 'page=0', 'role=admin']) {
    const res = await admin.get(`/api/users?${bad}`).expect(400);
    assert.equal(res.body.error.code, 'validation_failed', bad);
  }
});

test('create: 201 UserRow; e-mail taken 409; weak password 400; unknown fields refused; nothing stored on refusal', async () => {
  await fresh();
  await createUser(t.sequelize, ADMIN);
  const admin = await signIn(t.app, ADMIN.email, ADMIN.password);
  const res = await admin
    .post('/api/users', { email: 'Dilys.Roke@kestrelfen.example', displayName: 'Dilys Roke', callSign: 'q2kfd', roles: ['technician', 'member', 'technician'], password: 'wherry sail at noon' })
    .expect(201);
  assert.deepEqual(Object.keys(res.body).sort(), ROW_KEYS);
  assert.equal(res.body.email, 'dilys.roke@kestrelfen.example');
  assert.equal(res.body.callSign, 'Q2KFD');
  assert.deepEqual(res.body.roles, ['member', 'technician']);
  assert.equal(res.body.disabled, false);
  assert.match(res.body.createdAt, /^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
  await signIn(t.app, 'dilys.roke@kestrelfen.example', 'wherry sail at noon');

  const before = await tableSnapshot(t.sequelize);
  const taken = await admin.post('/api/users', { email: 'dilys.roke@kestrelfen.example', displayName: 'Other', roles: ['member'], password: 'another good phrase' }).expect(409);
  assert.equal(taken.body.error.code, 'email_taken');
  const weak = await admin.post('/api/users', { email: 'new@kestrelfen.example', displayName: 'New Person', roles: ['member'], password: 'letmein1' }).expect(400);
  assert.ok(weak.body.error.fields.password);
  for (const extra of [{ sessionGeneration: 5 }, { passwordHash: 'x' }, { disabled: true }, { id: 99 }]) {
    const r = await admin.post('/api/users', { email: 'new@kestrelfen.example', displayName: 'New Person', roles: ['member'], password: 'a decent phrase here', ...extra }).expect(400);
    assert.equal(r.body.error.code, 'validation_failed');
  }
  await admin.post('/api/users', { email: 'new@kestrelfen.example', displayName: 'New Person', roles: ['owner'], password: 'a decent phrase here' }).expect(400);
  await admin.post('/api/users', { email: 'new@kestrelfen.example', displayName: 'New Person', roles: [], password: 'a decent phrase here' }).expect(400);
  assert.deepEqual(await tableSnapshot(t.sequelize), before);
});

test('patch: name, call sign, roles, disabled; unknown id 404; unknown fields refused; an admin cannot demote or disable themselves', async () => {
  await fresh();
  const me = await createUser(t.sequelize, ADMIN);
  const other = await createUser(t.sequelize, { email: 'hal.stennet@kestrelfen.example', password: 'bittern boom', roles: ['member'], displayName: 'Hal Stennet' });
  const admin = await signIn(t.app, ADMIN.email, ADMIN.password);

  const res = await admin.patch(`/api/users/${other.id}`, { displayName: 'Hal Stennett', callSign: 'q2kfh', roles: ['member', 'admin'] }).expect(200);
  assert.deepEqual(Object.keys(res.body).sort(), ROW_KEYS);
  assert.equal(res.body.displayName, 'Hal Stennett');
  assert.equal(res.body.callSign, 'Q2KFH');
  assert.deepEqual(res.body.roles, ['member', 'admin']);
  assert.equal((await admin.patch(`/api/users/${other.id}`, { callSign: '' }).expect(200)).body.callSign, null);
  assert.equal((await admin.patch(`/api/users/${other.id}`, { disabled: true }).expect(200)).body.disabled, true);
  assert.equal((await admin.patch(`/api/users/${other.id}`, { disabled: false }).expect(200)).body.disabled, false);

  const before = await tableSnapshot(t.sequelize);
  const demote = await admin.patch(`/api/users/${me.id}`, { roles: ['member'] }).expect(409);
  assert.equal(demote.body.error.code, 'own_admin_role');
  assert.match(demote.body.error.message, /another admin/);
  const disable = await admin.patch(`/api/users/${me.id}`, { disabled: true }).expect(409);
  assert.equal(disable.body.error.code, 'own_account');
  assert.equal((await admin.patch('/api/users/999999', { displayName: 'Nobody' }).expect(404)).body.error.code, 'user_not_found');
  for (const body of [{}, { email: 'x@kestrelfen.example' }, { passwordHash: 'x' }, { sessionGeneration: 0 }, { disabled: 'yes' }, { roles: ['root'] }]) {
    await admin.patch(`/api/users/${other.id}`, body).expect(400);
  }
  await admin.patch('/api/users/abc', { displayName: 'X' }).expect(400);
  assert.deepEqual(await tableSnapshot(t.sequelize), before);

  // Another admin may do it (the other account is an admin now).
  const second = await signIn(t.app, 'hal.stennet@kestrelfen.example', 'bittern boom');
  assert.deepEqual((await second.patch(`/api/users/${me.id}`, { roles: ['member'] }).expect(200)).body.roles, ['member']);
});
