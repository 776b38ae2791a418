// XMODEM transfer plan for a firmware image: how many blocks, how much SUB padding, how many
// bytes cross the wire, and how long that takes at a baud rate. The reflash screen uses it to say
// how long the supply must stay stable.
//
// Source: Chuck Forsberg, "XMODEM/YMODEM Protocol Reference" (1988), packet layout:
//   <SOH|STX> <blk #> <255 - blk #> <128 or 1024 data bytes> <checksum (1 byte) | CRC-16 (2 bytes)>
// SOH (0x01) heads a 128-byte block, STX (0x02) a 1024-byte block (XMODEM-1K). Block numbers start
// at 1 and are sent modulo 256 (…, 0xFF, 0x00, 0x01, …). The last block is filled up with SUB
// (0x1A, CP/M end of file) bytes. After the last block the sender sends EOT (0x04).
// The arithmetic checksum is the sum of the data bytes modulo 256; the CRC is CRC-16/XMODEM.
// Time assumes 10 bits per byte on the line (8N1: start bit, 8 data bits, stop bit) and counts only
// the sender's bytes: the receiver's ACK/NAK/'C' replies and turnaround delays are not included,
// so the real transfer takes somewhat longer than `seconds`.
//
// Zero bytes: an empty image is refused (CalcInputError on `bytes`, so the API answers 400). A
// sender would send nothing but EOT, which is never a useful firmware transfer.

import { CalcInputError } from './input-error';

export const XMODEM_BLOCK_SIZES = [128, 1024] as const;
export type XmodemBlockSize = (typeof XMODEM_BLOCK_SIZES)[number];

export const XMODEM_CHECK_MODES = ['sum', 'crc'] as const;
/** 'sum': 8-bit arithmetic checksum (1 byte); 'crc': CRC-16/XMODEM (2 bytes). */
export type XmodemCheckMode = (typeof XMODEM_CHECK_MODES)[number];

/** The usual asynchronous serial rates of bench computers and USB-serial adapters (common practice, no published source). */
export const SERIAL_BAUDS = [1200, 2400, 4800, 9600, 19200, 38400, 57600, 115200, 230400, 460800, 921600] as const;
export type SerialBaud = (typeof SERIAL_BAUDS)[number];

/** Largest image the plan accepts: 1 GiB (far above any transceiver firmware; keeps every figure exact in a double). */
export const XMODEM_MAX_BYTES = 1024 * 1024 * 1024;

/** Bits on the line per byte with 8N1 framing. */
export const BITS_PER_BYTE_8N1 = 10;

export const SUB_PAD_BYTE = 0x1a;

export interface XmodemPlan {
  /** Data blocks sent. */
  blocks: number;
  /** SUB (0x1A) bytes filling the last block. */
  paddingBytes: number;
  /** Every block's header (SOH/STX, number, complement), data and check bytes, plus the closing EOT. */
  wireBytes: number;
  /** wireBytes × 10 / baud. */
  seconds: number;
}

export interface XmodemPlanInput {
  bytes: number;
  block: XmodemBlockSize;
  check: XmodemCheckMode;
  baud: number;
}

/** Bytes on the wire for one block: 1 header + 1 block number + 1 complement + data + check. */
export function bytesPerBlock(block: XmodemBlockSize, check: XmodemCheckMode): number {
  return 3 + block + (check === 'crc' ? 2 : 1);
}

export function planXmodemTransfer({ bytes, block, check, baud }: XmodemPlanInput): XmodemPlan {
  if (!Number.isInteger(bytes)) throw new CalcInputError('bytes', 'The image size must be a whole number of bytes.');
  if (bytes <= 0) throw new CalcInputError('bytes', 'The image is empty: there is nothing to send.');
  if (bytes > XMODEM_MAX_BYTES) throw new CalcInputError('bytes', 'The image is larger than 1 GiB.');
  if (!(XMODEM_BLOCK_SIZES as readonly number[]).includes(block)) {
    throw new CalcInputError('block', 'Block size must be 128 (SOH) or 1024 (STX, XMODEM-1K).');
  }
  if (!(XMODEM_CHECK_MODES as readonly string[]).includes(check)) {
    throw new CalcInputError('check', "Check mode must be 'sum' (checksum) or 'crc' (CRC-16).");
  }
  if (!Number.isFinite(baud) || baud <= 0) throw new CalcInputError('baud', 'The baud rate must be more than 0.');
  const blocks = Math.ceil(bytes / block);
  const paddingBytes = blocks * block - bytes;
  const wireBytes = blocks * bytesPerBlock(block, check) + 1;
  return { blocks, paddingBytes, wireBytes, seconds: (wireBytes * BITS_PER_BYTE_8N1) / baud };
}

/** The block-number byte sent for the k-th block (k = 1 for the first): k modulo 256. */
export function blockNumberOnWire(k: number): number {
  if (!Number.isInteger(k) || k < 1) throw new CalcInputError('block', 'Blocks are counted from 1.');
  return k & 0xff;
}

/** The complement byte that follows the block number (255 − number). */
export function blockComplementOnWire(k: number): number {
  return 0xff - blockNumberOnWire(k);
}

/** Share of the transfer done after `blockN` of `blocks` blocks were acknowledged, 0–100. */
export function percentDone(blockN: number, blocks: number): number {
  if (!Number.isInteger(blocks) || blocks < 1) throw new CalcInputError('blocks', 'A transfer has at least one block.');
  if (!Number.isInteger(blockN) || blockN < 0 || blockN > blocks) {
    throw new CalcInputError('block', `The block must be between 0 and ${blocks}.`);
  }
  return (blockN / blocks) * 100;
}
