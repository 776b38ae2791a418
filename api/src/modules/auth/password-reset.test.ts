// Password-reset links (OWASP Forgot Password Cheat Sheet: same answer and same time whether or
// not the account exists, single-use links that expire, existing links voided when the password
// changes; ASVS 6.4.x), and a per-recipient limit on reset mails so the form cannot be used to
// flood someone's inbox. Time is a clock passed in, never a wait.
import { after, before, beforeEach, describe, it, mock } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import { backgroundWork } from '../../background';
import { anonymous, createUser, setupTestApp, signIn, truncateAll, type TestApp } from '../../../test/helpers';
import { User } from '../users/user.model';
import { RESET_MAIL_WINDOW_MS, confirmPasswordReset, requestPasswordReset, type AuthDeps } from './auth.service';

const PERSON = { email: 'wren.harrow@kestrelfen.example', password: 'marsh harrier glides', roles: ['member' as const], displayName: 'Wren Harrow' };
const OTHER = { email: 'colm.reedy@kestrelfen.example', password: 'bittern booms at night', roles: ['member' as const], displayName: 'Colm Reedy' };

let t: TestApp;
before(async () => {
  t = await setupTestApp();
});
after(async () => {
  mock.restoreAll();
  await t.close();
});
beforeEach(async () => {
  await truncateAll(t.sequelize);
  await createUser(t.sequelize, PERSON);
  await createUser(t.sequelize, OTHER);
});

async function resetMails(to?: string): Promise<{ to_address: string; text_body: string }[]> {
  return t.sequelize.query<{ to_address: string; text_body: string }>(
    `SELECT to_address, text_body FROM outbox WHERE kind = 'password_reset' ${to ? 'AND to_address = :to' : ''} ORDER BY id`,
    { replacements: { to }, type: QueryTypes.SELECT },
  );
}
const tokenOf = (mail: { text_body: string }) => /token=([\w-]+)/.exec(mail.text_body)![1]!;

/** Asks for a reset over HTTP and waits for the work behind the 202. */
async function ask(email: string) {
  const res = await (await anonymous(t.app)).post('/api/auth/password-reset/request', { email }).expect(202);
  await backgroundWork.idle();
  return res;
}

/** A clock the test moves by hand. */
function manualClock(start = new Date('2026-03-14T19:30:00Z')) {
  let ms = start.getTime();
  return { now: () => new Date(ms), advance: (by: number) => (ms += by) };
}

describe('reset links are voided', () => {
  it('by a password change: a link mailed before the change no longer works', async () => {
    await ask(PERSON.email);
    const [mail] = await resetMails();
    const session = await signIn(t.app, PERSON.email, PERSON.password);
    await session.post('/api/auth/password', { currentPassword: PERSON.password, newPassword: 'lapwing over stubble' }).expect(204);

    const anon = await anonymous(t.app);
    const res = await anon.post('/api/auth/password-reset/confirm', { token: tokenOf(mail!), newPassword: 'attacker chose this one' }).expect(400);
    assert.equal(res.body.error.code, 'reset_token_invalid');
    await signIn(t.app, PERSON.email, 'lapwing over stubble'); // the changed password stands
  });

  it('by a reset: every other outstanding link of the person is spent', async () => {
    await ask(PERSON.email);
    await ask(PERSON.email);
    const [first, second] = await resetMails();
    const anon = await anonymous(t.app);
    await anon.post('/api/auth/password-reset/confirm', { token: tokenOf(second!), newPassword: 'curlew calls at dawn' }).expect(204);
    const res = await anon.post('/api/auth/password-reset/confirm', { token: tokenOf(first!), newPassword: 'attacker chose this one' }).expect(400);
    assert.equal(res.body.error.code, 'reset_token_invalid');
  });

  it('by time: a link works until RW_RESET_TOKEN_MINUTES have passed, then not', async () => {
    const clock = manualClock();
    const deps: AuthDeps = { config: t.config, sequelize: t.sequelize, logger: t.logger, clock: clock.now };
    await requestPasswordReset(deps, null, { email: PERSON.email });
    await requestPasswordReset(deps, null, { email: OTHER.email });
    const [mine] = await resetMails(PERSON.email);
    const [theirs] = await resetMails(OTHER.email);
    const minutes = t.config.RW_RESET_TOKEN_MINUTES;

    clock.advance(minutes * 60_000 - 1000); // one second before expiry
    await confirmPasswordReset(deps, null, { token: tokenOf(mine!), newPassword: 'curlew calls at dawn' });
    clock.advance(2000); // one second after
    await assert.rejects(confirmPasswordReset(deps, null, { token: tokenOf(theirs!), newPassword: 'curlew calls at dawn' }), { code: 'reset_token_invalid' });
  });
});

describe('reset mails per recipient', () => {
  it('are limited to RW_RESET_MAILS_PER_HOUR (3), silently: every answer is the same 202', async () => {
    const answers = [];
    for (let i = 0; i < 5; i++) answers.push(await ask(PERSON.email));
    const unknown = await ask('nobody.here@kestrelfen.example');
    for (const res of [...answers.slice(1), unknown]) {
      assert.equal(res.status, 202);
      assert.deepEqual(res.body, answers[0]!.body, 'limited, unknown and sent alike');
    }
    assert.equal((await resetMails(PERSON.email)).length, 3, 'three mails, not five');
    const [{ n }] = await t.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM password_resets', { type: QueryTypes.SELECT });
    assert.equal(Number(n), 3, 'no token stored for a request that sent no mail');
    // The limit is per recipient: someone else still gets theirs.
    await ask(OTHER.email);
    assert.equal((await resetMails(OTHER.email)).length, 1);
  });

  it('count over a sliding hour by the clock, and the limit is configurable', async () => {
    const clock = manualClock();
    const deps: AuthDeps = { config: t.config, sequelize: t.sequelize, logger: t.logger, clock: clock.now };
    for (let i = 0; i < 3; i++) {
      await requestPasswordReset(deps, null, { email: PERSON.email });
      clock.advance(10 * 60_000); // 0, 10 and 20 minutes
    }
    clock.advance(RESET_MAIL_WINDOW_MS - 30 * 60_000 - 1000); // 59:59 after the first
    await requestPasswordReset(deps, null, { email: PERSON.email });
    assert.equal((await resetMails(PERSON.email)).length, 3, 'still within the hour of the first');
    clock.advance(2000); // 60:01: the first has left the window
    await requestPasswordReset(deps, null, { email: PERSON.email });
    assert.equal((await resetMails(PERSON.email)).length, 4);
    await requestPasswordReset(deps, null, { email: PERSON.email });
    assert.equal((await resetMails(PERSON.email)).length, 4, 'three within the last hour again');

    const strict: AuthDeps = { ...deps, config: { ...t.config, RW_RESET_MAILS_PER_HOUR: 1 } };
    await requestPasswordReset(strict, null, { email: OTHER.email });
    await requestPasswordReset(strict, null, { email: OTHER.email });
    assert.equal((await resetMails(OTHER.email)).length, 1);
  });

  it('hold under simultaneous requests (the person\'s row is locked while counting)', async () => {
    await Promise.all(Array.from({ length: 8 }, () => requestPasswordReset({ config: t.config, sequelize: t.sequelize, logger: t.logger, clock: () => new Date() }, null, { email: PERSON.email })));
    assert.equal((await resetMails(PERSON.email)).length, 3);
  });
});

describe('the forgot-password answer', () => {
  it('does not wait for the account lookup, so it takes the same time for a known and an unknown address', async () => {
    // Hold every account lookup until the test lets go: the 202 must arrive meanwhile, for both.
    let release!: () => void;
    const gate = new Promise<void>((resolve) => (release = resolve));
    const lookups: unknown[] = [];
    let sawBoth!: () => void;
    const bothStarted = new Promise<void>((resolve) => (sawBoth = resolve));
    const findOne = User.findOne.bind(User);
    mock.method(User, 'findOne', async (...args: Parameters<typeof User.findOne>) => {
      lookups.push(args[0]);
      if (lookups.length === 2) sawBoth();
      await gate;
      return findOne(...args);
    });
    try {
      const anon = await anonymous(t.app);
      const known = await anon.post('/api/auth/password-reset/request', { email: PERSON.email }).expect(202);
      const unknown = await anon.post('/api/auth/password-reset/request', { email: 'nobody.here@kestrelfen.example' }).expect(202);
      assert.deepEqual(known.body, unknown.body);
      assert.equal((await resetMails()).length, 0, 'both answered before any lookup finished');
      await bothStarted; // the same work goes on behind both answers (it may start a moment after them)
      assert.equal(lookups.length, 2);
    } finally {
      release();
      await backgroundWork.idle();
      mock.restoreAll();
    }
    assert.deepEqual((await resetMails()).map((m) => m.to_address), [PERSON.email], 'the work went on after the answer');
  });

  it('stays 202 when the work behind it fails (logged, not shown)', async () => {
    mock.method(User, 'findOne', async () => {
      throw new Error('database went away');
    });
    try {
      const res = await (await anonymous(t.app)).post('/api/auth/password-reset/request', { email: PERSON.email });
      assert.equal(res.status, 202);
      await backgroundWork.idle();
    } finally {
      mock.restoreAll();
    }
    assert.equal((await resetMails()).length, 0);
  });
});
