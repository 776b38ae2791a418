// The development session secret of `npm start`: random, made once per checkout, kept under
// .local/ (ignored by git) with mode 0600, and reused so sessions survive a restart. Production
// sets RW_JWT_SECRET itself (the API refuses to start there without it).
import { randomBytes } from 'node:crypto';
import { chmodSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';

/** The secret kept in `file`, created (48 random bytes, base64url: 64 characters) when missing or unusable. */
export function localSecret(file: string): string {
  try {
    const kept = readFileSync(file, 'utf8').trim();
    if (kept.length >= 32) {
      // Tighten a file someone loosened by hand: the secret signs every session.
      if ((statSync(file).mode & 0o077) !== 0) chmodSync(file, 0o600);
      return kept;
    }
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
  }
  mkdirSync(path.dirname(file), { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  chmodSync(file, 0o600); // the mode above only applies to a new file
  return secret;
}
