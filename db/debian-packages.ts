// Installing what the start and test commands need from Debian's packages: when run as root the
// package is installed with apt-get; otherwise the command stops with the one command to run.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';

const SBIN_PATHS = ['/usr/sbin', '/usr/bin', '/sbin', '/bin'];

/** The full path of a program on PATH or in the usual system folders, if it is installed. */
export function findBinary(name: string): string | undefined {
  const dirs = [...(process.env.PATH ?? '').split(':'), ...SBIN_PATHS];
  for (const dir of dirs) {
    const candidate = path.join(dir, name);
    if (dir && existsSync(candidate)) return candidate;
  }
  return undefined;
}

/**
 * Makes sure each Debian package is installed, judged by a program it ships. Installs the missing
 * ones with apt-get when root; otherwise throws with the command a person should run.
 */
export function ensureDebianPackages(
  wanted: { pkg: string; binary: string }[],
  log: (line: string) => void = (line) => console.log(line),
): void {
  const missing = wanted.filter((w) => !findBinary(w.binary)).map((w) => w.pkg);
  if (missing.length === 0) return;
  const command = `apt-get update && apt-get install -y ${missing.join(' ')}`;
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!isRoot) {
    throw new Error(`Debian package(s) missing: ${missing.join(', ')}. Run as root:\n  sudo sh -c '${command}'\nthen run this command again.`);
  }
  log(`Installing Debian's ${missing.join(', ')} (${command}) ...`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [['update', '-q'], ['install', '-y', '-q', ...missing]]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env });
    if (r.status !== 0) throw new Error(`apt-get ${args.join(' ')} failed (exit ${r.status}).`);
  }
  const still = wanted.filter((w) => !findBinary(w.binary)).map((w) => w.binary);
  if (still.length) throw new Error(`Still missing after apt-get install: ${still.join(', ')}.`);
}
