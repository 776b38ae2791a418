// Configuration from the environment, parsed and validated once at boot; a bad value fails fast.
import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1');

/** Development defaults of the two secrets. Both are in the repository, so production refuses them. */
export const DEV_JWT_SECRET = 'local-development-secret-change-me-0123456789';
export const DEV_DB_PASSWORD = 'rigwright-local';
/** Keys of the local payments fake (payments-fake/): the real provider is used by setting real ones. */
export const DEV_STRIPE_SECRET_KEY = 'sk_test_rigwright_local_fake';
export const DEV_STRIPE_WEBHOOK_SECRET = 'whsec_rigwright_local_fake_signing_secret';

const schema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  RW_PORT: z.coerce.number().int().min(1).max(65535).default(4300),
  RW_HOST: z.string().default('127.0.0.1'),
  /** Public base URL, used in e-mailed links. */
  RW_PUBLIC_URL: z.string().url().default('http://127.0.0.1:4300'),
  RW_DB_HOST: z.string().default('127.0.0.1'),
  RW_DB_PORT: z.coerce.number().int().default(3407),
  RW_DB_NAME: z.string().regex(/^[A-Za-z0-9_]+$/).default('rigwright'),
  RW_DB_USER: z.string().default('rigwright'),
  RW_DB_PASSWORD: z.string().default(DEV_DB_PASSWORD),
  RW_DB_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
  /** HMAC secret for session tokens and anti-forgery tokens: at least 32 characters. */
  RW_JWT_SECRET: z.string().min(32).default(DEV_JWT_SECRET),
  RW_SESSION_MINUTES: z.coerce.number().int().min(1).max(24 * 60).default(120),
  /** Secure cookies (set false only for plain-http test rigs that are not localhost). */
  RW_COOKIE_SECURE: bool.default(true),
  RW_SMTP_HOST: z.string().default('127.0.0.1'),
  RW_SMTP_PORT: z.coerce.number().int().default(1025),
  /** Sender of every mail, e.g. `Bench <bench@club.example>`; unset: built from the club's name (outbox.worker.ts mailSender). */
  RW_MAIL_FROM: z.string().optional(),
  /** Milliseconds between outbox sweeps; 0 disables the in-process worker. */
  RW_OUTBOX_INTERVAL_MS: z.coerce.number().int().min(0).default(2000),
  /** Folder of the built client to serve (empty: API only). */
  RW_CLIENT_DIST: z.string().default('dist/client/browser'),
  /** Sign-in throttling: failures per account and address in the window, and requests per address. */
  RW_SIGNIN_WINDOW_MINUTES: z.coerce.number().int().min(1).default(15),
  RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS: z.coerce.number().int().min(1).default(5),
  RW_SIGNIN_MAX_PER_ADDRESS: z.coerce.number().int().min(1).default(50),
  /** Argon2id cost: at or above the OWASP/ASVS row m=19456 KiB, t=2, p=1; raise them and old hashes are rehashed at sign-in. */
  RW_ARGON2_MEMORY_KIB: z.coerce.number().int().min(19456).max(1_048_576).default(19456),
  RW_ARGON2_TIME_COST: z.coerce.number().int().min(2).max(20).default(2),
  RW_ARGON2_PARALLELISM: z.coerce.number().int().min(1).max(8).default(1),
  /** Password-reset links stay valid this long (single use). */
  RW_RESET_TOKEN_MINUTES: z.coerce.number().int().min(5).max(24 * 60).default(60),
  /** Reset mails one address may receive per hour; requests beyond it are answered alike and send nothing. */
  RW_RESET_MAILS_PER_HOUR: z.coerce.number().int().min(1).max(100).default(3),
  /**
   * Slow clients: the whole request (headers and body) must arrive within RW_REQUEST_TIMEOUT_MS and
   * its headers within RW_HEADERS_TIMEOUT_MS, or Node answers 408 and closes the connection.
   */
  RW_REQUEST_TIMEOUT_MS: z.coerce.number().int().min(1000).max(3_600_000).default(60_000),
  RW_HEADERS_TIMEOUT_MS: z.coerce.number().int().min(1000).max(600_000).default(15_000),
  /** Uploads (firmware images) live under this folder, one subfolder per database; never inside the client's folder. */
  RW_STORAGE_DIR: z.string().min(1).default('.local/storage'),
  /** Largest firmware image accepted (bytes; 16 MiB by default). */
  RW_FIRMWARE_MAX_BYTES: z.coerce.number().int().min(1024).max(1024 * 1024 * 1024).default(16 * 1024 * 1024),
  /** Largest serial log accepted with a flash attempt (bytes; 256 KiB by default). */
  RW_SERIAL_LOG_MAX_BYTES: z.coerce.number().int().min(1024).max(8 * 1024 * 1024).default(256 * 1024),
  /** Requests to the owner's link pages (status, approval) one address may make in 15 minutes. */
  RW_OWNER_LINK_MAX_PER_ADDRESS: z.coerce.number().int().min(1).max(100000).default(120),
  /**
   * Seconds after a move during which its mover (or an admin) may undo it; the owner's mail about
   * the move waits this long too, so an undone move sends nothing (modules/moves).
   */
  RW_UNDO_GRACE_SECONDS: z.coerce.number().int().min(1).max(300).default(10),
  /**
   * The payment provider, through the official SDK. Host, port and protocol point at the local fake
   * (payments-fake/, 127.0.0.1:4310) by default; for the real provider set api.stripe.com, 443,
   * https and the real keys. Nothing else in the app knows which one it talks to.
   */
  RW_STRIPE_SECRET_KEY: z.string().regex(/^(sk|rk)_(test|live)_\S+$/, 'Use a secret key like sk_test_...').default(DEV_STRIPE_SECRET_KEY),
  RW_STRIPE_WEBHOOK_SECRET: z.string().min(16).default(DEV_STRIPE_WEBHOOK_SECRET),
  RW_STRIPE_HOST: z.string().min(1).default('127.0.0.1'),
  RW_STRIPE_PORT: z.coerce.number().int().min(1).max(65535).default(4310),
  RW_STRIPE_PROTOCOL: z.enum(['http', 'https']).default('http'),
  /** Per-request timeout of the SDK and its automatic retries (each retry reuses the idempotency key). */
  RW_STRIPE_TIMEOUT_MS: z.coerce.number().int().min(100).max(120_000).default(15_000),
  RW_STRIPE_MAX_RETRIES: z.coerce.number().int().min(0).max(5).default(2),
  /** Webhook timestamps older or newer than this many seconds are refused (the provider's default: 300). */
  RW_WEBHOOK_TOLERANCE_SECONDS: z.coerce.number().int().min(1).max(3600).default(300),
  /** Largest ticket photo accepted (bytes; 10 MiB by default: a phone camera's JPEG fits). */
  RW_PHOTO_MAX_BYTES: z.coerce.number().int().min(1024).max(64 * 1024 * 1024).default(10 * 1024 * 1024),
  RW_LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export type Config = z.infer<typeof schema>;

/**
 * What production refuses: a secret that is missing (so the repository's default would be used)
 * or set to that default. Anyone with the repository could otherwise sign an admin session.
 */
function productionProblems(config: Config): string[] {
  if (config.NODE_ENV !== 'production') return [];
  const problems: string[] = [];
  if (config.RW_JWT_SECRET === DEV_JWT_SECRET) {
    problems.push(
      'RW_JWT_SECRET: set it to a random secret of at least 32 characters (for example the output of `openssl rand -base64 48`); ' +
        'the development default is public and would let anyone sign a session.',
    );
  }
  if (config.RW_DB_PASSWORD === DEV_DB_PASSWORD) {
    problems.push("RW_DB_PASSWORD: set it to the database user's own password; the development default is public.");
  }
  if (config.RW_STRIPE_SECRET_KEY === DEV_STRIPE_SECRET_KEY || config.RW_STRIPE_WEBHOOK_SECRET === DEV_STRIPE_WEBHOOK_SECRET) {
    problems.push('RW_STRIPE_SECRET_KEY and RW_STRIPE_WEBHOOK_SECRET: set the payment provider\'s own keys; the local fake\'s defaults are public.');
  }
  return problems;
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Record<keyof Config, string>> = {}): Config {
  const result = schema.safeParse({ ...env, ...overrides });
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Invalid configuration:\n${lines}`);
  }
  const problems = productionProblems(result.data);
  // Node refuses a headers timeout longer than the request timeout when the server is created.
  if (result.data.RW_HEADERS_TIMEOUT_MS > result.data.RW_REQUEST_TIMEOUT_MS) {
    problems.push('RW_HEADERS_TIMEOUT_MS: keep it at or below RW_REQUEST_TIMEOUT_MS.');
  }
  if (problems.length) {
    const lead = result.data.NODE_ENV === 'production' ? 'Refusing to start in production:' : 'Invalid configuration:';
    throw new Error(`${lead}\n${problems.map((p) => `  ${p}`).join('\n')}`);
  }
  return result.data;
}
