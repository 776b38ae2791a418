import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { crc32 as zlibCrc32 } from 'node:zlib';
import fc from 'fast-check';
import CRC32 from 'crc-32';
import easyCrc from 'easy-crc';
import crcPkg16 from 'crc/crc16xmodem';
import { createImageChecksums, crc16XmodemUpdate, crc32Update, imageChecksums } from './checksums';

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
