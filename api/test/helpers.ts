// Shared helpers for API tests (node:test + supertest against the real MariaDB, database
// rigwright_test on 127.0.0.1:3407). Run test files one at a time (--test-concurrency=1): each
// setupTestApp() empties every table.
//
//   const t = await setupTestApp();                 // { app, sequelize, config, logger, clock, close() }
//   after(() => t.close());
//   await createUser(t.sequelize, { email, password, roles: ['technician'] });
//   const tech = await signIn(t.app, email, password);  // cookie-keeping client, adds X-XSRF-TOKEN
//   await tech.post('/api/tickets', body).expect(201);
//   const before = await tableSnapshot(t.sequelize); ... assert.deepEqual(await tableSnapshot(t.sequelize), before);
import supertest from 'supertest';
import type { Test } from 'supertest';
import mariadb, { type Connection as MariaDbConnection } from 'mariadb';
import type { Express } from 'express';
import { QueryTypes, type Sequelize } from 'sequelize';
import { loadConfig, type Config } from '../src/config';
import { createLogger, type Logger } from '../src/logger';
import { createSequelize } from '../src/db';
import { initModels } from '../src/models';
import { createApp } from '../src/app';
import { systemClock, type Clock } from '../src/deps';
import { migrateUp } from '../../db/migrator';
import { hashPassword } from '../src/modules/auth/passwords';
import type { Role } from '../src/contracts/accounts';
import { User, UserRole } from '../src/modules/users/user.model';

export type ConfigOverrides = Partial<Record<keyof Config, string>>;

export interface TestApp {
  app: Express;
  sequelize: Sequelize;
  config: Config;
  logger: Logger;
  /** The app's clock: the system clock, or the one given to setupTestApp. */
  clock: Clock;
  close(): Promise<void>;
}

/** A clock that stands still until the test moves it, so no test has to wait for time to pass. */
export interface TestClock extends Clock {
  /** Moves the clock on by `ms` milliseconds. */
  advance(ms: number): void;
  set(at: Date): void;
}

/** A TestClock starting at `start` (now, by default). */
export function createTestClock(start: Date = new Date()): TestClock {
  let at = start.getTime();
  const clock = (() => new Date(at)) as TestClock;
  clock.advance = (ms) => {
    at += ms;
  };
  clock.set = (date) => {
    at = date.getTime();
  };
  return clock;
}

/** Tables the helpers never empty or compare: migration bookkeeping and throttle counters. */
const BOOKKEEPING = new Set(['schema_migrations', 'schema_seeds']);
const VOLATILE = new Set(['rate_limits']);

let shared: Promise<{ sequelize: Sequelize; config: Config; lock: MariaDbConnection }> | undefined;
let latestApp = 0;

/** Test defaults; RW_DB_* (and any RW_ setting) from the environment win, overrides win over both. */
function testConfig(overrides: ConfigOverrides): Config {
  const config = loadConfig(
    {
      RW_DB_NAME: 'rigwright_test',
      ...process.env,
      NODE_ENV: 'test',
      // superagent (like a browser) does not send Secure cookies over plain http.
      RW_COOKIE_SECURE: 'false',
      RW_LOG_LEVEL: 'silent',
      RW_OUTBOX_INTERVAL_MS: '0',
      RW_CLIENT_DIST: '',
    },
    overrides,
  );
  if (!/test/i.test(config.RW_DB_NAME)) {
    throw new Error(`Refusing to run tests against database "${config.RW_DB_NAME}": its name must contain "test" (every table is emptied).`);
  }
  return config;
}

/**
 * Creates the test database if needed and takes a MariaDB named lock on it, held by one
 * connection until close(): two test processes (another terminal, another checkout's run) that
 * use these helpers on the same database wait for each other instead of emptying each other's
 * tables mid-test.
 */
async function ensureDatabaseAndLock(config: Config): Promise<MariaDbConnection> {
  const conn = await mariadb.createConnection({
    host: config.RW_DB_HOST,
    port: config.RW_DB_PORT,
    user: config.RW_DB_USER,
    password: config.RW_DB_PASSWORD,
  });
  try {
    await conn.query(`CREATE DATABASE IF NOT EXISTS \`${config.RW_DB_NAME}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    const [row] = await conn.query(`SELECT GET_LOCK(?, 600) AS got`, [`rigwright-tests:${config.RW_DB_NAME}`]);
    if (Number(row?.got) !== 1) throw new Error(`Another test run held database ${config.RW_DB_NAME} for 10 minutes; giving up.`);
    return conn;
  } catch (err) {
    await conn.end();
    throw err;
  }
}

export async function listTables(sequelize: Sequelize): Promise<string[]> {
  const rows = await sequelize.query<Record<string, string>>('SHOW TABLES', { type: QueryTypes.SELECT });
  return rows.map((r) => Object.values(r)[0]!).filter((t) => !BOOKKEEPING.has(t)).sort();
}

/** Empties every table (foreign-key checks off on the one pinned connection). */
export async function truncateAll(sequelize: Sequelize): Promise<void> {
  const tables = await listTables(sequelize);
  await sequelize.transaction(async (transaction) => {
    await sequelize.query('SET FOREIGN_KEY_CHECKS = 0', { transaction });
    for (const t of tables) await sequelize.query(`TRUNCATE TABLE \`${t}\``, { transaction });
    await sequelize.query('SET FOREIGN_KEY_CHECKS = 1', { transaction });
  });
}

/**
 * Connects (once per process), migrates, empties every table and builds an app. The outbox worker
 * is not started and the logger is silent. `overrides` change settings for this app only, e.g.
 * `{ RW_SIGNIN_MAX_PER_ADDRESS: '5' }`; database settings come from the first call. `options.clock`
 * (e.g. createTestClock()) is the time every service of this app reads. Close the
 * last app built in the file (e.g. in `after`), or the open connection keeps the process alive.
 */
export async function setupTestApp(overrides: ConfigOverrides = {}, options: { clock?: Clock } = {}): Promise<TestApp> {
  const config = testConfig(overrides);
  shared ??= (async () => {
    const lock = await ensureDatabaseAndLock(config);
    const sequelize = createSequelize(config);
    initModels(sequelize);
    await migrateUp(sequelize);
    return { sequelize, config, lock };
  })();
  const { sequelize, lock } = await shared;
  await truncateAll(sequelize);
  const logger = createLogger('silent');
  const clock = options.clock ?? systemClock;
  const app = createApp({ config, sequelize, logger, clock });
  // Each call empties the tables, so only the latest app is meaningful: closing it closes the
  // shared connection (closing an older one is a no-op), so a file that builds several apps and
  // closes just the last one still exits.
  const appNumber = ++latestApp;
  let closed = false;
  return {
    app,
    sequelize,
    config,
    logger,
    clock,
    async close() {
      if (closed) return;
      closed = true;
      if (appNumber === latestApp && shared) {
        shared = undefined;
        await sequelize.close();
        await lock.end(); // releases the named lock
      }
    },
  };
}

/** Names the club in the settings row (mail text, mail sender, password policy); the row is created if truncated. */
export async function setClubName(sequelize: Sequelize, name: string): Promise<void> {
  await sequelize.query('INSERT INTO club_settings (id, club_name) VALUES (1, :name) ON DUPLICATE KEY UPDATE club_name = VALUES(club_name)', {
    replacements: { name },
  });
}

export interface NewTestUser {
  email: string;
  password: string;
  roles: Role[];
  displayName?: string;
  callSign?: string | null;
  disabled?: boolean;
  /** argon2 costs for this hash (default the floor: m=19456, t=2, p=1). */
  argon2?: { memoryCost: number; timeCost: number; parallelism: number };
}

/** Inserts an account directly (no password policy: tests choose their own passwords). */
export async function createUser(_sequelize: Sequelize, u: NewTestUser): Promise<User> {
  const passwordHash = await hashPassword(u.password, u.argon2 ?? { memoryCost: 19456, timeCost: 2, parallelism: 1 });
  const user = await User.create({
    email: u.email.toLowerCase(),
    displayName: u.displayName ?? u.email.split('@')[0]!,
    callSign: u.callSign ?? null,
    passwordHash,
    disabled: u.disabled ?? false,
  });
  await UserRole.bulkCreate(u.roles.map((role) => ({ userId: user.id, role })));
  return user;
}

type Agent = ReturnType<typeof supertest.agent>;

/** A cookie-keeping client that echoes XSRF-TOKEN as X-XSRF-TOKEN on every mutating request. */
export interface TestClient {
  agent: Agent;
  get(url: string): Test;
  post(url: string, body?: unknown): Test;
  put(url: string, body?: unknown): Test;
  patch(url: string, body?: unknown): Test;
  delete(url: string, body?: unknown): Test;
  /** The current value of a cookie in this client's jar (HttpOnly ones included). */
  cookie(name: string): string | undefined;
  /** Replaces a cookie's value in the jar (e.g. to replay an old session token). */
  setCookie(name: string, value: string): void;
}

interface CookieJarLike {
  getCookie(name: string, access: object): { value: string } | undefined;
  setCookie(cookie: string, domain?: string, path?: string): void;
}

function makeClient(agent: Agent, host = '127.0.0.1'): TestClient {
  const jar = (agent as unknown as { jar: CookieJarLike }).jar;
  const access = { domain: host, path: '/', secure: true, script: false };
  const cookie = (name: string) => jar.getCookie(name, access)?.value;
  const withToken = (test: Test, body?: unknown) => {
    const token = cookie('XSRF-TOKEN');
    if (token) test.set('X-XSRF-TOKEN', token);
    return body === undefined ? test : test.send(body as object);
  };
  return {
    agent,
    get: (url) => agent.get(url),
    post: (url, body) => withToken(agent.post(url), body),
    put: (url, body) => withToken(agent.put(url), body),
    patch: (url, body) => withToken(agent.patch(url), body),
    delete: (url, body) => withToken(agent.delete(url), body),
    cookie,
    setCookie: (name, value) => jar.setCookie(`${name}=${value}; Path=/`, host, '/'),
  };
}

/** A signed-out client that has fetched its anti-forgery cookie. */
export async function anonymous(app: Express): Promise<TestClient> {
  const client = makeClient(supertest.agent(app));
  const res = await client.get('/api/auth/session');
  if (res.status !== 200) throw new Error(`GET /api/auth/session answered ${res.status}: ${res.text}`);
  return client;
}

/** A signed-in client; throws with the server's answer when sign-in fails. */
export async function signIn(app: Express, email: string, password: string): Promise<TestClient> {
  const client = await anonymous(app);
  const res = await client.post('/api/auth/sign-in', { email, password });
  if (res.status !== 200) throw new Error(`Sign-in as ${email} answered ${res.status}: ${res.text}`);
  return client;
}

/** Row count of every table (throttle counters and migration bookkeeping left out). */
export async function tableCounts(sequelize: Sequelize): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const t of await listTables(sequelize)) {
    if (VOLATILE.has(t)) continue;
    const [row] = await sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM \`${t}\``, { type: QueryTypes.SELECT });
    out[t] = Number(row!.n);
  }
  return out;
}

/** Row count and content checksum (MariaDB CHECKSUM TABLE) of every table: catches updates too. */
export async function tableSnapshot(sequelize: Sequelize): Promise<Record<string, string>> {
  const counts = await tableCounts(sequelize);
  const out: Record<string, string> = {};
  for (const [t, n] of Object.entries(counts)) {
    const [row] = await sequelize.query<{ Checksum: number | string | null }>(`CHECKSUM TABLE \`${t}\``, { type: QueryTypes.SELECT });
    out[t] = `${n} rows, checksum ${row?.Checksum}`;
  }
  return out;
}

export interface RegisteredRoute {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** Express path pattern, e.g. '/api/users/:id'. */
  path: string;
}

/**
 * Every route registered on the app, found by walking its router stacks (Express 5 / router 2:
 * a mounted router's layer keeps its mount path in `rawPath`). Used by sweeps that must cover
 * routes added later.
 */
export function registeredRoutes(app: Express): RegisteredRoute[] {
  type Layer = { rawPath?: unknown; route?: { path: unknown; methods: Record<string, boolean> }; handle?: { stack?: Layer[] } };
  const out: RegisteredRoute[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
        for (const p of paths) {
          if (typeof p !== 'string') continue;
          for (const [m, on] of Object.entries(layer.route.methods)) {
            const method = m.toUpperCase();
            if (on && ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'].includes(method)) {
              out.push({ method: method as RegisteredRoute['method'], path: joinPath(prefix, p) });
            }
          }
        }
      } else if (layer.handle?.stack) {
        const mount = typeof layer.rawPath === 'string' ? layer.rawPath : '';
        walk(layer.handle.stack, joinPath(prefix, mount));
      }
    }
  };
  const router = (app as unknown as { router: { stack: Layer[] } }).router;
  walk(router.stack, '');
  const seen = new Set<string>();
  return out.filter((r) => {
    const key = `${r.method} ${r.path}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

function joinPath(a: string, b: string): string {
  const joined = `${a.replace(/\/$/, '')}/${b.replace(/^\//, '')}`;
  return joined.length > 1 ? joined.replace(/\/$/, '') : joined;
}

/** A concrete URL for a route pattern: every `:param` becomes `value`, `*splat` becomes 'x'. */
export function concretePath(pattern: string, value = '1'): string {
  return pattern.replace(/:[A-Za-z_][A-Za-z0-9_]*/g, value).replace(/\*[A-Za-z_]+/g, 'x').replace(/[{}]/g, '');
}
