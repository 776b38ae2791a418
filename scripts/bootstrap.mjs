#!/usr/bin/env node
// Plain JavaScript with no dependencies, so it runs on a fresh clone with only Node.js:
// installs the locked dependencies when they are missing or stale, then hands over to the
// TypeScript script named on the command line (start or test).
import { spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const [major, minor] = process.versions.node.split('.').map(Number);
if (major < 20 || (major === 20 && minor < 19)) {
  console.error(`Rigwright needs Node.js 20.19 or newer; this is ${process.versions.node}.`);
  process.exit(1);
}

const lock = path.join(root, 'package-lock.json');
const installed = path.join(root, 'node_modules', '.package-lock.json');
const stale = !existsSync(installed) || statSync(lock).mtimeMs > statSync(installed).mtimeMs + 1000;
if (stale) {
  console.log('Installing dependencies from package-lock.json (npm ci) ...');
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) {
    console.error('npm ci failed: see the messages above.');
    process.exit(r.status ?? 1);
  }
}

const target = process.argv[2];
const scripts = { start: 'scripts/start.ts', test: 'scripts/test-all.ts' };
if (!(target in scripts)) {
  console.error(`usage: node scripts/bootstrap.mjs ${Object.keys(scripts).join('|')} [args]`);
  process.exit(2);
}
// Ctrl-C reaches the child too (same process group); wait for it to stop what it started.
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => {});
const r = spawnSync(process.execPath, ['--import', 'tsx', scripts[target], ...process.argv.slice(3)], {
  cwd: root,
  stdio: 'inherit',
});
process.exit(r.status ?? (r.signal ? 1 : 0));
