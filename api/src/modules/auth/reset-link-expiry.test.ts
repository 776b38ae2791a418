// A password-reset link works until RW_RESET_TOKEN_MINUTES after it was asked for, and not one
// millisecond longer. Time is the app's injected clock (createTestClock), moved by the test: no
// waiting and no editing of stored expiry times.
import { after, test } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import { backgroundWork } from '../../background';
import { anonymous, createTestClock, createUser, setupTestApp, type TestApp } from '../../../test/helpers';

let t: TestApp | undefined;
after(() => t?.close());

const PERSON = { email: 'wren.holloway@kestrelfen.example', password: 'reed beds at dawn', roles: ['member' as const], displayName: 'Wren Holloway' };

test('a reset link expires exactly RW_RESET_TOKEN_MINUTES after it was asked for, by the app clock', async () => {
  const clock = createTestClock(new Date('2026-05-02T19:30:00.000Z'));
  t = await setupTestApp({ RW_RESET_TOKEN_MINUTES: '30' }, { clock });
  await createUser(t.sequelize, PERSON);
  const anon = await anonymous(t.app);
  const latestToken = async () => {
    const [row] = await t!.sequelize.query<{ text_body: string }>('SELECT text_body FROM outbox ORDER BY id DESC LIMIT 1', { type: QueryTypes.SELECT });
    return /token=([\w-]+)/.exec(row!.text_body)![1]!;
  };

  await anon.post('/api/auth/password-reset/request', { email: PERSON.email }).expect(202);
  await backgroundWork.idle(); // the 202 comes before the work (same answer time for any address)
  const [stored] = await t.sequelize.query<{ expires_at: Date }>('SELECT expires_at FROM password_resets', { type: QueryTypes.SELECT });
  assert.equal(stored!.expires_at.toISOString(), '2026-05-02T20:00:00.000Z', 'asked for at 19:30, valid for 30 minutes');
  const first = await latestToken();
  clock.advance(30 * 60_000 - 1);
  await anon.post('/api/auth/password-reset/confirm', { token: first, newPassword: 'heron over the dyke' }).expect(204);

  await anon.post('/api/auth/password-reset/request', { email: PERSON.email }).expect(202);
  await backgroundWork.idle();
  const second = await latestToken();
  clock.advance(30 * 60_000);
  const late = await anon.post('/api/auth/password-reset/confirm', { token: second, newPassword: 'bittern booming low' }).expect(400);
  assert.equal(late.body.error.code, 'reset_token_invalid');
});
