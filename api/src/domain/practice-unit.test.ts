// The practice unit driven by our XMODEM sender on a fake clock: the whole procedure, and each
// fault the practice panel can inject. The procedure itself (key in the boot window, erase,
// receive, boot) is common practice for serial bootloaders, no published source.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { crc16XmodemUpdate } from './crc16-xmodem';
import { PracticeUnit, seededRandom, type PracticeFaults, type PracticeUnitStep } from './practice-unit';
import { XmodemSender } from './xmodem-sender';
import type { XmodemBlockSize } from './xmodem';
import type { XmodemStep } from './xmodem-wire';

const decoder = new TextDecoder();
const image = (n: number) => Uint8Array.from({ length: n }, (_, i) => (i * 31 + 7) & 0xff);
const expectedOf = (img: Uint8Array, version = '2.14') => ({ length: img.length, crc16: crc16XmodemUpdate(img), version });

/** A bench computer typing at the unit and flashing it, on a fake clock. */
class Bench {
  now = 0;
  screen = '';
  constructor(readonly unit: PracticeUnit) {}

  private show(step: PracticeUnitStep): Uint8Array[] {
    const bytes = step.send;
    for (const b of bytes) this.screen += decoder.decode(b, { stream: true });
    return bytes;
  }

  powerOn() {
    this.show(this.unit.powerOn(this.now));
  }

  type(keys: string) {
    this.show(this.unit.receive(new TextEncoder().encode(keys), this.now));
  }

  /** Lets time pass, running the unit's timers. */
  wait(ms: number) {
    const until = this.now + ms;
    for (;;) {
      const next = this.unit.nextDeadline;
      if (next === null || next > until) break;
      this.now = Math.max(this.now, next);
      this.show(this.unit.tick(this.now));
    }
    this.now = until;
  }

  /** Sends an image with our sender; `stopWhen` lets the technician cancel (e.g. on seeing a restart). */
  flash(img: Uint8Array, block: XmodemBlockSize = 1024, stopWhen?: (screenSinceStart: string) => boolean): XmodemSender {
    const sender = new XmodemSender(img, { block });
    const start = this.screen.length;
    const toUnit: Uint8Array[] = [];
    const toHost: Uint8Array[] = [];
    const fromSender = (s: XmodemStep) => toUnit.push(...s.send);
    fromSender(sender.start(this.now));
    // Whatever the unit printed just before (its 'C') is already on the line.
    for (let guard = 0; guard < 200_000 && !sender.finished; guard++) {
      if (stopWhen?.(this.screen.slice(start))) {
        fromSender(sender.cancel('The unit restarted during the transfer.'));
        for (const b of toUnit.splice(0)) this.show(this.unit.receive(b, this.now));
        break;
      }
      if (toHost.length) {
        fromSender(sender.receive(toHost.shift()!, this.now));
      } else if (toUnit.length) {
        toHost.push(...this.show(this.unit.receive(toUnit.shift()!, this.now)));
      } else {
        const next = Math.min(sender.nextDeadline ?? Infinity, this.unit.nextDeadline ?? Infinity);
        if (next === Infinity) break;
        this.now = Math.max(this.now, next);
        fromSender(sender.tick(this.now));
        toHost.push(...this.show(this.unit.tick(this.now)));
      }
    }
    return sender;
  }
}

/** The unit's 'C' after R goes to the host; the Bench flashes from there. */
function prepared(img: Uint8Array, faults: PracticeFaults = {}, installedVersion?: string) {
  const unit = new PracticeUnit({ expected: expectedOf(img), faults, installedVersion, random: seededRandom(42) });
  const bench = new Bench(unit);
  bench.powerOn();
  bench.wait(500);
  bench.type(' ');
  bench.type('e');
  bench.wait(2000);
  return bench;
}

describe('the practice unit', () => {
  it('says it is a simulation, stops in the loader on a key, erases, receives, checks and boots the new version', () => {
    const img = image(5000);
    const bench = prepared(img, {}, '2.11');
    assert.match(bench.screen, /SIMULATED display unit, no radio attached/);
    assert.match(bench.screen, /Stopped in the loader/);
    assert.match(bench.screen, /Erasing the application area\.\.\. done\./);
    bench.type('r');
    assert.equal(bench.unit.state, 'receiving');
    const sender = bench.flash(img);
    assert.equal(sender.state, 'done');
    assert.match(bench.screen, new RegExp(`Image received, 5000 bytes, CRC-16 ${crc16XmodemUpdate(img).toString(16).padStart(4, '0')}: check passed`));
    bench.type('b');
    assert.equal(bench.unit.state, 'running');
    assert.equal(bench.unit.runningVersion, '2.14');
    assert.match(bench.screen, /running firmware 2\.14/);
  });

  it('boots what it has when no key comes within the boot window; with nothing installed it stays in the loader', () => {
    const withFirmware = new Bench(new PracticeUnit({ expected: expectedOf(image(10)), installedVersion: '2.11' }));
    withFirmware.powerOn();
    withFirmware.wait(2000);
    assert.equal(withFirmware.unit.state, 'running');
    assert.match(withFirmware.screen, /running firmware 2\.11/);

    const empty = new Bench(new PracticeUnit({ expected: expectedOf(image(10)) }));
    empty.powerOn();
    empty.wait(2000);
    assert.equal(empty.unit.state, 'menu');
    assert.match(empty.screen, /No valid application image: staying in the loader/);
  });

  it('will not receive before the area is erased', () => {
    const bench = new Bench(new PracticeUnit({ expected: expectedOf(image(10)), installedVersion: '1.0' }));
    bench.powerOn();
    bench.type('x');
    bench.type('r');
    assert.match(bench.screen, /Erase first \(E\)/);
    assert.equal(bench.unit.state, 'menu');
  });

  it('a missed boot window: keys are ignored and the old firmware starts', () => {
    const bench = new Bench(new PracticeUnit({ expected: expectedOf(image(10)), installedVersion: '2.11', faults: { missBootWindow: true } }));
    bench.powerOn();
    bench.type(' ');
    bench.wait(2000);
    assert.equal(bench.unit.state, 'running');
  });

  it('a wrong baud rate: the banner is garbage and keys do not stop the boot as intended', () => {
    const bench = new Bench(new PracticeUnit({ expected: expectedOf(image(10)), faults: { baudMismatch: true } }));
    bench.powerOn();
    assert.doesNotMatch(bench.screen, /practice unit/);
    bench.type('e');
    assert.doesNotMatch(bench.screen, /Erasing/);
  });

  it('a power dip at block 3 restarts the unit mid-transfer; after a cancel it must be erased and flashed again', () => {
    const img = image(8 * 1024);
    const bench = prepared(img, { powerDipAtBlock: 3 });
    bench.type('r');
    const failed = bench.flash(img, 1024, (screen) => /practice unit/.test(screen));
    assert.equal(failed.state, 'cancelled');
    assert.equal(failed.acknowledged, 2, 'blocks 1 and 2 got through');
    assert.equal(bench.unit.runningVersion, null, 'the half-written image does not start');
    // The cancel bytes reached the restarted unit inside its boot window: like any key, they stop it in the loader.
    assert.equal(bench.unit.state, 'menu');
    bench.type('b');
    assert.match(bench.screen, /No valid application image/);
    // Flash again: erase, receive, boot.
    bench.type('e');
    bench.wait(2000);
    bench.type('r');
    const again = bench.flash(img, 1024);
    assert.equal(again.state, 'done');
    bench.type('b');
    assert.equal(bench.unit.runningVersion, '2.14');
  });

  it('line noise: the transfer completes with the retries it reports', () => {
    const img = image(40 * 1024);
    const bench = prepared(img, { bitErrorRate: 2e-5 });
    bench.type('r');
    const sender = bench.flash(img, 1024);
    assert.equal(sender.state, 'done');
    assert.ok(sender.retries > 0, 'noise at this rate damages some of 40 blocks of 8232 bits (seeded)');
    assert.match(bench.screen, /check passed/);
  });

  it('a dropped byte is a short block: NAK after the line clears, then it completes', () => {
    const img = image(3 * 128);
    const bench = prepared(img, { dropByteAt: 150 });
    bench.type('r');
    const sender = bench.flash(img, 128);
    assert.equal(sender.state, 'done');
    assert.equal(sender.retries, 1);
  });

  it('the wrong image fails the unit\'s check and stays unbootable', () => {
    const img = image(2000);
    const other = image(2000);
    other[999] ^= 0xff; // one byte differs from the image the unit expects
    const bench = prepared(img);
    bench.type('r');
    const sender = bench.flash(other, 1024);
    assert.equal(sender.state, 'done', 'XMODEM itself succeeds');
    assert.match(bench.screen, /check FAILED/);
    bench.type('b');
    assert.equal(bench.unit.state, 'menu');
  });
});
