// What the XMODEM sender and receiver engines share: the control bytes, the block layout, the
// timeouts and retry limits, and the events they report. Plain TypeScript with no Node or DOM
// imports: the engines run in the browser (the Flasher and its simulated unit) and in Node (tests).
//
// Source for every value here unless said otherwise: Chuck Forsberg (ed.), "XMODEM/YMODEM Protocol
// Reference", formatted 10-14-88 (revision of June 18 1988); section numbers are that document's.

import { crc16XmodemUpdate } from './crc16-xmodem';
import { SUB_PAD_BYTE, blockNumberOnWire, type XmodemBlockSize, type XmodemCheckMode } from './xmodem';

/** §7.1 Definitions; STX from §4.3 (XMODEM-1k), 'C' from §4.2 (CRC-16 option). */
export const SOH = 0x01;
export const STX = 0x02;
export const EOT = 0x04;
export const ACK = 0x06;
export const NAK = 0x15;
export const CAN = 0x18;
/** 'C': the receiver asks for CRC-16 instead of the arithmetic checksum (§4.2, §8.2.1). */
export const CRC_REQUEST = 0x43;

export const XMODEM_TIMING = {
  /** §7.3.1: "All errors are retried 10 times." */
  maxRetries: 10,
  /** §7.3.2: "The receiver has a 10-second timeout. It sends a <nak> every time it times out." */
  receiverWaitMs: 10_000,
  /** §7.3.2: "Once into a receiving a block, the receiver goes into a one-second timeout for each character". */
  receiverCharMs: 1_000,
  /** §7.4: PURGE waits for the line to clear with a 1-second timeout before the <nak> is sent. */
  receiverPurgeQuietMs: 1_000,
  /** §8.2.1: after sending 'C' the receiver "will wait up to 3 seconds for the <soh>". */
  crcHandshakeMs: 3_000,
  /** §8.3 Figure 13 shows four 'C' (3 s apart) before the receiver falls back to <nak> and checksum. */
  crcHandshakeTries: 4,
  /** §7.3.3: "While waiting for transmission to begin, the sender has only a single very long timeout, say one minute." */
  senderStartMs: 60_000,
  /** §7.3.3: "In the current protocol, the sender has a 10 second timeout before retrying." */
  senderReplyMs: 10_000,
} as const;

export type XmodemTiming = { -readonly [K in keyof typeof XMODEM_TIMING]: number };

/**
 * §4.1 "Graceful Abort": two consecutive CAN bytes abort a transfer (one alone could be a line
 * hit); YAM sends eight when it aborts. From memory of §4.1, which the stored copy we read did not
 * reach; the two-CAN rule is also what lrzsz honours (checked in the interop tests).
 */
export const CANCEL_SEQUENCE = new Uint8Array(8).fill(CAN);

/** Why a block (or the closing EOT) went out again, or why a receiver asked again. */
export type RetryReason =
  | 'nak' // the receiver refused the block
  | 'timeout' // no answer within the protocol's timeout
  | 'bad-header' // block number and its complement do not match
  | 'bad-check' // checksum or CRC-16 mismatch
  | 'short-block' // a character did not arrive within 1 s inside a block
  | 'no-start'; // the sender did not start after 'C' or <nak>

export const RETRY_REASON_TEXT: Record<RetryReason, string> = {
  nak: 'the unit refused the block (NAK)',
  timeout: 'no answer in time',
  'bad-header': 'the block number was damaged',
  'bad-check': 'the checksum did not match',
  'short-block': 'bytes went missing inside the block',
  'no-start': 'the sender did not start yet',
};

export type XmodemEvent =
  | { kind: 'waiting' }
  | { kind: 'mode'; check: XmodemCheckMode }
  | { kind: 'block-sent'; block: number; blocks: number; attempt: number }
  | { kind: 'block-acknowledged'; block: number; blocks: number }
  | { kind: 'block-received'; block: number; bytes: number }
  | { kind: 'duplicate-block'; block: number }
  | { kind: 'retry'; block: number; reason: RetryReason; retries: number }
  | { kind: 'cancelled'; by: 'peer' | 'us'; block: number; reason: string }
  | { kind: 'failed'; block: number; reason: string }
  | { kind: 'done'; blocks: number; retries: number };

/** What one call into an engine produced: bytes to put on the line (in order) and events. */
export interface XmodemStep {
  send: Uint8Array[];
  events: XmodemEvent[];
}

export type XmodemEndState = 'done' | 'cancelled' | 'failed';

/** The 8-bit arithmetic checksum: "the sum of the data bytes only. Toss any carry." (§7.2, Figure 9). */
export function checksum8(data: Uint8Array): number {
  let sum = 0;
  for (let i = 0; i < data.length; i++) sum = (sum + data[i]) & 0xff;
  return sum;
}

/** Bytes of the block check: 1 (checksum) or 2 (CRC-16, high byte first: §8 Figure 11). */
export function checkLength(check: XmodemCheckMode): number {
  return check === 'crc' ? 2 : 1;
}

/**
 * One block on the wire: SOH|STX, block number, its ones complement, the data padded with SUB to
 * the block size, then the checksum or the CRC-16 (high byte first). `k` counts from 1.
 */
export function encodeBlock(image: Uint8Array, k: number, size: XmodemBlockSize, check: XmodemCheckMode): Uint8Array {
  const out = new Uint8Array(3 + size + checkLength(check));
  out[0] = size === 1024 ? STX : SOH;
  out[1] = blockNumberOnWire(k);
  out[2] = 0xff - out[1];
  const start = (k - 1) * size;
  const chunk = image.subarray(start, Math.min(start + size, image.length));
  const data = out.subarray(3, 3 + size);
  data.set(chunk);
  data.fill(SUB_PAD_BYTE, chunk.length);
  if (check === 'crc') {
    const crc = crc16XmodemUpdate(data);
    out[3 + size] = crc >>> 8;
    out[4 + size] = crc & 0xff;
  } else {
    out[3 + size] = checksum8(data);
  }
  return out;
}

/** Whether a received block's data matches its check bytes. */
export function blockCheckMatches(data: Uint8Array, checkBytes: Uint8Array, check: XmodemCheckMode): boolean {
  if (check === 'crc') return crc16XmodemUpdate(data) === ((checkBytes[0] << 8) | checkBytes[1]);
  return checksum8(data) === checkBytes[0];
}

export const emptyStep = (): XmodemStep => ({ send: [], events: [] });
