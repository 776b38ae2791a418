// The XMODEM sender as a transport-free state machine: it is fed the bytes the receiver sends and
// timer ticks (the current time in ms), and answers with the bytes to put on the line and events.
// No Node or DOM imports and no timers of its own, so the same engine drives Web Serial in the
// browser, the simulated unit, and the tests (which feed it a fake clock).
//
// Protocol: Forsberg (ed.), "XMODEM/YMODEM Protocol Reference" (June 18 1988):
// - the receiver starts the transfer: <nak> for the checksum, 'C' for CRC-16 (§7.3.2, §8.2.1);
//   "Under no circumstances may a sending program use CRC-16 unless the receiver commands CRC-16" (§4.3);
// - 'C' before the first <ack> is answered as a <nak>; after it, 'C' is ignored (§8.2.3);
// - <ack> moves on, <nak> or a timeout sends the block again, 10 tries (§7.3.1, §7.3.3);
// - the sender discards what it has received when it finishes sending a block (§7.4: "the sender
//   tosses any characters in its UART buffer immediately upon completing sending a block");
// - <eot> closes and is sent again until acknowledged (§7.3.3, Figure 10);
// - two consecutive CAN cancel (§4.1).
// Every block has the chosen size (the last one padded with SUB), so a clean run puts exactly the
// transfer plan's `wireBytes` on the line (planXmodemTransfer in xmodem.ts).

import { planXmodemTransfer, type XmodemBlockSize, type XmodemCheckMode } from './xmodem';
import {
  ACK,
  CAN,
  CANCEL_SEQUENCE,
  CRC_REQUEST,
  EOT,
  NAK,
  XMODEM_TIMING,
  emptyStep,
  encodeBlock,
  RETRY_REASON_TEXT,
  type RetryReason,
  type XmodemStep,
  type XmodemTiming,
} from './xmodem-wire';

export type XmodemSenderState = 'idle' | 'waiting' | 'sending' | 'closing' | 'done' | 'cancelled' | 'failed';

export interface XmodemSenderOptions {
  block?: XmodemBlockSize;
  timing?: Partial<XmodemTiming>;
}

export class XmodemSender {
  readonly blocks: number;
  readonly blockSize: XmodemBlockSize;
  private readonly timing: XmodemTiming;
  private stateValue: XmodemSenderState = 'idle';
  private checkValue: XmodemCheckMode | null = null;
  /** The block awaiting its answer (1-based). */
  private current = 0;
  private attempt = 0;
  private retriesOfThis = 0;
  private retriesTotal = 0;
  private acknowledgedAny = false;
  private lastByteWasCan = false;
  private deadline: number | null = null;
  private sentBytes = 0;

  constructor(private readonly image: Uint8Array, options: XmodemSenderOptions = {}) {
    this.blockSize = options.block ?? 128;
    this.timing = { ...XMODEM_TIMING, ...options.timing };
    // The plan validates the size (no empty image, at most 1 GiB) and counts the blocks.
    this.blocks = planXmodemTransfer({ bytes: image.length, block: this.blockSize, check: 'crc', baud: 1 }).blocks;
  }

  get state(): XmodemSenderState {
    return this.stateValue;
  }

  /** The check the receiver asked for, once it has. */
  get check(): XmodemCheckMode | null {
    return this.checkValue;
  }

  /** Blocks acknowledged so far. */
  get acknowledged(): number {
    if (this.stateValue === 'done' || this.stateValue === 'closing') return this.blocks;
    return Math.max(0, this.current - 1);
  }

  get retries(): number {
    return this.retriesTotal;
  }

  /** Bytes this engine has put on the line (blocks, resends, EOTs and CANs). */
  get bytesSent(): number {
    return this.sentBytes;
  }

  /** When the transport should call tick() next (ms, same clock as `now`), or null. */
  get nextDeadline(): number | null {
    return this.deadline;
  }

  get finished(): boolean {
    return this.stateValue === 'done' || this.stateValue === 'cancelled' || this.stateValue === 'failed';
  }

  /** Begins waiting for the receiver's <nak> or 'C'. */
  start(now: number): XmodemStep {
    const step = emptyStep();
    if (this.stateValue !== 'idle') return step;
    this.stateValue = 'waiting';
    this.deadline = now + this.timing.senderStartMs;
    step.events.push({ kind: 'waiting' });
    return step;
  }

  /** Feeds bytes received from the line. */
  receive(bytes: Uint8Array, now: number): XmodemStep {
    const step = emptyStep();
    for (let i = 0; i < bytes.length && !this.finished; i++) {
      const b = bytes[i];
      if (b === CAN) {
        if (this.lastByteWasCan) {
          this.end('cancelled', step, { kind: 'cancelled', by: 'peer', block: this.current, reason: 'The receiver cancelled the transfer (two CAN bytes).' });
          break;
        }
        this.lastByteWasCan = true;
        continue;
      }
      this.lastByteWasCan = false;
      const sentSomething = this.onByte(b, now, step);
      // §7.4: what arrived before our block went out cannot be an answer to it.
      if (sentSomething) break;
    }
    return step;
  }

  /** Checks the timeouts; call it at (or after) nextDeadline. */
  tick(now: number): XmodemStep {
    const step = emptyStep();
    if (this.deadline === null || now < this.deadline || this.finished) return step;
    switch (this.stateValue) {
      case 'waiting':
        this.sendCancel(step);
        this.end('failed', step, {
          kind: 'failed',
          block: 0,
          reason: `The unit did not ask for the image within ${Math.round(this.timing.senderStartMs / 1000)} s (no NAK or 'C'): is its bootloader waiting to receive?`,
        });
        break;
      case 'sending':
        this.retry('timeout', now, step);
        break;
      case 'closing':
        this.retry('timeout', now, step);
        break;
    }
    return step;
  }

  /** Aborts from our side: sends the cancel sequence. */
  cancel(reason = 'Cancelled at the bench.'): XmodemStep {
    const step = emptyStep();
    if (this.finished) return step;
    this.sendCancel(step);
    this.end('cancelled', step, { kind: 'cancelled', by: 'us', block: this.current, reason });
    return step;
  }

  /** Handles one non-CAN byte; returns true when it put a block or EOT on the line. */
  private onByte(b: number, now: number, step: XmodemStep): boolean {
    switch (this.stateValue) {
      case 'waiting':
        if (b === NAK || b === CRC_REQUEST) {
          this.checkValue = b === CRC_REQUEST ? 'crc' : 'sum';
          step.events.push({ kind: 'mode', check: this.checkValue });
          this.current = 1;
          this.stateValue = 'sending';
          this.sendBlock(now, step);
          return true;
        }
        return false; // anything else before the start (boot messages, noise) is not for us
      case 'sending':
        if (b === ACK) {
          this.acknowledgedAny = true;
          step.events.push({ kind: 'block-acknowledged', block: this.current, blocks: this.blocks });
          if (this.current === this.blocks) {
            this.stateValue = 'closing';
            this.retriesOfThis = 0;
            this.put(Uint8Array.of(EOT), now, step);
          } else {
            this.current++;
            this.retriesOfThis = 0;
            this.attempt = 0;
            this.sendBlock(now, step);
          }
          return true;
        }
        if (b === NAK || (b === CRC_REQUEST && !this.acknowledgedAny)) {
          this.retry('nak', now, step);
          return true;
        }
        return false;
      case 'closing':
        if (b === ACK) {
          this.deadline = null;
          this.end('done', step, { kind: 'done', blocks: this.blocks, retries: this.retriesTotal });
          return false;
        }
        if (b === NAK) {
          this.retry('nak', now, step);
          return true;
        }
        return false;
      default:
        return false;
    }
  }

  private retry(reason: RetryReason, now: number, step: XmodemStep): void {
    this.retriesOfThis++;
    this.retriesTotal++;
    const block = this.stateValue === 'closing' ? this.blocks + 1 : this.current;
    step.events.push({ kind: 'retry', block, reason, retries: this.retriesTotal });
    if (this.retriesOfThis > this.timing.maxRetries) {
      this.sendCancel(step);
      const what = this.stateValue === 'closing' ? 'The end of transfer (EOT)' : `Block ${this.current} of ${this.blocks}`;
      this.end('failed', step, {
        kind: 'failed',
        block: this.current,
        reason: `${what} failed ${this.timing.maxRetries + 1} times; the last time ${RETRY_REASON_TEXT[reason]}.`,
      });
      return;
    }
    if (this.stateValue === 'closing') this.put(Uint8Array.of(EOT), now, step);
    else this.sendBlock(now, step);
  }

  private sendBlock(now: number, step: XmodemStep): void {
    this.attempt++;
    this.put(encodeBlock(this.image, this.current, this.blockSize, this.checkValue ?? 'sum'), now, step);
    step.events.push({ kind: 'block-sent', block: this.current, blocks: this.blocks, attempt: this.attempt });
  }

  private put(bytes: Uint8Array, now: number, step: XmodemStep): void {
    step.send.push(bytes);
    this.sentBytes += bytes.length;
    this.deadline = now + this.timing.senderReplyMs;
  }

  private sendCancel(step: XmodemStep): void {
    step.send.push(CANCEL_SEQUENCE.slice());
    this.sentBytes += CANCEL_SEQUENCE.length;
  }

  private end(state: 'done' | 'cancelled' | 'failed', step: XmodemStep, event: XmodemStep['events'][number]): void {
    this.stateValue = state;
    this.deadline = null;
    step.events.push(event);
  }
}
