// The Flasher's bookkeeping: which images are offered, the browser's SHA-256 check, the run kept
// for a reload, and the flash attempt a run becomes.
import { describe, expect, it } from 'vitest';
import type { TrackRecordRow } from '@contracts/firmware';
import { FIRMWARE_UNITS } from '@contracts/firmware';
import {
  SERIAL_LOG_MAX_BYTES,
  attemptOf,
  checkImage,
  cleanLog,
  encodeSendText,
  forgetPendingRun,
  keepPendingRun,
  loadPendingRun,
  loadSendKeys,
  offerableImages,
  outcomeOf,
  sha256Hex,
  terminalText,
  unitChoices,
  type PendingRun,
} from './flasher-record';
import { DEFAULT_SERIAL_SETTINGS } from './serial-link';

const row = (over: Partial<TrackRecordRow>): TrackRecordRow => ({
  firmwareId: 1, version: '1.00', size: 1000, sha256: '0'.repeat(64), knownGood: false, withdrawn: false, withdrawnReason: null,
  attempts: 0, verified: 0, successRate: null, lastUsedAt: null, ...over,
});

class MemoryStorage implements Storage {
  private readonly map = new Map<string, string>();
  get length() { return this.map.size; }
  clear() { this.map.clear(); }
  getItem(k: string) { return this.map.get(k) ?? null; }
  key(i: number) { return [...this.map.keys()][i] ?? null; }
  removeItem(k: string) { this.map.delete(k); }
  setItem(k: string, v: string) { this.map.set(k, v); }
}

const pending = (over: Partial<PendingRun> = {}): PendingRun => ({
  v: 1, tag: 'RW-0042', unit: 'display_head', firmwareId: 7, imageVersion: '2.40', blocks: 8, port: 'Practice unit (simulated, no radio)',
  settings: { ...DEFAULT_SERIAL_SETTINGS }, block: 1024, check: 'crc', startedAt: '2026-12-02T19:04:05.000Z', elapsedMs: 3500,
  acknowledged: 3, phase: 'sending', retries: [], outcome: null, planSeconds: 0.7147, log: 'Stopped in the loader.\n', ...over,
});

describe('image choice', () => {
  it('never offers a withdrawn image', () => {
    const rows = [row({ firmwareId: 1, version: '2.40', knownGood: true }), row({ firmwareId: 2, version: '2.38', withdrawn: true, withdrawnReason: 'Recalled' }), row({ firmwareId: 3, version: '2.39' })];
    expect(offerableImages(rows).map((r) => r.firmwareId)).toEqual([1, 3]);
    expect(offerableImages([row({ withdrawn: true })])).toEqual([]);
  });

  it("offers the ticket's own units first, in its words, then the library's other units", () => {
    const choices = unitChoices(['main body', 'display head'], FIRMWARE_UNITS);
    expect(choices.slice(0, 2)).toEqual([
      { unit: 'main_board', ticketWords: 'main body' },
      { unit: 'display_head', ticketWords: 'display head' },
    ]);
    expect(choices.map((c) => c.unit).sort()).toEqual([...FIRMWARE_UNITS].sort());
    expect(unitChoices([], FIRMWARE_UNITS).every((c) => c.ticketWords === null)).toBe(true);
  });
});

describe('image check in the browser', () => {
  it('SHA-256 of "abc" is the FIPS 180-4 example value', async () => {
    // FIPS 180-4 / NIST "SHA256.pdf" example: SHA-256("abc").
    expect(await sha256Hex(new TextEncoder().encode('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('passes the bytes the library describes and stops on one changed byte', async () => {
    const bytes = new TextEncoder().encode('abc');
    const library = { sha256: 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad', size: 3, version: '2.40' };
    expect(await checkImage(bytes, library)).toEqual({ ok: true, sha256: library.sha256 });
    const bad = await checkImage(new TextEncoder().encode('abd'), library);
    expect(bad.ok).toBe(false);
    expect(bad.ok === false && bad.message).toMatch(/does not match the library.*Nothing was sent to the unit/);
  });
});

describe('a run kept for a reload', () => {
  it('is kept, read back and forgotten', () => {
    const storage = new MemoryStorage();
    expect(loadPendingRun(storage)).toBeNull();
    keepPendingRun(pending(), storage);
    expect(loadPendingRun(storage)).toEqual(pending());
    forgetPendingRun(storage);
    expect(loadPendingRun(storage)).toBeNull();
    storage.setItem('rw.flasher.unsavedRun', '{not json');
    expect(loadPendingRun(storage)).toBeNull();
  });

  it('a run the page lost mid-transfer is failed at the block after the last acknowledged one', () => {
    expect(outcomeOf(pending({ acknowledged: 3 }))).toEqual({ kind: 'transfer_failed', block: 4, reason: expect.stringMatching(/reloaded or closed/) });
    // all blocks acknowledged but the EOT not yet: still failed, at the last block
    expect(outcomeOf(pending({ acknowledged: 8, phase: 'closing' })).block).toBe(8);
    expect(outcomeOf(pending({ acknowledged: 0, phase: 'waiting' })).kind).toBe('bootloader_not_entered');
  });

  it('an ended run keeps its own outcome', () => {
    const outcome = { kind: 'transfer_failed' as const, block: 5, reason: 'The serial adapter was unplugged.' };
    expect(outcomeOf(pending({ outcome, phase: 'ended' }))).toBe(outcome);
  });
});

describe('the flash attempt a run becomes', () => {
  it('failed at a block: the fields of POST /api/tickets/:tag/flash-attempts, notes with reason and retries, the log as a text file', async () => {
    const { fields, log, outcome } = attemptOf(
      pending({
        outcome: { kind: 'transfer_failed', block: 4, reason: 'Cancelled at the bench.' },
        retries: [{ block: 2, text: 'the unit refused the block (NAK)' }],
      }),
    );
    expect(outcome).toBe('transfer_failed');
    expect(fields).toMatchObject({
      unit: 'display_head', firmwareId: 7, port: 'Practice unit (simulated, no radio)', baud: 115200, dataBits: 8, parity: 'none', stopBits: '1',
      block: 1024, check: 'crc', outcome: 'transfer_failed', failedAtBlock: 4,
    });
    expect(fields.notes).toContain('Cancelled at the bench. 1 retry (block 2: the unit refused the block (NAK)). Took 3.5 s; the plan gives 0.7 s at 115200 baud.');
    expect(log.name).toBe('RW-0042-flasher-2026-12-02T19-04-05-000Z.txt');
    expect(await log.text()).toBe('Stopped in the loader.\n');
  });

  it('completed: no failed block', () => {
    const { fields } = attemptOf(pending({ outcome: { kind: 'transfer_completed', block: 8, reason: 'ok' }, acknowledged: 8 }));
    expect(fields.outcome).toBe('transfer_completed');
    expect('failedAtBlock' in fields).toBe(false);
  });

  it('the log holds text only and stays under the API limit, keeping its start and end', () => {
    expect(cleanLog('a\u0000b\u0006c\r\nd\te')).toBe('abc\r\nd\te');
    const long = 'BANNER\n' + 'x'.repeat(400_000) + '\nTHE END\n';
    const kept = cleanLog(long);
    expect(new TextEncoder().encode(kept).length).toBeLessThanOrEqual(SERIAL_LOG_MAX_BYTES);
    expect(kept.startsWith('BANNER\n')).toBe(true);
    expect(kept.endsWith('THE END\n')).toBe(true);
    expect(kept).toMatch(/bytes of the log left out/);
  });
});

describe('terminal and key buttons', () => {
  it('escapes become bytes', () => {
    expect([...encodeSendText('E\\r')]).toEqual([0x45, 0x0d]);
    expect([...encodeSendText('\\x1b\\n\\t\\\\')]).toEqual([0x1b, 0x0a, 0x09, 0x5c]);
    expect(() => encodeSendText('\\q')).toThrow(/not an escape/);
    expect(() => encodeSendText('\\x4')).toThrow(/not an escape/);
  });

  it('the terminal shows text, drops protocol control bytes and shows garbage as dots', () => {
    expect(terminalText(Uint8Array.of(0x06, 0x43, 0x0d, 0x0a, 0x41, 0xfe, 0x15))).toBe('C\nA·');
  });

  it('key buttons fall back to the practice loader keys when none are stored', () => {
    const storage = new MemoryStorage();
    expect(loadSendKeys(storage).map((k) => k.text)).toEqual([' ', 'E', 'R', 'B']);
    storage.setItem('rw.flasher.sendKeys', JSON.stringify([{ label: 'Menu', text: '\\r' }]));
    expect(loadSendKeys(storage)).toEqual([{ label: 'Menu', text: '\\r' }]);
  });
});
