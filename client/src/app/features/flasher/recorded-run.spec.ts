// A run that records itself, against the practice unit on the page's thread with fake timers: what
// a reload would find in storage mid-run, an adapter unplugged mid-run (saved as failed at that
// block with the reason), and a unit that never starts the transfer.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { crc16XmodemUpdate } from '@domain/crc16-xmodem';
import { seededRandom, type PracticeFaults } from '@domain/practice-unit';
import { planXmodemTransfer } from '@domain/xmodem';
import { attemptOf, loadPendingRun, outcomeOf } from './flasher-record';
import { openPracticeLinkInThread } from './practice-link';
import { RecordedRun, type RunContext } from './recorded-run';
import type { SessionClock } from './practice-session';
import { DEFAULT_SERIAL_SETTINGS, type SerialLink } from './serial-link';

class MemoryStorage implements Storage {
  private readonly map = new Map<string, string>();
  get length() { return this.map.size; }
  clear() { this.map.clear(); }
  getItem(k: string) { return this.map.get(k) ?? null; }
  key(i: number) { return [...this.map.keys()][i] ?? null; }
  removeItem(k: string) { this.map.delete(k); }
  setItem(k: string, v: string) { this.map.set(k, v); }
}

const image = (n: number) => Uint8Array.from({ length: n }, (_, i) => (i * 31 + 7) & 0xff);
const clock: SessionClock = { now: () => Date.now(), setTimeout: (fn, ms) => setTimeout(fn, ms), clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>) };

async function unitReadyToReceive(img: Uint8Array, faults: PracticeFaults = {}) {
  const link = openPracticeLinkInThread(
    { hostBaud: 115200, unitBaud: 115200, unit: { expected: { length: img.length, crc16: crc16XmodemUpdate(img), version: '2.40' }, faults, random: seededRandom(3) } },
    clock,
  );
  let screen = '';
  link.onData = (b) => (screen += new TextDecoder().decode(b));
  await vi.advanceTimersByTimeAsync(50);
  for (const [key, wait] of [[' ', 50], ['E', 2000], ['R', 50]] as const) {
    await link.write(new TextEncoder().encode(key));
    await vi.advanceTimersByTimeAsync(wait);
  }
  return { link, screen: () => screen };
}

function context(img: Uint8Array): RunContext {
  const plan = planXmodemTransfer({ bytes: img.length, block: 128, check: 'crc', baud: 115200 });
  return {
    tag: 'RW-0042', unit: 'display_head', firmwareId: 7, imageVersion: '2.40', blocks: plan.blocks, settings: { ...DEFAULT_SERIAL_SETTINGS },
    block: 128, planSeconds: plan.seconds, logBefore: 'Stopped in the loader.\n[sent: Erase (E)]\n',
  };
}

function start(link: SerialLink, img: Uint8Array, storage: Storage) {
  const recorded = new RecordedRun(link, img, context(img), { storage, now: () => Date.now(), keepEveryMs: 200 });
  link.onData = (b) => recorded.run.receive(b);
  return recorded;
}

describe('RecordedRun', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  it('keeps the run in storage while it goes: a reload mid-transfer finds it failed at the block after the last acknowledged', async () => {
    const img = image(64 * 128);
    const storage = new MemoryStorage();
    const unit = await unitReadyToReceive(img);
    const recorded = start(unit.link, img, storage);
    // 64 blocks of 133 bytes take about 0.74 s of line time; look in after about half of it.
    await vi.advanceTimersByTimeAsync(3400);
    const kept = loadPendingRun(storage)!;
    expect(kept.outcome).toBeNull();
    expect(kept.acknowledged).toBeGreaterThan(0);
    expect(kept.acknowledged).toBeLessThan(64);
    expect(kept.log).toContain('Stopped in the loader.');
    expect(outcomeOf(kept)).toEqual({ kind: 'transfer_failed', block: kept.acknowledged + 1, reason: expect.stringMatching(/reloaded or closed/) });

    const done = await (async () => {
      for (let t = 0; t < 20_000 && !recorded.run.progress().outcome; t += 100) await vi.advanceTimersByTimeAsync(100);
      return recorded.finished;
    })();
    expect(done.outcome?.kind).toBe('transfer_completed');
    expect(loadPendingRun(storage)?.outcome?.kind).toBe('transfer_completed');
  });

  it('the adapter unplugged mid-run: ended at once as failed at that block, with the reason, ready to save', async () => {
    const img = image(64 * 128);
    const storage = new MemoryStorage();
    const unit = await unitReadyToReceive(img);
    const recorded = start(unit.link, img, storage);
    for (let t = 0; t < 20_000 && recorded.run.progress().acknowledged < 10; t += 5) await vi.advanceTimersByTimeAsync(5);
    const acknowledged = recorded.run.progress().acknowledged;
    recorded.run.lost('The serial adapter was unplugged.');
    const done = await recorded.finished;
    expect(done.outcome).toEqual({ kind: 'transfer_failed', block: acknowledged + 1, reason: 'The serial adapter was unplugged.' });
    const { fields, log } = attemptOf(loadPendingRun(storage)!);
    expect(fields.outcome).toBe('transfer_failed');
    expect(fields.failedAtBlock).toBe(acknowledged + 1);
    expect(fields.notes).toContain('The serial adapter was unplugged.');
    expect(await log.text()).toContain('[sent: Erase (E)]');
  });

  it('writing to the port throws: the run ends as failed with the reason', async () => {
    const img = image(16 * 128);
    const storage = new MemoryStorage();
    const unit = await unitReadyToReceive(img);
    let writes = 0;
    const failing: SerialLink = {
      ...unit.link,
      kind: 'web-serial',
      label: 'USB serial adapter 0403:6001',
      onData: () => {},
      onLost: () => {},
      write: (bytes) => (++writes > 3 ? Promise.reject(new Error('The device has been lost.')) : unit.link.write(bytes)),
      close: () => unit.link.close(),
    };
    unit.link.onData = (b) => failing.onData(b);
    const recorded = start(failing, img, storage);
    for (let t = 0; t < 20_000 && !recorded.run.progress().outcome; t += 50) await vi.advanceTimersByTimeAsync(50);
    const done = await recorded.finished;
    // Writes 1-3 carry blocks 1-3 (each acknowledged); the fourth write, block 4, throws.
    expect(done.outcome).toEqual({ kind: 'transfer_failed', block: 4, reason: 'Writing to the port failed: The device has been lost.' });
    expect(attemptOf(done).fields.port).toBe('USB serial adapter 0403:6001');
  });

  it('a unit that never asks for the image: bootloader not entered after the reference’s one minute', async () => {
    const img = image(1000);
    const storage = new MemoryStorage();
    const unit = await unitReadyToReceive(img, { missBootWindow: true });
    const recorded = start(unit.link, img, storage);
    await vi.advanceTimersByTimeAsync(61_000);
    const done = await recorded.finished;
    expect(done.outcome?.kind).toBe('bootloader_not_entered');
    expect(attemptOf(done).fields.outcome).toBe('bootloader_not_entered');
  });
});
