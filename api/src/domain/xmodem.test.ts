// Worked by hand from Chuck Forsberg, "XMODEM/YMODEM Protocol Reference" (1988), packet layout:
// each block is 1 header byte (SOH for 128, STX for 1024) + 1 block number + 1 complement + data
// + check (1 byte arithmetic checksum, or 2 bytes CRC-16), and the transfer ends with 1 EOT byte.
// Time: 10 bits per byte at 8N1 (1 start + 8 data + 1 stop bit).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import {
  blockComplementOnWire,
  blockNumberOnWire,
  bytesPerBlock,
  percentDone,
  planXmodemTransfer,
  SERIAL_BAUDS,
} from './xmodem';
import { CalcInputError } from './input-error';

const close = (actual: number, expected: number, eps = 1e-9) =>
  assert.ok(Math.abs(actual - expected) <= eps * Math.max(1, Math.abs(expected)), `${actual} ≠ ${expected}`);

describe('bytes per block (Forsberg 1988 packet layout)', () => {
  it('128/sum = 3 + 128 + 1 = 132; 128/crc = 133; 1024/sum = 1028; 1024/crc = 1029', () => {
    assert.equal(bytesPerBlock(128, 'sum'), 132);
    assert.equal(bytesPerBlock(128, 'crc'), 133);
    assert.equal(bytesPerBlock(1024, 'sum'), 1028);
    assert.equal(bytesPerBlock(1024, 'crc'), 1029);
  });
});

describe('transfer plans worked by hand', () => {
  it('an exact multiple of the block: 256 bytes, 128/crc, 115200 baud', () => {
    // 256 / 128 = 2 blocks, no padding; 2 × 133 + 1 EOT = 267 bytes; 267 × 10 / 115200 = 0.023177… s
    const p = planXmodemTransfer({ bytes: 256, block: 128, check: 'crc', baud: 115200 });
    assert.equal(p.blocks, 2);
    assert.equal(p.paddingBytes, 0);
    assert.equal(p.wireBytes, 267);
    close(p.seconds, 2670 / 115200);
  });

  it('one byte over: 257 bytes, 128/crc', () => {
    // ceil(257 / 128) = 3 blocks; 3 × 128 − 257 = 127 SUB bytes; 3 × 133 + 1 = 400 bytes
    const p = planXmodemTransfer({ bytes: 257, block: 128, check: 'crc', baud: 115200 });
    assert.deepEqual([p.blocks, p.paddingBytes, p.wireBytes], [3, 127, 400]);
    close(p.seconds, 4000 / 115200);
  });

  it('a single byte: 1 byte, 128/sum, 9600 baud', () => {
    // 1 block, 127 SUB bytes, 132 + 1 = 133 bytes, 1330 / 9600 = 0.138541… s
    const p = planXmodemTransfer({ bytes: 1, block: 128, check: 'sum', baud: 9600 });
    assert.deepEqual([p.blocks, p.paddingBytes, p.wireBytes], [1, 127, 133]);
    close(p.seconds, 0.13854166666666667);
  });

  it('1K blocks: 1 MiB, 1024/crc, 115200 baud', () => {
    // 1 048 576 / 1024 = 1024 blocks, no padding; 1024 × 1029 + 1 = 1 053 697 bytes;
    // 10 536 970 / 115200 = 91.466753… s (about 1 min 31 s)
    const p = planXmodemTransfer({ bytes: 1_048_576, block: 1024, check: 'crc', baud: 115200 });
    assert.deepEqual([p.blocks, p.paddingBytes, p.wireBytes], [1024, 0, 1_053_697]);
    close(p.seconds, 91.46675347222222);
  });

  it('1K blocks with a partial last block: 3000 bytes, 1024/crc', () => {
    // ceil(3000 / 1024) = 3 blocks; 3072 − 3000 = 72 SUB; 3 × 1029 + 1 = 3088 bytes
    const p = planXmodemTransfer({ bytes: 3000, block: 1024, check: 'crc', baud: 57600 });
    assert.deepEqual([p.blocks, p.paddingBytes, p.wireBytes], [3, 72, 3088]);
    close(p.seconds, 30880 / 57600);
  });

  it('sum versus crc: the CRC costs one more byte per block', () => {
    // 128 KiB in 128-byte blocks = 1024 blocks: sum 1024 × 132 + 1 = 135 169, crc 1024 × 133 + 1 = 136 193
    const sum = planXmodemTransfer({ bytes: 131_072, block: 128, check: 'sum', baud: 115200 });
    const crc = planXmodemTransfer({ bytes: 131_072, block: 128, check: 'crc', baud: 115200 });
    assert.equal(sum.wireBytes, 135_169);
    assert.equal(crc.wireBytes, 136_193);
    assert.equal(crc.wireBytes - sum.wireBytes, crc.blocks);
  });

  it('more than 255 blocks (the block number wraps on the wire): 40 000 bytes, 128/crc', () => {
    // ceil(40000 / 128) = 313 blocks (312.5); 313 × 128 = 40 064, so 64 SUB; 313 × 133 + 1 = 41 630
    const p = planXmodemTransfer({ bytes: 40_000, block: 128, check: 'crc', baud: 38400 });
    assert.deepEqual([p.blocks, p.paddingBytes, p.wireBytes], [313, 64, 41_630]);
    close(p.seconds, 416_300 / 38400);
    assert.equal(blockNumberOnWire(p.blocks), 313 - 256); // the last block goes out as 0x39 (57)
  });

  it('several bauds for the same 1 MiB, 1024/crc image (1 053 697 bytes on the wire)', () => {
    const cases: [number, number][] = [
      [9600, 10_536_970 / 9600], // about 18 min 18 s
      [57600, 10_536_970 / 57600], // about 3 min 3 s
      [115200, 91.46675347222222],
      [921600, 11.433344184027778],
    ];
    for (const [baud, seconds] of cases) {
      close(planXmodemTransfer({ bytes: 1_048_576, block: 1024, check: 'crc', baud }).seconds, seconds);
    }
  });

  it('time is inversely proportional to baud over every usual rate', () => {
    const at1200 = planXmodemTransfer({ bytes: 65_536, block: 128, check: 'crc', baud: 1200 }).seconds;
    for (const baud of SERIAL_BAUDS) {
      close(planXmodemTransfer({ bytes: 65_536, block: 128, check: 'crc', baud }).seconds * baud, at1200 * 1200);
    }
  });
});

describe('refused plans', () => {
  const base = { bytes: 1000, block: 128, check: 'crc', baud: 115200 } as const;
  const field = (fn: () => unknown) => {
    try {
      fn();
    } catch (e) {
      assert.ok(e instanceof CalcInputError);
      return e.field;
    }
    assert.fail('expected a CalcInputError');
  };
  it('zero bytes is refused: an empty image is not a transfer', () => {
    assert.equal(field(() => planXmodemTransfer({ ...base, bytes: 0 })), 'bytes');
  });
  it('negative or fractional sizes, unknown block sizes and modes, and non-positive bauds are refused', () => {
    assert.equal(field(() => planXmodemTransfer({ ...base, bytes: -5 })), 'bytes');
    assert.equal(field(() => planXmodemTransfer({ ...base, bytes: 10.5 })), 'bytes');
    assert.equal(field(() => planXmodemTransfer({ ...base, block: 512 as 128 })), 'block');
    assert.equal(field(() => planXmodemTransfer({ ...base, check: 'crc32' as 'crc' })), 'check');
    assert.equal(field(() => planXmodemTransfer({ ...base, baud: 0 })), 'baud');
  });
});

describe('block numbers on the wire (first block is 1; sent modulo 256)', () => {
  it('counts 1, 2, … 255, then wraps to 0x00, 0x01', () => {
    assert.equal(blockNumberOnWire(1), 0x01);
    assert.equal(blockNumberOnWire(2), 0x02);
    assert.equal(blockNumberOnWire(255), 0xff);
    assert.equal(blockNumberOnWire(256), 0x00);
    assert.equal(blockNumberOnWire(257), 0x01);
    assert.equal(blockNumberOnWire(512), 0x00);
  });
  it('the complement is 255 − number', () => {
    assert.equal(blockComplementOnWire(1), 0xfe);
    assert.equal(blockComplementOnWire(255), 0x00);
    assert.equal(blockComplementOnWire(256), 0xff);
  });
  it('block 0 does not exist', () => {
    assert.throws(() => blockNumberOnWire(0), CalcInputError);
  });
});

describe('percent done', () => {
  it('is the share of acknowledged blocks', () => {
    assert.equal(percentDone(0, 313), 0);
    close(percentDone(156, 313), 49.840255591054316);
    assert.equal(percentDone(313, 313), 100);
  });
  it('refuses blocks beyond the transfer or a transfer of no blocks', () => {
    assert.throws(() => percentDone(314, 313), CalcInputError);
    assert.throws(() => percentDone(-1, 313), CalcInputError);
    assert.throws(() => percentDone(0, 0), CalcInputError);
  });
});
