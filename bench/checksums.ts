// Throughput of the firmware-image checksums (api/src/domain/checksums.ts) on this machine.
// Run: node --import tsx bench/checksums.ts [rounds]
// A 16 MiB random buffer; each candidate runs once per round, rounds interleaved so that drift
// hits all alike; the median MB/s (1 MB = 10^6 bytes) of the rounds is printed. "All three" is fed
// in 64 KiB chunks as a streamed upload would be, and compared with Node's native SHA-256 alone on
// the same buffer in the same chunks (and one-shot), and the CRCs with the `crc` package's. The
// machine is shared, so the load average is printed beside the figures.
import { availableParallelism, loadavg } from 'node:os';
import { createHash, randomBytes } from 'node:crypto';
import { crc32 as zlibCrc32 } from 'node:zlib';
import crcPkg16 from 'crc/crc16xmodem';
import crcPkg32 from 'crc/crc32';
import { createImageChecksums, crc16XmodemUpdate, crc32Update } from '../api/src/domain/checksums';

const SIZE = 16 * 1024 * 1024;
const CHUNK = 64 * 1024;
const ROUNDS = Number(process.argv[2] ?? 9);
const buf = randomBytes(SIZE);
const cpus = availableParallelism();

function chunks(fn: (chunk: Buffer) => void) {
  for (let at = 0; at < SIZE; at += CHUNK) fn(buf.subarray(at, at + CHUNK));
}

const candidates: Record<string, () => unknown> = {
  'SHA-256 alone (node:crypto), 64 KiB chunks': () => {
    const h = createHash('sha256');
    chunks((c) => h.update(c));
    return h.digest('hex');
  },
  'SHA-256 alone (node:crypto), one shot': () => createHash('sha256').update(buf).digest('hex'),
  'CRC-32 zlib.crc32 (used)': () => zlibCrc32(buf),
  'CRC-32 via crc32Update, 64 KiB chunks': () => {
    let c = 0;
    chunks((x) => (c = crc32Update(x, c)));
    return c;
  },
  'CRC-32 `crc` package 4.3.2 (not used)': () => crcPkg32(buf),
  'CRC-16/XMODEM slice-by-16 (used)': () => crc16XmodemUpdate(buf),
  'CRC-16/XMODEM `crc` package 4.3.2 (not used)': () => crcPkg16(buf),
  'all three in one pass, 64 KiB chunks': () => {
    const c = createImageChecksums();
    chunks((x) => c.update(x));
    return c.digest();
  },
};

function main() {
  const load0 = loadavg()[0];
  const times: Record<string, number[]> = Object.fromEntries(Object.keys(candidates).map((k) => [k, []]));
  for (const fn of Object.values(candidates)) fn(); // warm-up
  for (let r = 0; r < ROUNDS; r++) {
    for (const [name, fn] of Object.entries(candidates)) {
      const t0 = process.hrtime.bigint();
      fn();
      times[name].push(Number(process.hrtime.bigint() - t0) / 1e9);
    }
  }
  report(times, load0);
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
function report(times: Record<string, number[]>, load0: number) {
  const mbps: Record<string, number> = {};
  console.log(`checksums over ${SIZE / 1048576} MiB random bytes, median of ${ROUNDS} rounds (Node ${process.version})`);
  for (const name of Object.keys(candidates)) {
    mbps[name] = SIZE / 1e6 / median(times[name]);
    console.log(`${name.padEnd(48)} ${mbps[name].toFixed(0).padStart(6)} MB/s`);
  }
  const sha = mbps['SHA-256 alone (node:crypto), 64 KiB chunks'];
  const ratio = mbps['all three in one pass, 64 KiB chunks'] / sha;
  console.log(`ratio all three / SHA-256 alone (both in 64 KiB chunks): ${ratio.toFixed(2)} (aim ≥ 0.5)`);
  const handVsPkg = mbps['CRC-16/XMODEM slice-by-16 (used)'] / mbps['CRC-16/XMODEM `crc` package 4.3.2 (not used)'];
  console.log(`CRC-16/XMODEM slice-by-16 / crc package: ${handVsPkg.toFixed(1)}x`);
  console.log(`load average (1 min) at start ${load0.toFixed(2)}, at end ${loadavg()[0].toFixed(2)}, on ${cpus} CPUs`);
}

main();
