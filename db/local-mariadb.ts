// A private MariaDB server on 127.0.0.1 for development and tests: no systemd, no containers.
// Everything lives under one folder (default .local/mariadb, ignored by git): my.cnf, data/,
// the socket, the pid file and the error log. See docker-free-dev.md.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { ensureDebianPackages, findBinary } from './debian-packages';

export interface LocalMariaDbOptions {
  /** Folder holding my.cnf, data/, socket, pid and log. */
  dir?: string;
  port?: number;
  /** innodb_flush_log_at_trx_commit=1 when true (the app's data); tests may relax it. */
  durable?: boolean;
  log?: (line: string) => void;
}

export interface LocalMariaDb {
  port: number;
  socket: string;
  /** True when this process started the server (and so should stop it). */
  startedHere: boolean;
  stop(): Promise<void>;
}

export const APP_DB_USER = 'rigwright';
export const APP_DB_PASSWORD = 'rigwright-local';

function writeConfig(dir: string, port: number, durable: boolean): string {
  const cnf = path.join(dir, 'my.cnf');
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  const lines = [
    '[mysqld]',
    `datadir=${path.join(dir, 'data')}`,
    `socket=${path.join(dir, 'mariadb.sock')}`,
    `pid-file=${path.join(dir, 'mariadb.pid')}`,
    `log-error=${path.join(dir, 'mariadb.err')}`,
    `port=${port}`,
    'bind-address=127.0.0.1',
    'skip-name-resolve',
    'character-set-server=utf8mb4',
    'collation-server=utf8mb4_unicode_ci',
    `innodb_flush_log_at_trx_commit=${durable ? 1 : 2}`,
    'innodb_buffer_pool_size=128M',
    'max_connections=300',
    ...(isRoot ? ['user=root'] : []),
    '',
  ];
  writeFileSync(cnf, lines.join('\n'));
  return cnf;
}

function ping(socket: string): boolean {
  const admin = findBinary('mariadb-admin') ?? 'mariadb-admin';
  const r = spawnSync(admin, ['--no-defaults', `--socket=${socket}`, '-uroot', 'ping'], {
    stdio: 'ignore',
    timeout: 5000,
  });
  return r.status === 0;
}

function pidAlive(pidFile: string): number | undefined {
  if (!existsSync(pidFile)) return undefined;
  const pid = Number(readFileSync(pidFile, 'utf8').trim());
  if (!Number.isInteger(pid) || pid <= 0) return undefined;
  try {
    process.kill(pid, 0);
    return pid;
  } catch {
    return undefined;
  }
}

function sql(socket: string, statements: string): void {
  const client = findBinary('mariadb') ?? 'mariadb';
  const r = spawnSync(client, ['--no-defaults', `--socket=${socket}`, '-uroot'], {
    input: statements,
    encoding: 'utf8',
  });
  if (r.status !== 0) throw new Error(`mariadb client failed: ${r.stderr}`);
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Starts the private server, or reuses one already running from the same folder. */
export async function ensureLocalMariaDb(options: LocalMariaDbOptions = {}): Promise<LocalMariaDb> {
  const log = options.log ?? ((line: string) => console.log(line));
  const dir = path.resolve(options.dir ?? '.local/mariadb');
  const port = options.port ?? 3407;
  const socket = path.join(dir, 'mariadb.sock');
  const pidFile = path.join(dir, 'mariadb.pid');
  mkdirSync(dir, { recursive: true });

  if (pidAlive(pidFile) && ping(socket)) {
    log(`MariaDB already running on 127.0.0.1:${port} (${dir}); reusing it.`);
    return { port, socket, startedHere: false, stop: async () => {} };
  }

  ensureDebianPackages([{ pkg: 'mariadb-server', binary: 'mariadbd' }], log);
  const mariadbd = findBinary('mariadbd') as string;

  const cnf = writeConfig(dir, port, options.durable ?? true);
  if (!existsSync(path.join(dir, 'data', 'mysql'))) {
    log(`Creating MariaDB data folder in ${dir}/data ...`);
    const installDb = findBinary('mariadb-install-db');
    if (!installDb) throw new Error('mariadb-install-db not found (package mariadb-server).');
    const r = spawnSync(
      installDb,
      [`--defaults-file=${cnf}`, '--auth-root-authentication-method=normal', '--skip-test-db'],
      { encoding: 'utf8' },
    );
    if (r.status !== 0) throw new Error(`mariadb-install-db failed:\n${r.stdout}\n${r.stderr}`);
  }

  const child: ChildProcess = spawn(mariadbd, [`--defaults-file=${cnf}`], {
    stdio: 'ignore',
    detached: false,
  });
  let exited = false;
  child.on('exit', () => (exited = true));

  const deadline = Date.now() + 60_000;
  while (!ping(socket)) {
    if (exited) {
      const errLog = path.join(dir, 'mariadb.err');
      const tail = existsSync(errLog) ? readFileSync(errLog, 'utf8').split('\n').slice(-15).join('\n') : '';
      throw new Error(`mariadbd exited during start-up. Its log (${errLog}) ends:\n${tail}`);
    }
    if (Date.now() > deadline) throw new Error(`MariaDB did not answer within 60 s; see ${dir}/mariadb.err`);
    await sleep(200);
  }
  log(`MariaDB started on 127.0.0.1:${port} (data in ${dir}/data).`);

  // The app connects over TCP as its own user; root stays on the socket.
  sql(
    socket,
    `CREATE USER IF NOT EXISTS '${APP_DB_USER}'@'127.0.0.1' IDENTIFIED BY '${APP_DB_PASSWORD}';\n` +
      `GRANT ALL PRIVILEGES ON \`rigwright%\`.* TO '${APP_DB_USER}'@'127.0.0.1';\nFLUSH PRIVILEGES;\n`,
  );

  return {
    port,
    socket,
    startedHere: true,
    stop: async () => {
      if (exited) return;
      const done = new Promise<void>((resolve) => child.once('exit', () => resolve()));
      child.kill('SIGTERM');
      await Promise.race([done, sleep(20_000)]);
    },
  };
}

/** Creates a database (utf8mb4) if it does not exist. */
export function ensureDatabase(db: LocalMariaDb, name: string, { drop = false } = {}): void {
  if (!/^[a-z0-9_]+$/.test(name)) throw new Error(`Unsafe database name: ${name}`);
  sql(
    db.socket,
    `${drop ? `DROP DATABASE IF EXISTS \`${name}\`;\n` : ''}` +
      `CREATE DATABASE IF NOT EXISTS \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;\n`,
  );
}

// CLI: node --import tsx db/local-mariadb.ts start|stop
if (import.meta.url === `file://${process.argv[1]}`) {
  const command = process.argv[2] ?? 'start';
  const dir = path.resolve(process.env.RW_MARIADB_DIR ?? '.local/mariadb');
  if (command === 'stop') {
    const pid = pidAlive(path.join(dir, 'mariadb.pid'));
    if (pid) {
      process.kill(pid, 'SIGTERM');
      console.log(`Sent SIGTERM to mariadbd (pid ${pid}).`);
    } else console.log('MariaDB is not running.');
  } else {
    const db = await ensureLocalMariaDb({ dir, port: Number(process.env.RW_DB_PORT ?? 3407) });
    for (const name of ['rigwright', 'rigwright_test']) ensureDatabase(db, name);
    console.log(`Socket: ${db.socket}. Stop with: node --import tsx db/local-mariadb.ts stop`);
    if (db.startedHere) {
      // Keep running until Ctrl-C, then stop the server we started.
      const stop = async () => {
        await db.stop();
        process.exit(0);
      };
      process.on('SIGINT', stop);
      process.on('SIGTERM', stop);
      setInterval(() => {}, 1 << 30);
    }
  }
}
