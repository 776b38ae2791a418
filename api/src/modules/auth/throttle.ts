// Sign-in throttling (ASVS 6.3.1 / OWASP Authentication Cheat Sheet), with express-rate-limit 8
// and counters in the database (table rate_limits) so every API replica shares them.
// - per address: every attempt counts (one address trying many accounts);
// - per account and address: failures only (skipSuccessfulRequests), so someone guessing a
//   person's password from elsewhere cannot lock that person out of their own machine.
// `trust proxy` stays false: the address is the socket's, and X-Forwarded-For changes nothing.
import type { NextFunction, Request, Response } from 'express';
import { ipKeyGenerator, rateLimit, type ClientRateLimitInfo, type Options, type Store } from 'express-rate-limit';
import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { AppDeps } from '../../deps';
import { AppError } from '../../errors';

type ThrottleDeps = Pick<AppDeps, 'config' | 'sequelize'>;

/**
 * express-rate-limit store on the rate_limits table: fixed window per key. Raw SQL on purpose: the
 * counter is one atomic upsert per attempt (INSERT ... ON DUPLICATE KEY UPDATE with the window
 * reset in the same statement), on the sign-in path that a flood hits hardest; a model
 * findOrCreate + increment would take several round trips and race between replicas.
 */
export class SqlRateLimitStore implements Store {
  localKeys = false;
  private windowMs = 60_000;

  constructor(
    private readonly sequelize: Sequelize,
    readonly prefix: string,
    /** The time now; tests pass their own clock to cross a window without waiting. */
    private readonly clock: () => Date = () => new Date(),
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private rowKey(key: string): string {
    return `${this.prefix}:${createHash('sha256').update(key).digest('hex')}`;
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const rows = await this.sequelize.query<{ hits: number; reset_at: Date }>(
      'SELECT hits, reset_at FROM rate_limits WHERE rl_key = ? AND reset_at > ?',
      { replacements: [this.rowKey(key), this.clock()], type: QueryTypes.SELECT },
    );
    return rows[0] ? { totalHits: Number(rows[0].hits), resetTime: new Date(rows[0].reset_at) } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const now = this.clock();
    const resetAt = new Date(now.getTime() + this.windowMs);
    const rowKey = this.rowKey(key);
    // MariaDB applies the assignments left to right: `hits` is decided on the old reset_at.
    await this.sequelize.query(
      `INSERT INTO rate_limits (rl_key, hits, reset_at) VALUES (?, 1, ?)
       ON DUPLICATE KEY UPDATE hits = IF(reset_at <= ?, 1, hits + 1), reset_at = IF(reset_at <= ?, VALUES(reset_at), reset_at)`,
      { replacements: [rowKey, resetAt, now, now] },
    );
    const rows = await this.sequelize.query<{ hits: number; reset_at: Date }>('SELECT hits, reset_at FROM rate_limits WHERE rl_key = ?', {
      replacements: [rowKey],
      type: QueryTypes.SELECT,
    });
    if (Math.random() < 0.01) {
      await this.sequelize.query('DELETE FROM rate_limits WHERE reset_at < ?', { replacements: [new Date(now.getTime() - 60_000)] });
    }
    const row = rows[0];
    return { totalHits: Number(row?.hits ?? 1), resetTime: new Date(row?.reset_at ?? resetAt) };
  }

  async decrement(key: string): Promise<void> {
    await this.sequelize.query('UPDATE rate_limits SET hits = hits - 1 WHERE rl_key = ? AND hits > 0 AND reset_at > ?', {
      replacements: [this.rowKey(key), this.clock()],
    });
  }

  async resetKey(key: string): Promise<void> {
    await this.sequelize.query('DELETE FROM rate_limits WHERE rl_key = ?', { replacements: [this.rowKey(key)] });
  }
}

/** The client's address as the socket sees it (IPv6 grouped by /56, as express-rate-limit advises). */
export function addressKey(req: Request): string {
  return ipKeyGenerator(req.ip ?? req.socket.remoteAddress ?? 'unknown');
}

/** Key of the per-account-and-address limiter: the normalised e-mail and the address. */
export function accountAddressKey(req: Request): string {
  const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
  return `${email}|${addressKey(req)}`;
}

function retryMessage(what: string, resetTime: Date | undefined): { text: string; seconds: number } {
  const seconds = Math.max(1, Math.ceil(((resetTime?.getTime() ?? Date.now() + 60_000) - Date.now()) / 1000));
  const minutes = Math.ceil(seconds / 60);
  const when = minutes <= 1 ? 'in a minute' : `in ${minutes} minutes`;
  const at = resetTime ? ` (after ${resetTime.toISOString().slice(11, 16)} UTC)` : '';
  return { text: `Too many ${what} from here. Try again ${when}${at}.`, seconds };
}

function limiter(deps: ThrottleDeps, name: string, what: string, max: number, keyGenerator: (req: Request) => string, skipSuccessfulRequests: boolean) {
  const property = `rateLimit_${name.replace(/[^a-z]/gi, '_')}`;
  return rateLimit({
    windowMs: deps.config.RW_SIGNIN_WINDOW_MINUTES * 60_000,
    limit: max,
    keyGenerator,
    skipSuccessfulRequests,
    requestPropertyName: property,
    standardHeaders: false,
    legacyHeaders: false,
    store: new SqlRateLimitStore(deps.sequelize, name),
    // X-Forwarded-For is deliberately not trusted; the library's warning about it is noise here.
    validate: { xForwardedForHeader: false },
    handler: (req: Request, res: Response, next: NextFunction) => {
      const info = (req as unknown as Record<string, { resetTime?: Date }>)[property];
      const { text, seconds } = retryMessage(what, info?.resetTime);
      res.setHeader('Retry-After', String(seconds));
      req.log?.warn({ limiter: name, address: req.ip }, 'throttled');
      next(new AppError(429, 'too_many_attempts', text));
    },
  });
}

export function signInLimiters(deps: ThrottleDeps) {
  const { config } = deps;
  return [
    limiter(deps, 'signin-addr', 'sign-in attempts', config.RW_SIGNIN_MAX_PER_ADDRESS, addressKey, false),
    limiter(deps, 'signin-acct', 'failed sign-ins for this account', config.RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS, accountAddressKey, true),
  ];
}

/** Per-address limit for the other anonymous forms (register, password reset). */
export function anonymousFormLimiter(deps: ThrottleDeps, name: string, what: string) {
  return limiter(deps, name, what, deps.config.RW_SIGNIN_MAX_PER_ADDRESS, addressKey, false);
}
