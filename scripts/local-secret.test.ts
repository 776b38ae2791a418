// The start command's development secret: made once, private to its owner, reused.
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import { chmodSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { localSecret } from './local-secret';
import { DEV_JWT_SECRET, loadConfig } from '../api/src/config';

const dir = mkdtempSync(path.join(tmpdir(), 'rw-secret-'));
after(() => rmSync(dir, { recursive: true, force: true }));

test('makes a random secret once, with mode 0600, and reuses it', () => {
  const file = path.join(dir, 'nested', 'jwt-secret');
  const first = localSecret(file);
  assert.match(first, /^[A-Za-z0-9_-]{64}$/);
  assert.notEqual(first, DEV_JWT_SECRET);
  assert.equal(statSync(file).mode & 0o777, 0o600);
  assert.equal(localSecret(file), first, 'the second start reuses it');
  assert.equal(readFileSync(file, 'utf8').trim(), first);
  // The API accepts it.
  assert.equal(loadConfig({ RW_JWT_SECRET: first }).RW_JWT_SECRET, first);
});

test('two checkouts (two files) get different secrets', () => {
  assert.notEqual(localSecret(path.join(dir, 'a')), localSecret(path.join(dir, 'b')));
});

test('a file loosened by hand is tightened; a file too short to be a secret is replaced', () => {
  const loose = path.join(dir, 'loose');
  const secret = localSecret(loose);
  chmodSync(loose, 0o644);
  assert.equal(localSecret(loose), secret);
  assert.equal(statSync(loose).mode & 0o777, 0o600);

  const short = path.join(dir, 'short');
  writeFileSync(short, 'tooshort\n', { mode: 0o644 });
  const replaced = localSecret(short);
  assert.match(replaced, /^[A-Za-z0-9_-]{64}$/);
  assert.equal(statSync(short).mode & 0o777, 0o600);
});
