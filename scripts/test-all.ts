// The test command (npm test): client unit tests (Vitest through ng test), domain and API tests
// (node's runner against a real MariaDB, database rigwright_test), and browser tests (Playwright in
// Debian's Chromium against the built client and a running API, database rigwright_e2e).
// Ends with one line "N passed, N failed" that adds up every suite, for CI.
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { readFileSync, readdirSync, existsSync, mkdirSync, rmSync } from 'node:fs';
import path from 'node:path';
import { ensureDatabase, ensureLocalMariaDb } from '../db/local-mariadb';
import { ensureDebianPackages } from '../db/debian-packages';
import { ROOT, buildClientIfStale, runTs, startApi, startMaildev, startPaymentsFake, type Service } from './services';

interface SuiteResult {
  name: string;
  passed: number;
  failed: number;
  skipped: number;
}

const only = new Set(process.argv.slice(2)); // e.g. `npm test -- api` runs one suite
const wants = (suite: string) => only.size === 0 || only.has(suite);
const DB_PORT = process.env.RW_DB_PORT ?? '3407';
// Ports of the browser suite's own API and mail catcher; set them to run two checkouts side by side.
const E2E_PORT = process.env.RW_E2E_PORT ?? '4320';
const E2E_SMTP_PORT = process.env.RW_E2E_SMTP_PORT ?? '1225';
const E2E_MAIL_WEB_PORT = process.env.RW_E2E_MAIL_WEB_PORT ?? '1280';
// The browser suite's own payments fake (the SDK of its API points there).
const E2E_PAY_PORT = process.env.RW_E2E_PAY_PORT ?? '4311';
const started: Service[] = [];
const results: SuiteResult[] = [];

/** Runs a command, echoing its output, and returns what it printed. */
function run(cmd: string, args: string[], env: Record<string, string> = {}): Promise<{ code: number; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout.on('data', (d: Buffer) => {
      output += d.toString();
      process.stdout.write(d);
    });
    child.stderr.on('data', (d: Buffer) => {
      output += d.toString();
      process.stderr.write(d);
    });
    child.on('close', (code) => resolve({ code: code ?? 1, output }));
  });
}

// eslint-disable-next-line no-control-regex
const stripAnsi = (s: string) => s.replace(/\x1b\[[0-9;]*m/g, '');

function findFiles(dir: string, suffix: string): string[] {
  if (!existsSync(dir)) return [];
  const out: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory() && entry.name !== 'node_modules') out.push(...findFiles(full, suffix));
    else if (entry.name.endsWith(suffix)) out.push(path.relative(ROOT, full));
  }
  return out.sort();
}

/** A suite that printed no counts but failed still counts as one failure. */
function record(name: string, code: number, passed: number, failed: number, skipped = 0) {
  if (code !== 0 && failed === 0) failed = 1;
  if (code === 0 && passed + failed === 0) {
    console.error(`${name}: ran no test.`);
    failed = 1;
  }
  results.push({ name, passed, failed, skipped });
}

async function clientUnitTests() {
  const ng = path.join(ROOT, 'node_modules', '@angular', 'cli', 'bin', 'ng.js');
  const { code, output } = await run(process.execPath, [ng, 'test', '--watch=false'], { NG_CLI_ANALYTICS: 'false', CI: 'true' });
  const text = stripAnsi(output);
  const line = text.split('\n').reverse().find((l) => /^\s*Tests\s+/.test(l)) ?? '';
  const num = (re: RegExp) => Number(re.exec(line)?.[1] ?? 0);
  record('client unit (vitest)', code, num(/(\d+) passed/), num(/(\d+) failed/), num(/(\d+) skipped/));
}

async function apiTests() {
  const files = ['api', 'db', 'scripts', 'payments-fake'].flatMap((dir) => findFiles(path.join(ROOT, dir), '.test.ts'));
  const { code, output } = await run(
    process.execPath,
    ['--import', 'tsx', '--test', '--test-concurrency=1', '--test-reporter=spec', ...files],
    { RW_DB_NAME: 'rigwright_test', RW_DB_PORT: DB_PORT, NODE_ENV: 'test' },
  );
  const text = stripAnsi(output);
  const last = (label: string) => {
    const matches = [...text.matchAll(new RegExp(`^\\S*\\s*${label} (\\d+)$`, 'gm'))];
    return Number(matches.at(-1)?.[1] ?? 0);
  };
  record('domain and API (node:test)', code, last('pass'), last('fail') + last('cancelled'), last('skipped') + last('todo'));
}

/** The TypeScript projects of the repository, each type-checked on its own. */
const TYPE_PROJECTS: { name: string; args: string[] }[] = [
  { name: 'api, db, e2e, scripts, bench', args: ['node_modules/typescript/bin/tsc', '-p', 'tsconfig.json'] },
  // ngc checks the client's templates too (strictTemplates), which plain tsc cannot.
  { name: 'client', args: ['node_modules/@angular/compiler-cli/bundles/src/bin/ngc.js', '-p', 'client/tsconfig.app.json', '--noEmit'] },
  { name: 'client specs', args: ['node_modules/typescript/bin/tsc', '-p', 'client/tsconfig.spec.json', '--noEmit'] },
];

/** Type checks (one check per project) and ESLint (one check per file linted). */
async function staticChecks() {
  let passed = 0;
  let failed = 0;
  for (const project of TYPE_PROJECTS) {
    console.log(`Type-checking ${project.name} ...`);
    const { code } = await run(process.execPath, project.args);
    if (code === 0) passed++;
    else failed++;
  }
  record('type checks (tsc, ngc)', failed ? 1 : 0, passed, failed);

  console.log('Linting (ESLint) ...');
  const report = path.join(ROOT, 'test-results', 'eslint.json');
  mkdirSync(path.dirname(report), { recursive: true });
  rmSync(report, { force: true });
  const eslint = path.join(ROOT, 'node_modules', 'eslint', 'bin', 'eslint.js');
  const { code } = await run(process.execPath, [eslint, '.', '--format', 'json', '--output-file', report]);
  let lintPassed = 0, lintFailed = 0;
  if (existsSync(report)) {
    const files = JSON.parse(readFileSync(report, 'utf8')) as { filePath: string; errorCount: number; messages: { line: number; ruleId: string | null; message: string }[] }[];
    for (const f of files) {
      if (f.errorCount === 0) lintPassed++;
      else {
        lintFailed++;
        for (const m of f.messages) console.error(`${path.relative(ROOT, f.filePath)}:${m.line}  ${m.message}  (${m.ruleId ?? 'parse'})`);
      }
    }
  }
  record('lint (eslint)', code, lintPassed, lintFailed);
}

async function browserTests() {
  buildClientIfStale();
  const env = {
    NODE_ENV: 'test',
    RW_DB_PORT: DB_PORT,
    RW_DB_NAME: 'rigwright_e2e',
    RW_PORT: E2E_PORT,
    RW_PUBLIC_URL: `http://127.0.0.1:${E2E_PORT}`,
    RW_SMTP_PORT: E2E_SMTP_PORT,
    RW_OUTBOX_INTERVAL_MS: '300',
    RW_LOG_LEVEL: 'warn',
    // A fresh random session secret for this run (never the repository's development default).
    RW_JWT_SECRET: randomBytes(48).toString('base64url'),
    RW_STRIPE_HOST: '127.0.0.1',
    RW_STRIPE_PORT: E2E_PAY_PORT,
    RW_STRIPE_PROTOCOL: 'http',
  };
  runTs('db/migrate.ts', ['up'], env);
  runTs('db/seed.ts', [], env);
  started.push(await startMaildev(Number(E2E_SMTP_PORT), Number(E2E_MAIL_WEB_PORT), { quiet: true }));
  started.push(await startPaymentsFake(Number(E2E_PAY_PORT), `http://127.0.0.1:${E2E_PORT}/api/payments/webhook`, { RW_PAY_RETRY_BASE_MS: '300' }, { quiet: true }));
  started.push(await startApi(env, { quiet: true }));
  const report = path.join(ROOT, 'test-results', 'e2e-report.json');
  rmSync(report, { force: true });
  const pw = path.join(ROOT, 'node_modules', '@playwright', 'test', 'cli.js');
  const { code } = await run(process.execPath, [pw, 'test', '--config', 'e2e/playwright.config.ts'], {
    RW_E2E_URL: `http://127.0.0.1:${E2E_PORT}`,
    RW_E2E_MAIL_URL: `http://127.0.0.1:${E2E_MAIL_WEB_PORT}`,
    RW_E2E_PAY_URL: `http://127.0.0.1:${E2E_PAY_PORT}`,
    PLAYWRIGHT_JSON_OUTPUT_NAME: report,
  });
  let passed = 0, failed = 0, skipped = 0;
  if (existsSync(report)) {
    const stats = JSON.parse(readFileSync(report, 'utf8')).stats ?? {};
    passed = (stats.expected ?? 0) + (stats.flaky ?? 0);
    failed = stats.unexpected ?? 0;
    skipped = stats.skipped ?? 0;
  }
  record('browser (playwright)', code, passed, failed, skipped);
}

async function main() {
  // Everything the suites need from Debian, before any suite runs (installed when root).
  ensureDebianPackages([
    { pkg: 'mariadb-server', binary: 'mariadbd' },
    // lrzsz's sx/rx: the independent XMODEM peer of the engines' interoperability tests.
    ...(wants('api') ? [{ pkg: 'lrzsz', binary: 'sx' }] : []),
    ...(wants('e2e') ? [{ pkg: 'chromium', binary: 'chromium' }] : []),
  ]);
  const db = await ensureLocalMariaDb({ dir: path.join(ROOT, '.local', 'mariadb'), port: Number(DB_PORT), log: () => {} });
  started.push({ name: 'mariadb', startedHere: db.startedHere, stop: db.stop });
  // Fresh databases for the tests, never the demo data.
  ensureDatabase(db, 'rigwright_test', { drop: true });
  ensureDatabase(db, 'rigwright_e2e', { drop: true });
  runTs('db/migrate.ts', ['up'], { RW_DB_NAME: 'rigwright_test', RW_DB_PORT: DB_PORT });

  if (wants('static')) await staticChecks();
  if (wants('client')) await clientUnitTests();
  if (wants('api')) await apiTests();
  if (wants('e2e')) await browserTests();
}

let exitCode = 0;
try {
  await main();
} catch (err) {
  console.error(`\nThe test command could not finish: ${(err as Error).message}`);
  results.push({ name: 'set-up', passed: 0, failed: 1, skipped: 0 });
} finally {
  for (const service of started.reverse()) await service.stop().catch(() => {});
}
console.log('\nSuites:');
for (const r of results) console.log(`  ${r.name}: ${r.passed} passed, ${r.failed} failed${r.skipped ? `, ${r.skipped} skipped` : ''}`);
const passed = results.reduce((n, r) => n + r.passed, 0);
const failed = results.reduce((n, r) => n + r.failed, 0);
if (failed > 0) exitCode = 1;
console.log(`${passed} passed, ${failed} failed`);
process.exit(exitCode);
