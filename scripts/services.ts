// Starting and stopping the local services for the start command and the test command:
// maildev (SMTP + web inbox), the API (serving the built client), and the client build.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';

export const ROOT = path.resolve(import.meta.dirname, '..');
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

export interface Service {
  name: string;
  startedHere: boolean;
  stop(): Promise<void>;
}

/** True when the URL answers at all (any HTTP status). */
export async function answers(url: string, headers: Record<string, string> = {}): Promise<boolean> {
  try {
    await fetch(url, { headers, signal: AbortSignal.timeout(1500) });
    return true;
  } catch {
    return false;
  }
}

export async function waitFor(url: string, what: string, child?: ChildProcess, timeoutMs = 60_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await answers(url))) {
    if (child && child.exitCode !== null) throw new Error(`${what} exited during start-up (exit ${child.exitCode}).`);
    if (Date.now() > deadline) throw new Error(`${what} did not answer at ${url} within ${timeoutMs / 1000} s.`);
    await sleep(250);
  }
}

function stopChild(child: ChildProcess, name: string): () => Promise<void> {
  return async () => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    const done = new Promise<void>((resolve) => child.once('exit', () => resolve()));
    child.kill('SIGTERM');
    const stopped = await Promise.race([done.then(() => true), sleep(10_000).then(() => false)]);
    if (!stopped) {
      console.warn(`${name} did not stop within 10 s; killing it.`);
      child.kill('SIGKILL');
    }
  };
}

/** maildev: SMTP on smtpPort, web inbox and REST API on webPort, both on 127.0.0.1. */
export async function startMaildev(smtpPort: number, webPort: number, opts: { quiet?: boolean } = {}): Promise<Service> {
  const health = `http://127.0.0.1:${webPort}/api/healthz`;
  if (await answers(health)) {
    return { name: 'maildev', startedHere: false, stop: async () => {} };
  }
  const bin = path.join(ROOT, 'node_modules', 'maildev', 'dist', 'bin', 'maildev.js');
  // --ip binds only the SMTP side; the web inbox needs --web-ip, or maildev 3 listens on 0.0.0.0
  // and shows every caught mail to the whole network. Its own start-up line ("MailDev API running
  // at ...") is left out: the start command prints the inbox address itself.
  const child = spawn(
    process.execPath,
    [bin, '--ip', '127.0.0.1', '--web-ip', '127.0.0.1', '--smtp', String(smtpPort), '--web', String(webPort), '--silent'],
    { cwd: ROOT, stdio: opts.quiet ? 'ignore' : ['ignore', 'ignore', 'inherit'] },
  );
  await waitFor(health, 'maildev', child, 30_000);
  return { name: 'maildev', startedHere: true, stop: stopChild(child, 'maildev') };
}

/**
 * The address that opens maildev's inbox in a browser. maildev 3 serves its web inbox at the root
 * of its web port, but only to requests that accept text/html (as a browser's address bar does):
 * anything else there gets 404 {"error":"Not found"}, and its REST API lives under /api. Checked
 * here the way a browser asks, so the start command never prints an address that does not open.
 */
export async function mailInboxUrl(webPort: number): Promise<string> {
  const url = `http://127.0.0.1:${webPort}/`;
  try {
    const res = await fetch(url, { headers: { Accept: 'text/html,application/xhtml+xml,*/*;q=0.8' }, signal: AbortSignal.timeout(3000) });
    const html = await res.text();
    if (res.ok && /text\/html/.test(res.headers.get('content-type') ?? '') && /maildev/i.test(html)) return url;
    throw new Error(`answered ${res.status} ${res.headers.get('content-type')}`);
  } catch (err) {
    throw new Error(`The mail catcher's inbox did not open at ${url} (${(err as Error).message}). Is another program using port ${webPort}?`);
  }
}

/** The API (and the built client) as a child process, with the given environment. */
export async function startApi(env: Record<string, string>, opts: { quiet?: boolean } = {}): Promise<Service> {
  const host = env.RW_HOST ?? '127.0.0.1';
  const port = env.RW_PORT ?? '4300';
  const url = `http://${host}:${port}/api/auth/session`;
  if (await answers(url)) {
    return { name: 'api', startedHere: false, stop: async () => {} };
  }
  const child = spawn(process.execPath, ['--import', 'tsx', 'api/src/index.ts'], {
    cwd: ROOT,
    env: { ...process.env, ...env },
    stdio: opts.quiet ? ['ignore', 'ignore', 'inherit'] : ['ignore', 'inherit', 'inherit'],
  });
  // A loaded machine can take well over a minute to compile and boot the API (RW_START_TIMEOUT_MS).
  await waitFor(url, 'The API', child, Number(process.env.RW_START_TIMEOUT_MS ?? 180_000));
  return { name: 'api', startedHere: true, stop: stopChild(child, 'the API') };
}

function newestMtime(dir: string): number {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestMtime(full));
    else newest = Math.max(newest, statSync(full).mtimeMs);
  }
  return newest;
}

/**
 * The local fake of the payment provider (payments-fake/main.ts) on 127.0.0.1:`port`, sending its
 * signed webhooks to `webhookUrl`. Reused when something already answers there.
 */
export async function startPaymentsFake(port: number, webhookUrl: string, env: Record<string, string> = {}, opts: { quiet?: boolean } = {}): Promise<Service> {
  const health = `http://127.0.0.1:${port}/_fake/health`;
  if (await answers(health)) return { name: 'payments fake', startedHere: false, stop: async () => {} };
  const child = spawn(process.execPath, ['--import', 'tsx', 'payments-fake/main.ts'], {
    cwd: ROOT,
    env: { ...process.env, ...env, RW_PAY_PORT: String(port), RW_PAY_WEBHOOK_URL: webhookUrl },
    stdio: opts.quiet ? ['ignore', 'ignore', 'inherit'] : ['ignore', 'ignore', 'inherit'],
  });
  await waitFor(health, 'The payments fake', child, 30_000);
  return { name: 'payments fake', startedHere: true, stop: stopChild(child, 'the payments fake') };
}

/** Builds the client when dist/ is missing or older than its sources. */
export function buildClientIfStale(): void {
  const index = path.join(ROOT, 'dist', 'client', 'browser', 'index.html');
  const sources = Math.max(
    newestMtime(path.join(ROOT, 'client')),
    newestMtime(path.join(ROOT, 'api', 'src', 'domain')),
    statSync(path.join(ROOT, 'angular.json')).mtimeMs,
  );
  if (existsSync(index) && statSync(index).mtimeMs >= sources) return;
  console.log('Building the client (ng build, about 15 s) ...');
  const r = spawnSync(process.execPath, [path.join(ROOT, 'node_modules', '@angular', 'cli', 'bin', 'ng.js'), 'build'], {
    cwd: ROOT,
    stdio: 'inherit',
    env: { ...process.env, NG_CLI_ANALYTICS: 'false' },
  });
  if (r.status !== 0) throw new Error('The client build failed: see the messages above.');
}

/** Runs a TypeScript script of the project in a child process and waits for it. */
export function runTs(script: string, args: string[], env: Record<string, string>): void {
  const r = spawnSync(process.execPath, ['--import', 'tsx', script, ...args], {
    cwd: ROOT,
    stdio: 'inherit',
    env: { ...process.env, ...env },
  });
  if (r.status !== 0) throw new Error(`${script} ${args.join(' ')} failed (exit ${r.status}).`);
}
