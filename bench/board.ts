// Benchmark: the Bench board read (GET /api/board, as the board page calls it, 500 open tickets)
// against a bare Express route serving the same JSON from memory, side by side in one run.
// Servers run in child processes; autocannon drives them from this process on loopback.
// Aim (issue "Foundation"): board read at 0.5 or more of the bare route's req/s.
import autocannon from 'autocannon';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { ensureDatabase, ensureLocalMariaDb } from '../db/local-mariadb';
import { ROOT, runTs, waitFor } from '../scripts/services';

const TICKETS = Number(process.env.BENCH_TICKETS ?? 500);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 50);
const API_PORT = 4330;
const BARE_PORT = 4331;
const env = {
  RW_DB_NAME: 'rigwright_bench',
  RW_DB_PORT: process.env.RW_DB_PORT ?? '3407',
  RW_PORT: String(API_PORT),
  RW_OUTBOX_INTERVAL_MS: '0',
  RW_LOG_LEVEL: 'silent',
  RW_CLIENT_DIST: '',
  // The benchmark signs in once; keep the throttle out of the way.
  NODE_ENV: 'production',
};

const children: ChildProcess[] = [];
function child(args: string[]) {
  const c = spawn(process.execPath, ['--import', 'tsx', ...args], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'ignore', 'inherit'] });
  children.push(c);
  return c;
}

async function measure(title: string, url: string, headers: Record<string, string>, duration = SECONDS) {
  const result = await autocannon({ url, connections: CONNECTIONS, duration, headers });
  if (result.non2xx > 0 || result.errors > 0) throw new Error(`${title}: ${result.non2xx} non-2xx answers, ${result.errors} errors`);
  return { title, rps: result.requests.average, p99: result.latency.p99, bytes: result.throughput.average };
}

const db = await ensureLocalMariaDb({ dir: path.join(ROOT, '.local', 'mariadb'), port: Number(env.RW_DB_PORT), log: () => {} });
try {
  ensureDatabase(db, 'rigwright_bench', { drop: true });
  runTs('db/migrate.ts', ['up'], env);
  runTs('db/seed.ts', ['--board-load', String(TICKETS)], env);

  const api = child(['api/src/index.ts']);
  await waitFor(`http://127.0.0.1:${API_PORT}/api/auth/session`, 'the API', api);

  // Sign in as the demo technician, as the board page would.
  const session = await fetch(`http://127.0.0.1:${API_PORT}/api/auth/session`);
  const xsrf = /XSRF-TOKEN=([^;]+)/.exec(session.headers.getSetCookie().join('; '))?.[1] ?? '';
  const signIn = await fetch(`http://127.0.0.1:${API_PORT}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-xsrf-token': xsrf, cookie: `XSRF-TOKEN=${xsrf}` },
    body: JSON.stringify({ email: 'tech@kestrelfen.example', password: 'bench-demo-tech' }),
  });
  if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status} ${await signIn.text()}`);
  const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const boardRes = await fetch(`http://127.0.0.1:${API_PORT}/api/board`, { headers: { cookie } });
  const boardJson = await boardRes.text();
  const board = JSON.parse(boardJson);
  console.log(`board read: ${board.cards.length} cards, ${(boardJson.length / 1024).toFixed(1)} KiB of JSON`);

  mkdirSync(path.join(ROOT, 'bench', 'results'), { recursive: true });
  const file = path.join(ROOT, 'bench', 'results', 'board.json');
  writeFileSync(file, boardJson);
  const bare = child(['bench/bare-server.ts', file, String(BARE_PORT)]);
  await waitFor(`http://127.0.0.1:${BARE_PORT}/api/board`, 'the bare route', bare);

  // Warm both, then measure side by side.
  await measure('warm-up board', `http://127.0.0.1:${API_PORT}/api/board`, { cookie }, 3);
  await measure('warm-up bare', `http://127.0.0.1:${BARE_PORT}/api/board`, {}, 3);
  const bareResult = await measure('bare Express route, JSON from memory', `http://127.0.0.1:${BARE_PORT}/api/board`, {});
  const boardResult = await measure('GET /api/board (signed in, 500 open tickets)', `http://127.0.0.1:${API_PORT}/api/board`, { cookie });

  console.log(`\n${CONNECTIONS} connections, ${SECONDS} s each, loopback\n`);
  for (const r of [bareResult, boardResult]) {
    console.log(`${r.title.padEnd(48)} ${r.rps.toFixed(0).padStart(6)} req/s   p99 ${String(r.p99).padStart(4)} ms`);
  }
  const ratio = boardResult.rps / bareResult.rps;
  console.log(`\nratio board/bare: ${ratio.toFixed(2)} (aim: 0.50 or more)`);
} finally {
  for (const c of children) c.kill('SIGTERM');
  await db.stop();
}
