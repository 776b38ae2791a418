// The Flasher's run against the practice unit on the page's thread, with fake timers: a whole
// reflash, a power dip the technician cancels, and a unit that never enters its loader.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { crc16XmodemUpdate } from '@domain/crc16-xmodem';
import { seededRandom, type PracticeFaults } from '@domain/practice-unit';
import { FlashRun } from './flash-run';
import { openPracticeLinkInThread } from './practice-link';
import type { SessionClock } from './practice-session';
import type { SerialLink } from './serial-link';

const image = (n: number) => Uint8Array.from({ length: n }, (_, i) => (i * 13 + 5) & 0xff);
const clock: SessionClock = {
  now: () => Date.now(),
  setTimeout: (fn, ms) => setTimeout(fn, ms),
  clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>),
};

function practice(img: Uint8Array, faults: PracticeFaults = {}, hostBaud = 115200) {
  const link = openPracticeLinkInThread(
    { hostBaud, unitBaud: 115200, unit: { expected: { length: img.length, crc16: crc16XmodemUpdate(img), version: '3.02' }, installedVersion: '3.01', faults, random: seededRandom(9) } },
    clock,
  );
  let screen = '';
  link.onData = (b) => (screen += new TextDecoder().decode(b));
  const type = async (keys: string, waitMs = 50) => {
    await link.write(new TextEncoder().encode(keys));
    await vi.advanceTimersByTimeAsync(waitMs);
  };
  return { link, screen: () => screen, type };
}

async function untilEnded(run: FlashRun, maxMs = 200_000) {
  for (let t = 0; t < maxMs && !run.progress().outcome; t += 500) await vi.advanceTimersByTimeAsync(500);
  return run.progress().outcome;
}

function startRun(link: SerialLink, img: Uint8Array) {
  const run = new FlashRun(link, img, { block: 1024, baud: 115200, now: () => Date.now() });
  link.onData = (b) => run.receive(b);
  return run;
}

describe('FlashRun against the practice unit', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  it('flashes the whole image at the line rate and records the run as completed', async () => {
    const img = image(6 * 1024 + 100);
    const p = practice(img);
    await vi.advanceTimersByTimeAsync(100);
    expect(p.screen()).toContain('SIMULATED display unit');
    await p.type(' ');
    await p.type('e', 2000);
    await p.type('r');
    expect(p.screen()).toContain('Ready to receive the image by XMODEM');
    const run = startRun(p.link, img);
    const outcome = await untilEnded(run);
    expect(outcome?.kind).toBe('transfer_completed');
    expect(run.progress().acknowledged).toBe(7);
    expect(run.progress().retries).toEqual([]);
    expect(run.progress().unitTalkedMidTransfer).toBe(false);
    // 7 blocks of 1029 bytes and the EOT at 115200 baud take at least 7204 × 10 / 115200 s ≈ 0.63 s of line time.
    expect(run.progress().elapsedMs).toBeGreaterThanOrEqual(625);
    expect(run.log.join('')).toContain('Transfer complete: 7 blocks, 0 retries.');
  });

  it('a power dip at block 3: the restart shows in the log, the technician cancels, and the run is failed at block 3', async () => {
    const img = image(8 * 1024);
    const p = practice(img, { powerDipAtBlock: 3 });
    await vi.advanceTimersByTimeAsync(100);
    await p.type(' ');
    await p.type('e', 2000);
    await p.type('r');
    const run = startRun(p.link, img);
    for (let t = 0; t < 30_000 && !run.log.join('').includes('SIMULATED display unit'); t += 100) await vi.advanceTimersByTimeAsync(100);
    expect(run.log.join('')).toContain('SIMULATED display unit');
    expect(run.progress().unitTalkedMidTransfer).toBe(true);
    run.cancel('The unit restarted during the transfer.');
    const outcome = await untilEnded(run);
    expect(outcome).toEqual({ kind: 'transfer_failed', block: 3, reason: 'The unit restarted during the transfer.' });
  });

  it('a unit that never asks for the image ends as "bootloader not entered" after the one-minute wait', async () => {
    const img = image(1000);
    const p = practice(img, { missBootWindow: true });
    await vi.advanceTimersByTimeAsync(3000); // it boots its old firmware instead
    const run = startRun(p.link, img);
    const outcome = await untilEnded(run, 70_000);
    expect(outcome?.kind).toBe('bootloader_not_entered');
    expect(outcome?.reason).toMatch(/did not ask for the image within 60 s/);
  });

  it('line noise: completes and lists each retry with its reason', async () => {
    const img = image(20 * 1024);
    const p = practice(img, { bitErrorRate: 3e-5 });
    await vi.advanceTimersByTimeAsync(100);
    await p.type(' ');
    await p.type('e', 2000);
    await p.type('r');
    const run = startRun(p.link, img);
    const outcome = await untilEnded(run);
    expect(outcome?.kind).toBe('transfer_completed');
    expect(run.progress().retries.length).toBeGreaterThan(0);
    expect(run.progress().retries[0].text).toMatch(/refused|no answer/);
  });
});
