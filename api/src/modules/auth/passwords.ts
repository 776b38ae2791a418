// Password hashing (argon2id) and the password policy.
// Storage follows the OWASP Password Storage Cheat Sheet / ASVS 5.0 Appendix C row m=19456 KiB, t=2,
// p=1 (or higher, from config); hashes whose parameters are below the current ones are rehashed at
// sign-in. Policy follows ASVS 6.2.x: 8-128 characters counted as Unicode code points after NFC,
// no composition rules, no truncation, common and context-specific passwords refused.
import { hash, parseOptions, verify, type Algorithm } from '@node-rs/argon2';
import { readFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';

export interface Argon2Params {
  memoryCost: number;
  timeCost: number;
  parallelism: number;
}

export function argon2ParamsFromConfig(config: {
  RW_ARGON2_MEMORY_KIB: number;
  RW_ARGON2_TIME_COST: number;
  RW_ARGON2_PARALLELISM: number;
}): Argon2Params {
  return { memoryCost: config.RW_ARGON2_MEMORY_KIB, timeCost: config.RW_ARGON2_TIME_COST, parallelism: config.RW_ARGON2_PARALLELISM };
}

// Algorithm is a `const enum` in the package's types, which isolatedModules cannot inline; the
// native binding's value for Argon2id is 2 (see @node-rs/argon2 index.d.ts).
const ARGON2ID = 2 as Algorithm;

export const PASSWORD_MIN = 8;
export const PASSWORD_MAX = 128;

/** NFC form, so the same visible password typed on two keyboards hashes alike. */
export function normalisePassword(password: string): string {
  return password.normalize('NFC');
}

export async function hashPassword(password: string, params: Argon2Params): Promise<string> {
  return hash(normalisePassword(password), { algorithm: ARGON2ID, ...params, outputLen: 32 });
}

export async function verifyPassword(storedHash: string, password: string): Promise<boolean> {
  try {
    return await verify(storedHash, normalisePassword(password));
  } catch {
    // A malformed stored hash never signs anyone in.
    return false;
  }
}

/** Parameters of a stored PHC-format hash, e.g. `$argon2id$v=19$m=19456,t=2,p=1$salt$hash`. */
export function parseHashParams(storedHash: string): (Argon2Params & { algorithm: 'argon2id' | 'argon2i' | 'argon2d' }) | undefined {
  try {
    const parsed = parseOptions(storedHash);
    const algorithm = (['argon2d', 'argon2i', 'argon2id'] as const)[parsed.algorithm as number];
    if (!algorithm) return undefined;
    return { algorithm, memoryCost: parsed.memoryCost, timeCost: parsed.timeCost, parallelism: parsed.parallelism };
  } catch {
    return undefined;
  }
}

/** True when the stored hash is not argon2id or any of its costs is below the current ones. */
export function needsRehash(storedHash: string, current: Argon2Params): boolean {
  const p = parseHashParams(storedHash);
  if (!p || p.algorithm !== 'argon2id') return true;
  return p.memoryCost < current.memoryCost || p.timeCost < current.timeCost || p.parallelism !== current.parallelism;
}

let dummyHash: Promise<string> | undefined;
let dummyParams = '';
/**
 * A hash of a random secret with the current parameters: verified against when the e-mail is
 * unknown, so an unknown account and a wrong password take the same time.
 */
export function dummyHashFor(params: Argon2Params): Promise<string> {
  const key = `${params.memoryCost}/${params.timeCost}/${params.parallelism}`;
  if (!dummyHash || dummyParams !== key) {
    dummyParams = key;
    dummyHash = hashPassword(randomBytes(24).toString('base64'), params);
  }
  return dummyHash;
}

// ---- policy ----

const COMMON = new Set(
  readFileSync(new URL('./common-passwords.txt', import.meta.url), 'utf8')
    .split('\n')
    .map((line) => line.trim().toLowerCase())
    .filter((line) => line && !line.startsWith('#')),
);

/** The product's own name: too easy to guess in any club. */
const PRODUCT_WORDS = ['rigwright'];

/**
 * Words built from the club's name (from the club settings): each word of four letters or more,
 * every run of two or more neighbouring words run together, and the initials of three or more
 * words. "Kestrel Fen Radio Society" gives kestrel, radio, society, kestrelfen, fenradio, ...,
 * kestrelfenradiosociety and kfrs.
 */
export function clubWords(clubName: string): string[] {
  const words = clubName.split(/[\s\-_.,'’&/]+/).map(lettersAndDigits).filter(Boolean);
  const out = new Set<string>(words.filter((w) => w.length >= 4));
  for (let from = 0; from < words.length; from++) {
    for (let to = from + 2; to <= words.length; to++) out.add(words.slice(from, to).join(''));
  }
  if (words.length >= 3) out.add(words.map((w) => [...w][0]).join(''));
  return [...out];
}

function lettersOnly(s: string): string {
  return s.toLowerCase().replace(/[^\p{L}]/gu, '');
}
function lettersAndDigits(s: string): string {
  return s.toLowerCase().replace(/[^\p{L}\p{N}]/gu, '');
}

export interface PasswordContext {
  email?: string;
  displayName?: string;
  callSign?: string | null;
  /** The club's name from the club settings; its words are refused too (see clubWords). */
  clubName?: string;
}

/** The reason a password is refused, or undefined when it is acceptable. */
export function passwordProblem(password: string, context: PasswordContext = {}): string | undefined {
  const pw = normalisePassword(password);
  const length = [...pw].length; // code points, not UTF-16 units
  if (length < PASSWORD_MIN) return `Use at least ${PASSWORD_MIN} characters.`;
  if (length > PASSWORD_MAX) return `Use at most ${PASSWORD_MAX} characters.`;

  const lower = pw.toLowerCase();
  const letters = lettersOnly(pw);
  const alnum = lettersAndDigits(pw);
  // "Summer2024!", "password1" and "p@ssw0rd!" are as weak as "summer", "password" and "p@ssw0rd".
  const withoutTail = lower.replace(/[^\p{L}]+$/u, '');
  if (COMMON.has(lower) || COMMON.has(alnum) || COMMON.has(withoutTail) || (letters.length >= 4 && COMMON.has(letters))) {
    return 'That password is too common. Try a few unrelated words together.';
  }

  const personal: string[] = [];
  if (context.email) {
    const email = context.email.toLowerCase();
    personal.push(lettersAndDigits(email), lettersAndDigits(email.split('@')[0] ?? ''));
  }
  if (context.displayName) personal.push(lettersAndDigits(context.displayName), ...context.displayName.split(/\s+/).map(lettersAndDigits));
  if (context.callSign) personal.push(lettersAndDigits(context.callSign));
  const club = context.clubName ? clubWords(context.clubName) : [];
  const guessable = [...PRODUCT_WORDS, ...club, ...personal.filter((w) => w.length >= 3)];
  // Refused when the password is only such a word, with digits or symbols around it.
  if (guessable.some((w) => w === alnum || w === letters)) {
    return 'That password is too easy to guess here: do not build it from the club, Rigwright or your own name, e-mail or call sign.';
  }
  // Or when such a word makes up most of it (e.g. "Rigwright2024!" or "kestrelfen-bench").
  for (const w of guessable) {
    if (w.length >= 4 && alnum.includes(w) && alnum.length - w.length < 6) {
      return 'That password is too easy to guess here: do not build it from the club, Rigwright or your own name, e-mail or call sign.';
    }
  }
  return undefined;
}
