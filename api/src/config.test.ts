// Configuration at boot: production refuses the repository's development secrets (OWASP ASVS 5.0.0
// 13.3.1: secrets are not in source code; the default session key in the repository would let
// anyone sign an admin session), and says which variable to set.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { DEV_DB_PASSWORD, DEV_JWT_SECRET, loadConfig } from './config';

const REAL_SECRET = 'q9V4m1Zr7Xc2Lk8Tb5Nw3Hs6Jd0Pf4Ye1Ga7Uo2Ri';
const REAL_DB_PASSWORD = 'heron-flats-cellar-42';
const REAL_PAYMENT_KEYS = { RW_STRIPE_SECRET_KEY: 'sk_live_k3stre1fenInv3nted', RW_STRIPE_WEBHOOK_SECRET: 'whsec_k3stre1fenInv3ntedSigning' };

function refusal(env: NodeJS.ProcessEnv): string {
  try {
    loadConfig(env);
  } catch (err) {
    return (err as Error).message;
  }
  assert.fail(`loadConfig accepted ${JSON.stringify(env)}`);
}

test('production refuses to start without RW_JWT_SECRET and RW_DB_PASSWORD, naming both', () => {
  const message = refusal({ NODE_ENV: 'production' });
  assert.match(message, /^Refusing to start in production:/);
  assert.match(message, /RW_JWT_SECRET: set it to a random secret of at least 32 characters/);
  assert.match(message, /RW_DB_PASSWORD: set it/);
  assert.ok(!message.includes(DEV_JWT_SECRET), 'the message does not repeat the secret');
});

test('production refuses the development defaults set explicitly, one variable at a time', () => {
  const jwt = refusal({ NODE_ENV: 'production', RW_JWT_SECRET: DEV_JWT_SECRET, RW_DB_PASSWORD: REAL_DB_PASSWORD, ...REAL_PAYMENT_KEYS });
  assert.match(jwt, /RW_JWT_SECRET/);
  assert.doesNotMatch(jwt, /RW_DB_PASSWORD/);

  const db = refusal({ NODE_ENV: 'production', RW_JWT_SECRET: REAL_SECRET, RW_DB_PASSWORD: DEV_DB_PASSWORD, ...REAL_PAYMENT_KEYS });
  assert.match(db, /RW_DB_PASSWORD/);
  assert.doesNotMatch(db, /RW_JWT_SECRET/);
});

test('production refuses a short secret, as every environment does', () => {
  const message = refusal({ NODE_ENV: 'production', RW_JWT_SECRET: 'short', RW_DB_PASSWORD: REAL_DB_PASSWORD });
  assert.match(message, /RW_JWT_SECRET/);
});

test('production starts with both secrets set', () => {
  const config = loadConfig({ NODE_ENV: 'production', RW_JWT_SECRET: REAL_SECRET, RW_DB_PASSWORD: REAL_DB_PASSWORD, ...REAL_PAYMENT_KEYS });
  assert.equal(config.RW_JWT_SECRET, REAL_SECRET);
  assert.equal(config.RW_DB_PASSWORD, REAL_DB_PASSWORD);
});

test('production refuses the local payments fake\'s public keys', () => {
  const message = refusal({ NODE_ENV: 'production', RW_JWT_SECRET: REAL_SECRET, RW_DB_PASSWORD: REAL_DB_PASSWORD });
  assert.match(message, /RW_STRIPE_SECRET_KEY and RW_STRIPE_WEBHOOK_SECRET/);
  assert.doesNotMatch(message, /RW_JWT_SECRET:/);
});

test('development and test keep working with the defaults', () => {
  for (const NODE_ENV of ['development', 'test', undefined]) {
    const config = loadConfig({ NODE_ENV });
    assert.equal(config.RW_JWT_SECRET, DEV_JWT_SECRET);
    assert.equal(config.RW_DB_PASSWORD, DEV_DB_PASSWORD);
  }
});

test('slow-client timeouts: defaults, overrides, and a headers timeout above the request timeout refused', () => {
  const config = loadConfig({});
  assert.equal(config.RW_REQUEST_TIMEOUT_MS, 60_000);
  assert.equal(config.RW_HEADERS_TIMEOUT_MS, 15_000);
  assert.equal(loadConfig({ RW_REQUEST_TIMEOUT_MS: '5000', RW_HEADERS_TIMEOUT_MS: '2000' }).RW_HEADERS_TIMEOUT_MS, 2000);
  assert.match(refusal({ RW_REQUEST_TIMEOUT_MS: '5000', RW_HEADERS_TIMEOUT_MS: '6000' }), /RW_HEADERS_TIMEOUT_MS: keep it at or below RW_REQUEST_TIMEOUT_MS/);
});
