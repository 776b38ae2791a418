// The XMODEM sender and receiver engines with a fake clock: the hand-worked transcript, every
// retry, timeout and cancel path, and the two engines against each other over a noisy line.
// Source throughout: Chuck Forsberg (ed.), "XMODEM/YMODEM Protocol Reference" (June 18 1988),
// section numbers as in xmodem-wire.ts. The interoperability with lrzsz is in xmodem-lrzsz.test.ts.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import crc16xmodem from 'crc/crc16xmodem';
import { planXmodemTransfer, type XmodemBlockSize, type XmodemCheckMode } from './xmodem';
import { ACK, CAN, CRC_REQUEST, EOT, NAK, SOH, STX, encodeBlock, type XmodemEvent, type XmodemStep } from './xmodem-wire';
import { XmodemSender } from './xmodem-sender';
import { XmodemReceiver } from './xmodem-receiver';

const bytesOf = (step: XmodemStep) => Array.from(Buffer.concat(step.send));
const kinds = (step: XmodemStep) => step.events.map((e) => e.kind);
const image = (n: number, f: (i: number) => number = (i) => i & 0xff) => Uint8Array.from({ length: n }, (_, i) => f(i));

describe('XMODEM transcript worked by hand (Forsberg 1988, §7.2 Figure 9 and §7.3 Figure 10)', () => {
  it('sends a 130-byte image as two checksum blocks and an EOT, byte for byte', () => {
    // Image: bytes 0x00, 0x01, … 0x81 (130 bytes).
    // Block 1: SOH 01 FE, data 0x00…0x7F, checksum = (0 + 1 + … + 127) mod 256 = 8128 mod 256 = 0xC0.
    // Block 2: SOH 02 FD, data 0x80 0x81 then 126 × SUB (0x1A),
    //          checksum = (0x80 + 0x81 + 126 × 0x1A) mod 256 = (257 + 3276) mod 256 = 3533 mod 256 = 0xCD.
    // Then EOT, acknowledged.
    const s = new XmodemSender(image(130));
    assert.deepEqual(kinds(s.start(0)), ['waiting']);

    const b1 = s.receive(Uint8Array.of(NAK), 10); // the receiver asks for the checksum
    const w1 = bytesOf(b1);
    assert.equal(w1.length, 132);
    assert.deepEqual(w1.slice(0, 3), [0x01, 0x01, 0xfe]);
    assert.deepEqual(w1.slice(3, 131), Array.from({ length: 128 }, (_, i) => i));
    assert.equal(w1[131], 0xc0);

    const w2 = bytesOf(s.receive(Uint8Array.of(ACK), 20));
    assert.equal(w2.length, 132);
    assert.deepEqual(w2.slice(0, 5), [0x01, 0x02, 0xfd, 0x80, 0x81]);
    assert.deepEqual(w2.slice(5, 131), new Array(126).fill(0x1a));
    assert.equal(w2[131], 0xcd);

    assert.deepEqual(bytesOf(s.receive(Uint8Array.of(ACK), 30)), [EOT]);
    const end = s.receive(Uint8Array.of(ACK), 40);
    assert.deepEqual(bytesOf(end), []);
    assert.deepEqual(end.events.at(-1), { kind: 'done', blocks: 2, retries: 0 });
    assert.equal(s.state, 'done');
    // 2 × 132 + 1 = 265 bytes, as the transfer plan says.
    assert.equal(s.bytesSent, 265);
    assert.equal(planXmodemTransfer({ bytes: 130, block: 128, check: 'sum', baud: 115200 }).wireBytes, 265);
  });

  it('in CRC mode the two check bytes are the CRC-16/XMODEM of the padded data, high byte first (§8 Figure 11)', () => {
    // Check value from an independent general-purpose package: `crc` (crc16xmodem).
    const img = new TextEncoder().encode('123456789');
    const block = encodeBlock(img, 1, 128, 'crc');
    const padded = Buffer.concat([Buffer.from(img), Buffer.alloc(119, 0x1a)]);
    const expected = crc16xmodem(padded);
    assert.equal(block.length, 133);
    assert.equal((block[131] << 8) | block[132], expected);
    // And the CRC RevEng catalogue's check value for CRC-16/XMODEM over "123456789" is 0x31C3.
    assert.equal(crc16xmodem(Buffer.from('123456789')), 0x31c3);
  });

  it('a 1K block starts with STX (§4.3) and the block number wraps 0xFF → 0x00 (§7.2)', () => {
    const img = image(256 * 128 + 1);
    assert.equal(encodeBlock(img, 1, 1024, 'crc')[0], STX);
    assert.equal(encodeBlock(img, 1, 128, 'sum')[0], SOH);
    const b256 = encodeBlock(img, 256, 128, 'sum');
    assert.deepEqual([b256[1], b256[2]], [0x00, 0xff]);
    const b257 = encodeBlock(img, 257, 128, 'sum');
    assert.deepEqual([b257[1], b257[2]], [0x01, 0xfe]);
  });
});

describe('XmodemSender: retries, timeouts and cancelling (fake clock)', () => {
  const started = (n = 300, block: XmodemBlockSize = 128) => {
    const s = new XmodemSender(image(n), { block });
    s.start(0);
    return s;
  };

  it("uses CRC-16 only when the receiver asks with 'C' (§4.3)", () => {
    const s = started();
    const step = s.receive(Uint8Array.of(CRC_REQUEST), 0);
    assert.equal(s.check, 'crc');
    assert.equal(bytesOf(step).length, 133);
    assert.deepEqual(step.events[0], { kind: 'mode', check: 'crc' });
  });

  it('ignores boot messages and noise while waiting for the start', () => {
    const s = started();
    const step = s.receive(new TextEncoder().encode('boot menu> '), 5);
    assert.deepEqual(step.send, []);
    assert.equal(s.state, 'waiting');
  });

  it('fails with the reason when nobody asks within one minute (§7.3.3), sending the cancel sequence', () => {
    const s = started();
    assert.equal(s.nextDeadline, 60_000);
    assert.deepEqual(s.tick(59_999).events, []);
    const step = s.tick(60_000);
    assert.equal(s.state, 'failed');
    assert.deepEqual(bytesOf(step), new Array(8).fill(CAN));
    assert.match((step.events.at(-1) as { reason: string }).reason, /did not ask for the image within 60 s/);
  });

  it('sends a block again on NAK, counting the retry with its reason', () => {
    const s = started();
    const first = bytesOf(s.receive(Uint8Array.of(NAK), 0));
    const again = s.receive(Uint8Array.of(NAK), 100);
    assert.deepEqual(bytesOf(again), first);
    assert.deepEqual(again.events, [
      { kind: 'retry', block: 1, reason: 'nak', retries: 1 },
      { kind: 'block-sent', block: 1, blocks: 3, attempt: 2 },
    ]);
  });

  it('sends a block again after 10 s without an answer (§7.3.3)', () => {
    const s = started();
    s.receive(Uint8Array.of(NAK), 0);
    assert.equal(s.nextDeadline, 10_000);
    assert.deepEqual(s.tick(9_999).send, []);
    const step = s.tick(10_000);
    assert.equal(bytesOf(step).length, 132);
    assert.equal(step.events[0].kind, 'retry');
    assert.equal((step.events[0] as { reason: string }).reason, 'timeout');
  });

  it('gives up after the 10 retries of §7.3.1 and cancels', () => {
    const s = started();
    s.receive(Uint8Array.of(NAK), 0);
    for (let i = 1; i <= 10; i++) {
      const step = s.receive(Uint8Array.of(NAK), i);
      assert.equal(bytesOf(step).length, 132, `retry ${i} resends`);
    }
    const last = s.receive(Uint8Array.of(NAK), 11);
    assert.equal(s.state, 'failed');
    assert.deepEqual(bytesOf(last), new Array(8).fill(CAN));
    const failed = last.events.at(-1) as Extract<XmodemEvent, { kind: 'failed' }>;
    assert.equal(failed.block, 1);
    assert.match(failed.reason, /Block 1 of 3 failed 11 times; the last time the unit refused the block/);
  });

  it("answers 'C' before the first ACK as a NAK and ignores it after (§8.2.3)", () => {
    const s = started();
    s.receive(Uint8Array.of(CRC_REQUEST), 0);
    assert.equal(bytesOf(s.receive(Uint8Array.of(CRC_REQUEST), 1)).length, 133); // repeat of block 1
    s.receive(Uint8Array.of(ACK), 2); // block 2 goes out
    assert.deepEqual(s.receive(Uint8Array.of(CRC_REQUEST), 3).send, []);
  });

  it('discards what arrived with the answer once it has sent a block (§7.4), so a doubled ACK moves on once', () => {
    const s = started();
    s.receive(Uint8Array.of(NAK), 0);
    const step = s.receive(Uint8Array.of(ACK, ACK), 1);
    assert.equal(kinds(step).filter((k) => k === 'block-sent').length, 1);
    assert.equal(s.acknowledged, 1);
  });

  it('sends EOT again when it is refused or not answered (§7.3.3, Figure 10)', () => {
    const s = started(100);
    s.receive(Uint8Array.of(NAK), 0);
    assert.deepEqual(bytesOf(s.receive(Uint8Array.of(ACK), 1)), [EOT]);
    assert.deepEqual(bytesOf(s.receive(Uint8Array.of(NAK), 2)), [EOT]);
    assert.deepEqual(bytesOf(s.tick(10_002)), [EOT]);
    s.receive(Uint8Array.of(ACK), 10_003);
    assert.equal(s.state, 'done');
    assert.equal(s.retries, 2);
  });

  it('is cancelled by two consecutive CAN from the receiver, not by one (§4.1)', () => {
    const s = started();
    s.receive(Uint8Array.of(NAK), 0);
    assert.equal(bytesOf(s.receive(Uint8Array.of(CAN, ACK), 1)).length, 132); // CAN then ACK: a line hit
    const step = s.receive(Uint8Array.of(CAN, CAN), 2);
    assert.equal(s.state, 'cancelled');
    assert.deepEqual(step.events.at(-1), { kind: 'cancelled', by: 'peer', block: 2, reason: 'The receiver cancelled the transfer (two CAN bytes).' });
  });

  it('cancel() puts the cancel sequence on the line and stops the clock', () => {
    const s = started();
    s.receive(Uint8Array.of(NAK), 0);
    const step = s.cancel();
    assert.deepEqual(bytesOf(step), new Array(8).fill(CAN));
    assert.equal(s.state, 'cancelled');
    assert.equal(s.nextDeadline, null);
    assert.deepEqual(s.receive(Uint8Array.of(ACK), 1).send, []);
  });

  it('refuses an empty image (nothing to flash)', () => {
    assert.throws(() => new XmodemSender(new Uint8Array(0)), /empty/);
  });
});

describe('XmodemReceiver: handshake, purge, duplicates and loss of step (fake clock)', () => {
  it("asks with 'C' every 3 s four times, then falls back to NAK and the checksum (§8.2.1, Figure 13)", () => {
    const r = new XmodemReceiver();
    assert.deepEqual(bytesOf(r.start(0)), [CRC_REQUEST]);
    assert.deepEqual(bytesOf(r.tick(3_000)), [CRC_REQUEST]);
    assert.deepEqual(bytesOf(r.tick(6_000)), [CRC_REQUEST]);
    assert.deepEqual(bytesOf(r.tick(9_000)), [CRC_REQUEST]);
    assert.deepEqual(bytesOf(r.tick(12_000)), [NAK]);
    assert.equal(r.check, 'sum');
    assert.equal(r.nextDeadline, 22_000); // then the 10 s wait of §7.3.2
  });

  it('gives up after 10 retries of waiting and cancels', () => {
    const r = new XmodemReceiver({ check: 'sum' });
    r.start(0);
    let t = 0;
    let last: XmodemStep = { send: [], events: [] };
    for (let i = 0; i < 11; i++) {
      t += 10_000;
      last = r.tick(t);
    }
    assert.equal(r.state, 'failed');
    assert.deepEqual(bytesOf(last).slice(-8), new Array(8).fill(CAN));
  });

  it('keeps a good block, acknowledges a repeated one without keeping it, and ends on EOT', () => {
    const img = image(200);
    const r = new XmodemReceiver({ check: 'sum' });
    r.start(0);
    assert.deepEqual(bytesOf(r.receive(encodeBlock(img, 1, 128, 'sum'), 1)), [ACK]);
    const dup = r.receive(encodeBlock(img, 1, 128, 'sum'), 2);
    assert.deepEqual(bytesOf(dup), [ACK]);
    assert.deepEqual(dup.events, [{ kind: 'duplicate-block', block: 1 }]);
    assert.deepEqual(bytesOf(r.receive(encodeBlock(img, 2, 128, 'sum'), 3)), [ACK]);
    const end = r.receive(Uint8Array.of(EOT), 4);
    assert.deepEqual(bytesOf(end), [ACK]);
    assert.equal(r.state, 'done');
    assert.deepEqual(Array.from(r.data().subarray(0, 200)), Array.from(img));
    assert.equal(r.data().length, 256);
  });

  it('on a bad check waits for 1 s of quiet line before the NAK (§7.4 PURGE)', () => {
    const img = image(128);
    const r = new XmodemReceiver({ check: 'sum' });
    r.start(0);
    const bad = encodeBlock(img, 1, 128, 'sum');
    bad[50] ^= 0x04;
    assert.deepEqual(r.receive(bad, 100).send, []);
    assert.equal(r.state, 'purging');
    r.receive(Uint8Array.of(0x55), 600); // more noise: the line is not quiet yet
    assert.deepEqual(r.tick(1_100).send, []);
    const nak = r.tick(1_600);
    assert.deepEqual(bytesOf(nak), [NAK]);
    assert.equal((nak.events[0] as { reason: string }).reason, 'bad-check');
  });

  it('refuses a damaged block number (number + complement ≠ 0xFF)', () => {
    const r = new XmodemReceiver({ check: 'sum' });
    r.start(0);
    const bad = encodeBlock(image(128), 1, 128, 'sum');
    bad[2] = 0x00;
    r.receive(bad, 1);
    const nak = r.tick(1_001);
    assert.equal((nak.events[0] as { reason: string }).reason, 'bad-header');
  });

  it('treats a character missing inside a block as a short block after 1 s (§7.3.2)', () => {
    const r = new XmodemReceiver({ check: 'sum' });
    r.start(0);
    r.receive(encodeBlock(image(128), 1, 128, 'sum').subarray(0, 100), 10);
    assert.deepEqual(r.tick(1_009).send, []);
    r.tick(1_010); // char timeout → purge
    const nak = r.tick(2_010);
    assert.deepEqual(bytesOf(nak), [NAK]);
    assert.equal((nak.events[0] as { reason: string }).reason, 'short-block');
  });

  it('cancels on a block number that is neither expected nor a repeat (fatal loss of step, §7.3.2)', () => {
    const img = image(1024);
    const r = new XmodemReceiver({ check: 'crc' });
    r.start(0);
    r.receive(encodeBlock(img, 1, 128, 'crc'), 1);
    const step = r.receive(encodeBlock(img, 3, 128, 'crc'), 2);
    assert.equal(r.state, 'failed');
    assert.deepEqual(bytesOf(step), new Array(8).fill(CAN));
  });

  it('accepts any mixture of 1K and 128-byte blocks (§4.3 Figure 2)', () => {
    const img = image(1024 + 128 + 50);
    const r = new XmodemReceiver({ check: 'crc' });
    r.start(0);
    r.receive(encodeBlock(img, 1, 1024, 'crc'), 1);
    // Block 2 and 3 as 128-byte blocks over the rest of the image.
    const rest = img.subarray(1024);
    const b2 = encodeBlock(rest, 1, 128, 'crc');
    b2[1] = 2;
    b2[2] = 0xfd;
    const b3 = encodeBlock(rest, 2, 128, 'crc');
    b3[1] = 3;
    b3[2] = 0xfc;
    r.receive(b2, 2);
    r.receive(b3, 3);
    r.receive(Uint8Array.of(EOT), 4);
    assert.equal(r.state, 'done');
    assert.deepEqual(Array.from(r.data().subarray(0, img.length)), Array.from(img));
  });

  it('is cancelled by two consecutive CAN between blocks', () => {
    const r = new XmodemReceiver();
    r.start(0);
    r.receive(Uint8Array.of(CAN, CAN), 1);
    assert.equal(r.state, 'cancelled');
  });
});

/**
 * Runs a sender and a receiver against each other on a simulated line with a fake clock. `hit`
 * may change bytes in flight (sender → receiver). Returns both engines once both have finished.
 */
function runPair(
  img: Uint8Array,
  block: XmodemBlockSize,
  check: XmodemCheckMode,
  hit: (byte: number, index: number) => number = (b) => b,
): { sender: XmodemSender; receiver: XmodemReceiver; wire: number } {
  const sender = new XmodemSender(img, { block });
  const receiver = new XmodemReceiver({ check });
  let now = 0;
  let wire = 0;
  const toReceiver: Uint8Array[] = [];
  const toSender: Uint8Array[] = [];
  const take = (step: XmodemStep, queue: Uint8Array[]) => queue.push(...step.send);
  take(sender.start(now), toReceiver);
  take(receiver.start(now), toSender);
  for (let guard = 0; guard < 1_000_000 && !(sender.finished && receiver.finished); guard++) {
    if (toSender.length) {
      take(sender.receive(toSender.shift()!, now), toReceiver);
    } else if (toReceiver.length) {
      const chunk = toReceiver.shift()!.map((b) => hit(b, wire++));
      take(receiver.receive(chunk, now), toSender);
    } else {
      const next = Math.min(sender.nextDeadline ?? Infinity, receiver.nextDeadline ?? Infinity);
      if (next === Infinity) break;
      now = next;
      take(sender.tick(now), toReceiver);
      take(receiver.tick(now), toSender);
    }
  }
  return { sender, receiver, wire };
}

describe('sender against receiver on a simulated line', () => {
  for (const block of [128, 1024] as const) {
    for (const check of ['sum', 'crc'] as const) {
      it(`${block}/${check}: a clean run puts exactly the transfer plan's wire bytes on the line`, () => {
        const img = image(5_000, (i) => (i * 7 + 3) & 0xff);
        const { sender, receiver } = runPair(img, block, check);
        assert.equal(sender.state, 'done');
        assert.equal(receiver.state, 'done');
        assert.equal(sender.bytesSent, planXmodemTransfer({ bytes: img.length, block, check, baud: 115200 }).wireBytes);
        assert.deepEqual(receiver.data().subarray(0, img.length), img);
        assert.ok(receiver.data().subarray(img.length).every((b) => b === 0x1a));
      });
    }
  }

  it('any image survives random line hits in CRC mode, ending identical up to the SUB padding', () => {
    fc.assert(
      fc.property(
        fc.uint8Array({ minLength: 1, maxLength: 3_000 }),
        fc.constantFrom<XmodemBlockSize>(128, 1024),
        fc.array(fc.nat({ max: 4_000 }), { maxLength: 4 }),
        (img, block, hits) => {
          const at = new Set(hits);
          const { sender, receiver } = runPair(img, block, 'crc', (b, i) => (at.has(i) ? b ^ 0x10 : b));
          assert.equal(sender.state, 'done');
          assert.equal(receiver.state, 'done');
          assert.deepEqual(receiver.data().subarray(0, img.length), img);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('reports the retry a line hit caused', () => {
    const img = image(600);
    // Byte 200 on the line is inside block 2 (blocks are 133 bytes in CRC mode).
    const { sender, receiver } = runPair(img, 128, 'crc', (b, i) => (i === 200 ? b ^ 0xff : b));
    assert.equal(sender.state, 'done');
    assert.equal(sender.retries, 1);
    assert.equal(receiver.retries, 1);
    assert.deepEqual(receiver.data().subarray(0, img.length), img);
  });
});
