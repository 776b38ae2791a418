// Benchmark: the whole firmware upload path (HTTP multipart to POST /api/firmware, the three
// checksums as the bytes stream, the write to storage with fsync and the row) for a 16 MiB image,
// side by side with writing the same bytes to the same disk (64 KiB chunks, fsync), in one run.
// Rounds are interleaved so that drift on this shared machine hits both alike; medians printed.
// The API runs in a child process; its resident memory is sampled from /proc every 5 ms during
// each upload (no forced garbage collection), and the peak growth over its size just before the
// upload is printed. Aim (issue 8): upload at 0.5 or more of the plain write's MB/s.
//   node --import tsx bench/upload.ts [rounds]        (RW_DB_PORT, RW_BENCH_API_PORT)
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { createWriteStream, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { open } from 'node:fs/promises';
import http from 'node:http';
import { loadavg } from 'node:os';
import path from 'node:path';
import { ensureDatabase, ensureLocalMariaDb } from '../db/local-mariadb';
import { ROOT, runTs, waitFor } from '../scripts/services';

const SIZE = 16 * 1024 * 1024;
const CHUNK = 64 * 1024;
const ROUNDS = Number(process.argv[2] ?? 5);
const API_PORT = Number(process.env.RW_BENCH_API_PORT ?? 4322);
const env = {
  RW_DB_NAME: 'rigwright_bench_upload',
  RW_DB_PORT: process.env.RW_DB_PORT ?? '3407',
  RW_PORT: String(API_PORT),
  RW_OUTBOX_INTERVAL_MS: '0',
  RW_LOG_LEVEL: 'silent',
  RW_CLIENT_DIST: '',
  NODE_ENV: 'production',
};
const storageRoot = path.join(ROOT, '.local', 'storage', env.RW_DB_NAME);

let api: ChildProcess | undefined;
const mb = (bytes: number, ms: number) => bytes / 1e6 / (ms / 1000);
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
function rssOf(pid: number): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) * 1024 : 0;
}

async function upload(cookie: string, xsrf: string, bytes: Buffer, round: number): Promise<{ ms: number; peakGrowth: number }> {
  const boundary = `----rwbench${round}`;
  const head = Buffer.from(
    [['model', 'Bench upload transceiver'], ['unit', 'main_board'], ['version', `r${round}`]]
      .map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`)
      .join('') + `--${boundary}\r\nContent-Disposition: form-data; name="image"; filename="bench.bin"\r\nContent-Type: application/octet-stream\r\n\r\n`,
  );
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  const pid = api!.pid!;
  const base = rssOf(pid);
  let peak = base;
  const sampler = setInterval(() => (peak = Math.max(peak, rssOf(pid))), 5);
  const start = performance.now();
  await new Promise<void>((resolve, reject) => {
    const req = http.request(
      {
        host: '127.0.0.1', port: API_PORT, method: 'POST', path: '/api/firmware',
        headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(head.length + SIZE + tail.length), cookie, 'x-xsrf-token': xsrf },
      },
      (res) => {
        let text = '';
        res.on('data', (d) => (text += d));
        res.on('end', () => (res.statusCode === 201 ? resolve() : reject(new Error(`upload answered ${res.statusCode}: ${text}`))));
      },
    );
    req.on('error', reject);
    req.write(head);
    let at = 0;
    const pump = () => {
      while (at < SIZE) {
        const chunk = bytes.subarray(at, at + CHUNK);
        at += CHUNK;
        if (!req.write(chunk)) return void req.once('drain', pump);
      }
      req.end(tail);
    };
    pump();
  });
  const ms = performance.now() - start;
  clearInterval(sampler);
  return { ms, peakGrowth: Math.max(peak, rssOf(pid)) - base };
}

async function plainWrite(bytes: Buffer, round: number): Promise<number> {
  const dir = path.join(storageRoot, 'bench-plain');
  mkdirSync(dir, { recursive: true });
  const file = path.join(dir, `plain-${round}.bin`);
  const start = performance.now();
  const out = createWriteStream(file);
  for (let at = 0; at < SIZE; at += CHUNK) {
    if (!out.write(bytes.subarray(at, at + CHUNK))) await new Promise<void>((r) => out.once('drain', () => r()));
  }
  await new Promise<void>((resolve, reject) => out.end((err?: Error | null) => (err ? reject(err) : resolve())));
  const fh = await open(file, 'r+');
  await fh.sync();
  await fh.close();
  const ms = performance.now() - start;
  rmSync(file);
  return ms;
}

const db = await ensureLocalMariaDb({ dir: path.join(ROOT, '.local', 'mariadb'), port: Number(env.RW_DB_PORT), log: () => {} });
try {
  ensureDatabase(db, env.RW_DB_NAME, { drop: true });
  rmSync(storageRoot, { recursive: true, force: true });
  runTs('db/migrate.ts', ['up'], env);
  runTs('db/seed.ts', ['--board-load', '0'], env);
  api = spawn(process.execPath, ['--import', 'tsx', 'api/src/index.ts'], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'ignore', 'inherit'] });
  await waitFor(`http://127.0.0.1:${API_PORT}/api/auth/session`, 'the API', api);

  const session = await fetch(`http://127.0.0.1:${API_PORT}/api/auth/session`);
  const anonXsrf = /XSRF-TOKEN=([^;]+)/.exec(session.headers.getSetCookie().join('; '))?.[1] ?? '';
  const signIn = await fetch(`http://127.0.0.1:${API_PORT}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-xsrf-token': anonXsrf, cookie: `XSRF-TOKEN=${anonXsrf}` },
    body: JSON.stringify({ email: 'tech@kestrelfen.example', password: 'bench-demo-tech' }),
  });
  if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status} ${await signIn.text()}`);
  const cookies = signIn.headers.getSetCookie().map((c) => c.split(';')[0]!);
  const cookie = cookies.join('; ');
  const xsrf = cookies.find((c) => c.startsWith('XSRF-TOKEN='))!.slice('XSRF-TOKEN='.length);

  const bytes = randomBytes(SIZE);
  // Warm-up (JIT, the storage folders, the connection pool); not counted.
  bytes.writeUInt32LE(0xffffffff, 0);
  await upload(cookie, xsrf, bytes, 0);
  await plainWrite(bytes, 0);

  const uploads: number[] = [];
  const writes: number[] = [];
  let peakGrowth = 0;
  for (let round = 1; round <= ROUNDS; round++) {
    bytes.writeUInt32LE(round, 0); // new content each round (the library refuses identical bytes)
    const w = await plainWrite(bytes, round);
    const u = await upload(cookie, xsrf, bytes, round);
    writes.push(mb(SIZE, w));
    uploads.push(mb(SIZE, u.ms));
    peakGrowth = Math.max(peakGrowth, u.peakGrowth);
  }
  const up = median(uploads);
  const wr = median(writes);
  console.log(`\n16 MiB image, ${ROUNDS} interleaved rounds (median; 1 MB = 10^6 bytes), load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}\n`);
  console.log(`plain write to the same disk (64 KiB chunks, fsync)      ${wr.toFixed(0).padStart(6)} MB/s   rounds: ${writes.map((x) => x.toFixed(0)).join(', ')}`);
  console.log(`POST /api/firmware (multipart, 3 checksums, store, row)   ${up.toFixed(0).padStart(6)} MB/s   rounds: ${uploads.map((x) => x.toFixed(0)).join(', ')}`);
  console.log(`ratio upload / plain write                                 ${(up / wr).toFixed(2)}   (aim: 0.5 or more)`);
  console.log(`peak resident memory growth of the API during an upload   ${(peakGrowth / (1024 * 1024)).toFixed(1)} MiB (no forced GC; the image is 16 MiB)`);
} finally {
  api?.kill('SIGTERM');
  rmSync(path.join(storageRoot, 'bench-plain'), { recursive: true, force: true });
}
