import { after, describe, it } from 'node:test';
import { spawnSync } from 'node:child_process';
import { Readable } from 'node:stream';
import assert from 'node:assert/strict';
import { crc32 as zlibCrc32 } from 'node:zlib';
import fc from 'fast-check';
import CRC32 from 'crc-32';
import easyCrc from 'easy-crc';
import crcPkg16 from 'crc/crc16xmodem';
import { createImageChecksums, crc16XmodemUpdate, crc32Update, imageChecksums } from './checksums';
import {
  ChecksumWorkerPool,
  checksumStream,
  createStreamingImageChecksums,
  type StreamingImageChecksummer,
} from './checksums-streaming';
import { crc16XmodemCombine, crc32IsoHdlcCombine } from './checksums-combine';

const ascii = (s: string) => Buffer.from(s, 'latin1');

// Independent references, none of which the code under test uses:
// - CRC-32: SheetJS `crc-32` and `easy-crc` ('CRC-32' = ISO-HDLC); Node's zlib.crc32 is checked too
//   although checksums.ts itself relies on it.
// - CRC-16/XMODEM: `easy-crc` ('XMODEM') and the `crc` package (crc16xmodem).
const ref = {
  crc32Sheet: (b: Uint8Array) => CRC32.buf(b) >>> 0,
  crc32Easy: (b: Uint8Array) => easyCrc.crc32('CRC-32', Buffer.from(b.buffer, b.byteOffset, b.byteLength)) >>> 0,
  crc32Zlib: (b: Uint8Array) => zlibCrc32(b) >>> 0,
  crc16Easy: (b: Uint8Array) => easyCrc.crc16('XMODEM', Buffer.from(b.buffer, b.byteOffset, b.byteLength)),
  crc16Pkg: (b: Uint8Array) => crcPkg16(Buffer.from(b.buffer, b.byteOffset, b.byteLength)),
};

describe('CRC check values (Greg Cook, "Catalogue of parametrised CRC algorithms", CRC RevEng)', () => {
  it('CRC-16/XMODEM of "123456789" is 0x31C3', () => {
    assert.equal(crc16XmodemUpdate(ascii('123456789')), 0x31c3);
    assert.equal(imageChecksums(ascii('123456789')).crc16Xmodem, '31c3');
  });
  it('CRC-32/ISO-HDLC of "123456789" is 0xCBF43926', () => {
    assert.equal(crc32Update(ascii('123456789')), 0xcbf43926);
    assert.equal(imageChecksums(ascii('123456789')).crc32, 'cbf43926');
  });
  it('both are zero for no bytes (init 0 and xorout 0 for XMODEM; init = xorout for ISO-HDLC)', () => {
    const empty = imageChecksums(new Uint8Array(0));
    assert.equal(empty.crc16Xmodem, '0000');
    assert.equal(empty.crc32, '00000000');
  });
});

describe('SHA-256 examples (FIPS 180-4; NIST CSRC "Examples with intermediate values", SHA256.pdf)', () => {
  it('"abc"', () => {
    assert.equal(imageChecksums(ascii('abc')).sha256, 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
  it('the 448-bit two-block message', () => {
    assert.equal(
      imageChecksums(ascii('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).sha256,
      '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
    );
  });
  it('one million "a", fed in uneven chunks', () => {
    const c = createImageChecksums();
    let left = 1_000_000;
    for (let size = 1; left > 0; size = (size * 7 + 3) % 65_537) {
      const n = Math.min(left, size);
      c.update(Buffer.alloc(n, 0x61));
      left -= n;
    }
    assert.equal(c.digest().sha256, 'cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0');
  });
  it('the empty message (FIPS 180-4 padding of a zero-length message; widely published digest)', () => {
    assert.equal(imageChecksums(new Uint8Array(0)).sha256, 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });
});

describe('random images against independent CRC packages', () => {
  it('one-shot over random buffers of many sizes, including unaligned views', () => {
    fc.assert(
      fc.property(fc.uint8Array({ minLength: 0, maxLength: 5000 }), fc.nat(7), (bytes, skip) => {
        const view = bytes.subarray(Math.min(skip, bytes.length));
        const crc16 = crc16XmodemUpdate(view);
        assert.equal(crc16, ref.crc16Easy(view));
        assert.equal(crc16, ref.crc16Pkg(view));
        const crc32 = crc32Update(view);
        assert.equal(crc32, ref.crc32Sheet(view));
        assert.equal(crc32, ref.crc32Easy(view));
        assert.equal(crc32, ref.crc32Zlib(view));
      }),
      { numRuns: 300 },
    );
  });

  it('random chunkings give the same checksums as the whole image', () => {
    fc.assert(
      fc.property(
        fc.uint8Array({ minLength: 0, maxLength: 20_000 }),
        fc.array(fc.integer({ min: 1, max: 3000 }), { minLength: 1, maxLength: 40 }),
        (bytes, sizes) => {
          const c = createImageChecksums();
          let at = 0;
          for (let i = 0; at < bytes.length; i++) {
            const n = sizes[i % sizes.length];
            c.update(bytes.subarray(at, at + n));
            at += n;
          }
          const got = c.digest();
          assert.equal(got.crc16Xmodem, ref.crc16Easy(bytes).toString(16).padStart(4, '0'));
          assert.equal(got.crc32, ref.crc32Sheet(bytes).toString(16).padStart(8, '0'));
          assert.deepEqual(got, imageChecksums(bytes));
        },
      ),
      { numRuns: 150 },
    );
  });

  it('a 1 MiB image in 64 KiB chunks matches the references', () => {
    const big = new Uint8Array(1 << 20);
    for (let i = 0; i < big.length; i++) big[i] = (i * 2654435761) >>> 24;
    const c = createImageChecksums();
    for (let at = 0; at < big.length; at += 65_536) c.update(big.subarray(at, at + 65_536));
    const got = c.digest();
    assert.equal(got.crc16Xmodem, ref.crc16Pkg(big).toString(16).padStart(4, '0'));
    assert.equal(got.crc32, ref.crc32Sheet(big).toString(16).padStart(8, '0'));
    assert.match(got.sha256, /^[0-9a-f]{64}$/);
  });
});

describe('the checksummer', () => {
  it('answers in lower-case hex of 64, 8 and 4 digits, zero-padded', () => {
    // CRC-16/XMODEM of the single byte 0x00 is 0x0000 and of 0x01 is 0x1021 (the polynomial):
    // by the definition in the RevEng catalogue (init 0, no reflection).
    const one = imageChecksums(Uint8Array.of(0x01));
    assert.equal(one.crc16Xmodem, '1021');
    assert.match(one.sha256, /^[0-9a-f]{64}$/);
    assert.match(one.crc32, /^[0-9a-f]{8}$/);
  });
  it('refuses to be fed or digested after digest()', () => {
    const c = createImageChecksums();
    c.update(ascii('abc'));
    c.digest();
    assert.throws(() => c.update(ascii('d')), /already digested/);
    assert.throws(() => c.digest(), /already digested/);
  });
});

describe('joining the CRCs of consecutive pieces (checksums-combine.ts)', () => {
  it('"123456789" split anywhere joins to the catalogue check values 0x31C3 and 0xCBF43926', () => {
    const nine = ascii('123456789');
    for (let cut = 0; cut <= 9; cut++) {
      const a = nine.subarray(0, cut);
      const b = nine.subarray(cut);
      assert.equal(crc16XmodemCombine(crc16XmodemUpdate(a), crc16XmodemUpdate(b), b.length), 0x31c3, `cut ${cut}`);
      assert.equal(crc32IsoHdlcCombine(crc32Update(a), crc32Update(b), b.length), 0xcbf43926, `cut ${cut}`);
    }
  });
  it('random pieces join to the CRC of the whole (checked against the independent packages)', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 3000, size: 'max' }), fc.uint8Array({ maxLength: 70_000, size: 'max' }), (a, b) => {
        const whole = new Uint8Array(a.length + b.length);
        whole.set(a);
        whole.set(b, a.length);
        assert.equal(crc16XmodemCombine(crc16XmodemUpdate(a), crc16XmodemUpdate(b), b.length), ref.crc16Easy(whole));
        assert.equal(crc32IsoHdlcCombine(crc32Update(a), crc32Update(b), b.length), ref.crc32Sheet(whole));
      }),
      { numRuns: 200, endOnFailure: true },
    );
  });
});

// --- the two-thread streaming checksummer (checksums-streaming.ts) -----------------------------
// Its results must equal the one-thread checksummer's and the published check values above. A small
// batch (1000 bytes, not a multiple of 4) and a ring of 3 slots make every path run on small
// inputs: ring slots, overflow buffers transferred to the worker, and partial last batches.

describe('streaming checksums on two threads', () => {
  const pool = new ChecksumWorkerPool({ batchBytes: 1000, slots: 3, idleMs: 60_000 });
  after(() => pool.close());
  const viaWorker = { pool, workerFromBytes: 0 };

  const feed = (s: StreamingImageChecksummer, bytes: Uint8Array, sizes: number[]) => {
    let at = 0;
    for (let i = 0; at < bytes.length; i++) {
      const n = sizes[i % sizes.length];
      s.update(bytes.subarray(at, at + n));
      at += n;
    }
    return s;
  };

  it('check values through the worker: CRC RevEng "123456789", FIPS 180-4 "abc" and the 448-bit message', async () => {
    for (const share of ['crcs-there', 'crc16-here', 'crcs-here', 'balanced'] as const) {
      const nine = await feed(createStreamingImageChecksums({ ...viaWorker, share }), ascii('123456789'), [2, 3]).digest();
      assert.equal(nine.crc16Xmodem, '31c3', share);
      assert.equal(nine.crc32, 'cbf43926', share);
    }
    const abc = createStreamingImageChecksums(viaWorker);
    abc.update(ascii('abc'));
    assert.equal((await abc.digest()).sha256, 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    const two = createStreamingImageChecksums(viaWorker);
    two.update(ascii('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq'));
    assert.equal((await two.digest()).sha256, '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
    assert.ok(pool.workersStarted >= 1, 'the worker was used');
  });

  it('FIPS 180-4 one million "a" in uneven chunks, on the default pool and batch size', async () => {
    const s = createStreamingImageChecksums({ workerFromBytes: 0 });
    let left = 1_000_000;
    for (let size = 1; left > 0; size = (size * 7 + 3) % 65_537) {
      const n = Math.min(left, size);
      s.update(Buffer.alloc(n, 0x61));
      left -= n;
    }
    assert.equal((await s.digest()).sha256, 'cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0');
  });

  it('the empty image, through the worker and on the main thread', async () => {
    for (const options of [viaWorker, { pool }]) {
      assert.deepEqual(await createStreamingImageChecksums(options).digest(), {
        sha256: 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855',
        crc32: '00000000',
        crc16Xmodem: '0000',
      });
    }
  });

  it('random images and chunkings give exactly the one-thread results', async () => {
    await fc.assert(
      fc.asyncProperty(
        // size 'max': fast-check's default 'small' size would keep nearly every image under one batch.
        fc.uint8Array({ minLength: 0, maxLength: 12_000, size: 'max' }),
        fc.array(fc.integer({ min: 1, max: 2500 }), { minLength: 1, maxLength: 12 }),
        fc.constantFrom(0, 2000, Infinity),
        fc.constantFrom('balanced', 'crc16-here', 'crcs-here', 'crcs-there'),
        fc.nat(7),
        async (bytes, sizes, workerFromBytes, share, skip) => {
          const view = bytes.subarray(Math.min(skip, bytes.length)); // unaligned views too
          const got = await feed(createStreamingImageChecksums({ pool, workerFromBytes, share }), view, sizes).digest();
          assert.deepEqual(got, imageChecksums(view));
          assert.equal(got.crc16Xmodem, ref.crc16Easy(view).toString(16).padStart(4, '0'));
        },
      ),
      { numRuns: 80, endOnFailure: true }, // no shrinking: each run talks to a worker
    );
  });

  it('a 3 MiB image in 64 KiB chunks on the default settings matches the references', async () => {
    const big = new Uint8Array(3 << 20);
    for (let i = 0; i < big.length; i++) big[i] = (i * 2654435761) >>> 24;
    const s = feed(createStreamingImageChecksums(), big, [65_536]);
    const got = await s.digest();
    assert.deepEqual(got, imageChecksums(big));
    assert.equal(got.crc16Xmodem, ref.crc16Pkg(big).toString(16).padStart(4, '0'));
    assert.equal(got.crc32, ref.crc32Sheet(big).toString(16).padStart(8, '0'));
    assert.equal(s.pendingBytes, 0);
  });

  it('images in flight at the same time share the worker and keep apart', async () => {
    const a = new Uint8Array(7000).map((_, i) => i * 31);
    const b = new Uint8Array(5500).map((_, i) => i * 17 + 5);
    const sa = createStreamingImageChecksums(viaWorker);
    const sb = createStreamingImageChecksums(viaWorker);
    for (let at = 0; at < 7000; at += 700) {
      sa.update(a.subarray(at, at + 700));
      sb.update(b.subarray(at, at + 700));
    }
    const [ga, gb] = await Promise.all([sa.digest(), sb.digest()]);
    assert.deepEqual(ga, imageChecksums(a));
    assert.deepEqual(gb, imageChecksums(b));
  });

  it('drained() waits until the worker has summed what was sent', async () => {
    const s = createStreamingImageChecksums(viaWorker);
    s.update(new Uint8Array(50_000).fill(7));
    assert.ok(s.pendingBytes > 0, 'batches are in flight right after update()');
    await s.drained(0);
    assert.equal(s.pendingBytes, 0);
    assert.deepEqual(await s.digest(), imageChecksums(new Uint8Array(50_000).fill(7)));
  });

  it('refuses a second digest() and any update() after it', async () => {
    for (const options of [viaWorker, { pool }]) {
      const s = createStreamingImageChecksums(options);
      s.update(ascii('abc'));
      await s.digest();
      await assert.rejects(s.digest(), /already digested/);
      assert.throws(() => s.update(ascii('d')), /already digested/);
    }
  });

  it('abort() rejects a pending digest, refuses further use and stops a worker nobody else uses', async () => {
    const own = new ChecksumWorkerPool({ batchBytes: 1000, slots: 3 });
    const s = createStreamingImageChecksums({ pool: own, workerFromBytes: 0 });
    s.update(new Uint8Array(10_000));
    assert.equal(own.running, true);
    const pending = s.digest();
    s.abort();
    await assert.rejects(pending, /aborted/);
    assert.throws(() => s.update(ascii('x')), /aborted/);
    await assert.rejects(s.digest(), /aborted/);
    assert.equal(own.running, false);

    // The next image starts a fresh worker and is right.
    const again = createStreamingImageChecksums({ pool: own, workerFromBytes: 0 });
    again.update(ascii('123456789'));
    assert.equal((await again.digest()).crc32, 'cbf43926');
    assert.equal(own.workersStarted, 2);
    await own.close();
  });

  it('abort() of one image leaves another image on the same worker unharmed', async () => {
    const keep = createStreamingImageChecksums(viaWorker);
    const drop = createStreamingImageChecksums(viaWorker);
    keep.update(ascii('1234'));
    drop.update(new Uint8Array(4000));
    drop.abort();
    keep.update(ascii('56789'));
    assert.equal((await keep.digest()).crc32, 'cbf43926');
  });

  it('a worker that crashes makes digest() reject with a clear error; the next image gets a new worker', async () => {
    const crashing = new ChecksumWorkerPool({
      batchBytes: 1000,
      workerSource: `require('node:worker_threads').parentPort.on('message', (m) => {
        if (m.type === 'data') throw new Error('simulated fault');
      });`,
    });
    const s = createStreamingImageChecksums({ pool: crashing, workerFromBytes: 0 });
    s.update(new Uint8Array(3000));
    await assert.rejects(s.digest(), /checksum worker failed: simulated fault/);
    assert.equal(crashing.running, false);
    await crashing.close();

    const exiting = new ChecksumWorkerPool({
      workerSource: `require('node:worker_threads').parentPort.on('message', () => process.exit(3));`,
    });
    const e = createStreamingImageChecksums({ pool: exiting, workerFromBytes: 0 });
    e.update(ascii('abc'));
    await assert.rejects(e.digest(), /checksum worker exited \(code 3\)/);
    await exiting.close();
  });

  it('an update() after the worker failed throws that failure', async () => {
    const own = new ChecksumWorkerPool({ batchBytes: 1000 });
    const s = createStreamingImageChecksums({ pool: own, workerFromBytes: 0 });
    s.update(new Uint8Array(2000));
    await own.close();
    assert.throws(() => s.update(new Uint8Array(10)), /checksum worker stopped/);
    await assert.rejects(s.digest(), /checksum worker stopped/);
  });

  it('the idle worker ends itself after idleMs', async () => {
    const own = new ChecksumWorkerPool({ idleMs: 30 });
    const s = createStreamingImageChecksums({ pool: own, workerFromBytes: 0 });
    s.update(ascii('abc'));
    await s.digest();
    assert.equal(own.running, true);
    const since = Date.now();
    while (own.running && Date.now() - since < 5000) await new Promise((resolve) => setTimeout(resolve, 10));
    assert.equal(own.running, false, 'stopped within 5 s of a 30 ms idle timeout');
  });

  it('checksumStream sums a Readable; a failing stream rejects with its own error', async () => {
    const bytes = new Uint8Array(1_500_000).map((_, i) => (i * 7) ^ (i >>> 9));
    const chunks = Array.from({ length: 23 }, (_, k) => Buffer.from(bytes.subarray(k * 65_536, (k + 1) * 65_536)));
    assert.deepEqual(await checksumStream(Readable.from(chunks), { pool }), imageChecksums(bytes));

    const broken = new Readable({
      read() {
        this.push(Buffer.alloc(1000));
        this.destroy(new Error('connection reset by the member'));
      },
    });
    await assert.rejects(checksumStream(broken, viaWorker), /connection reset by the member/);
    await assert.rejects(checksumStream(Readable.from(['text']), { pool }), /needs bytes/);
  });

  it('leaves no worker that keeps a process alive (a child process on the default pool exits at once)', () => {
    const script = [
      `import { checksumStream } from ${JSON.stringify(new URL('./checksums-streaming.ts', import.meta.url).href)};`,
      `const sums = await checksumStream([new Uint8Array(2_000_000).fill(1)]);`,
      `const done = performance.now();`,
      `process.on('exit', () => console.log(sums.crc16Xmodem.length, Math.round(performance.now() - done)));`,
    ].join('\n');
    const child = spawnSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script], {
      encoding: 'utf8',
      timeout: 20_000,
    });
    assert.equal(child.error, undefined, 'the child exited by itself within 20 s');
    assert.equal(child.status, 0, child.stderr);
    const [digits, msToExit] = child.stdout.trim().split(' ').map(Number);
    assert.equal(digits, 4);
    // The pool's idle timeout is 10 s: a worker that held the process would show here.
    assert.ok(msToExit < 2000, `the child took ${msToExit} ms after its digest to exit`);
  });
});
