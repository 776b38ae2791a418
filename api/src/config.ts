// Configuration from the environment, parsed and validated once at boot; a bad value fails fast.
import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1');

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
  RW_DB_PASSWORD: z.string().default('rigwright-local'),
  RW_DB_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
  /** HMAC secret for session tokens and anti-forgery tokens: at least 32 characters. */
  RW_JWT_SECRET: z.string().min(32).default('local-development-secret-change-me-0123456789'),
  RW_SESSION_MINUTES: z.coerce.number().int().min(1).max(24 * 60).default(120),
  /** Secure cookies (set false only for plain-http test rigs that are not localhost). */
  RW_COOKIE_SECURE: bool.default(true),
  RW_SMTP_HOST: z.string().default('127.0.0.1'),
  RW_SMTP_PORT: z.coerce.number().int().default(1025),
  RW_MAIL_FROM: z.string().default('Rigwright bench <bench@kestrelfen.example>'),
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
  /** Uploads (firmware images) live under this folder, one subfolder per database; never inside the client's folder. */
  RW_STORAGE_DIR: z.string().min(1).default('.local/storage'),
  /** Largest firmware image accepted (bytes; 16 MiB by default). */
  RW_FIRMWARE_MAX_BYTES: z.coerce.number().int().min(1024).max(1024 * 1024 * 1024).default(16 * 1024 * 1024),
  /** Largest serial log accepted with a flash attempt (bytes; 256 KiB by default). */
  RW_SERIAL_LOG_MAX_BYTES: z.coerce.number().int().min(1024).max(8 * 1024 * 1024).default(256 * 1024),
  RW_LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export type Config = z.infer<typeof schema>;

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Record<keyof Config, string>> = {}): Config {
  const result = schema.safeParse({ ...env, ...overrides });
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Invalid configuration:\n${lines}`);
  }
  return result.data;
}
