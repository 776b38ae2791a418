// The XMODEM receiver as a transport-free state machine, the sender's counterpart (xmodem-sender.ts):
// fed the bytes the sender puts on the line and timer ticks, it answers with the bytes to send back
// (C, NAK, ACK, CAN) and events, and collects the data. The simulated unit of the Flasher receives
// with it, and the tests run it against lrzsz's `sx`.
//
// Protocol: Forsberg (ed.), "XMODEM/YMODEM Protocol Reference" (June 18 1988):
// - start with 'C' (CRC-16), repeated every 3 s, then fall back to <nak> and the checksum (§8.2.1,
//   §8.2.2, Figure 13); or start with <nak> for the checksum (§7.3.2);
// - wait 10 s for a block, sending <nak> at each timeout, 10 times (§7.3.2, §7.4);
// - inside a block, 1 s per character (§7.3.2); before a <nak>, purge: wait until the line has been
//   quiet for 1 s (§7.4);
// - SOH heads 128 data bytes and STX 1024, in any mixture (§4.3);
// - the expected block is acknowledged and kept; a repeat of the previous one is acknowledged and
//   dropped; any other number is a fatal loss of synchronisation: cancel (§7.3.2);
// - <eot> is acknowledged and ends the transfer (§7.3.3); two consecutive CAN cancel (§4.1).

import type { XmodemCheckMode } from './xmodem';
import {
  ACK,
  CAN,
  CANCEL_SEQUENCE,
  CRC_REQUEST,
  EOT,
  NAK,
  SOH,
  STX,
  XMODEM_TIMING,
  blockCheckMatches,
  checkLength,
  emptyStep,
  RETRY_REASON_TEXT,
  type RetryReason,
  type XmodemStep,
  type XmodemTiming,
} from './xmodem-wire';

export type XmodemReceiverState = 'idle' | 'awaiting-block' | 'in-block' | 'purging' | 'done' | 'cancelled' | 'failed';

export interface XmodemReceiverOptions {
  /** The check to ask for first; 'crc' falls back to 'sum' when the sender does not answer 'C'. */
  check?: XmodemCheckMode;
  timing?: Partial<XmodemTiming>;
}

export class XmodemReceiver {
  private readonly timing: XmodemTiming;
  private stateValue: XmodemReceiverState = 'idle';
  private checkValue: XmodemCheckMode;
  private started = false; // a first block header has arrived, so the check mode is settled
  private handshakeTries = 0;
  private expected = 1; // the block count we wait for (1-based, not wrapped)
  private errorsOfThis = 0;
  private retriesTotal = 0;
  private lastByteWasCan = false;
  private deadline: number | null = null;
  private block: Uint8Array = new Uint8Array(0);
  private filled = 0;
  private dataSize = 128;
  private pendingReason: RetryReason = 'timeout';
  private readonly chunks: Uint8Array[] = [];
  private receivedBytes = 0;

  constructor(options: XmodemReceiverOptions = {}) {
    this.checkValue = options.check ?? 'crc';
    this.timing = { ...XMODEM_TIMING, ...options.timing };
  }

  get state(): XmodemReceiverState {
    return this.stateValue;
  }

  get check(): XmodemCheckMode {
    return this.checkValue;
  }

  /** Blocks received and kept so far. */
  get blocksReceived(): number {
    return this.expected - 1;
  }

  get retries(): number {
    return this.retriesTotal;
  }

  get nextDeadline(): number | null {
    return this.deadline;
  }

  get finished(): boolean {
    return this.stateValue === 'done' || this.stateValue === 'cancelled' || this.stateValue === 'failed';
  }

  /** Everything received, SUB padding of the last block included. */
  data(): Uint8Array {
    const out = new Uint8Array(this.receivedBytes);
    let at = 0;
    for (const c of this.chunks) {
      out.set(c, at);
      at += c.length;
    }
    return out;
  }

  /** Asks the sender to begin: 'C' for CRC-16, <nak> for the checksum. */
  start(now: number): XmodemStep {
    const step = emptyStep();
    if (this.stateValue !== 'idle') return step;
    this.stateValue = 'awaiting-block';
    this.handshakeTries = 1;
    this.sendStartRequest(now, step);
    step.events.push({ kind: 'waiting' });
    return step;
  }

  receive(bytes: Uint8Array, now: number): XmodemStep {
    const step = emptyStep();
    for (let i = 0; i < bytes.length && !this.finished; i++) this.onByte(bytes[i], now, step);
    return step;
  }

  tick(now: number): XmodemStep {
    const step = emptyStep();
    if (this.deadline === null || now < this.deadline || this.finished) return step;
    switch (this.stateValue) {
      case 'awaiting-block':
        if (!this.started && this.checkValue === 'crc') {
          if (this.handshakeTries < this.timing.crcHandshakeTries) {
            this.handshakeTries++;
          } else {
            this.checkValue = 'sum'; // §8.2.1: no <soh> after the 'C's: switch to checksum mode
          }
          this.countError('no-start', step);
          if (!this.finished) this.sendStartRequest(now, step);
        } else {
          this.countError(this.started ? 'timeout' : 'no-start', step);
          if (!this.finished) this.sendStartRequest(now, step);
        }
        break;
      case 'in-block':
        this.purge('short-block', now);
        break;
      case 'purging':
        this.countError(this.pendingReason, step);
        if (!this.finished) this.sendNak(now, step);
        break;
    }
    return step;
  }

  /** Aborts from our side. */
  cancel(reason = 'Cancelled at the unit.'): XmodemStep {
    const step = emptyStep();
    if (this.finished) return step;
    step.send.push(CANCEL_SEQUENCE.slice());
    this.end('cancelled', step, { kind: 'cancelled', by: 'us', block: this.expected, reason });
    return step;
  }

  private onByte(b: number, now: number, step: XmodemStep): void {
    switch (this.stateValue) {
      case 'awaiting-block':
        if (b === CAN) {
          if (this.lastByteWasCan) {
            this.end('cancelled', step, { kind: 'cancelled', by: 'peer', block: this.expected, reason: 'The sender cancelled the transfer (two CAN bytes).' });
            return;
          }
          this.lastByteWasCan = true;
          return;
        }
        this.lastByteWasCan = false;
        if (b === SOH || b === STX) {
          if (!this.started) {
            this.started = true;
            step.events.push({ kind: 'mode', check: this.checkValue });
          }
          this.dataSize = b === STX ? 1024 : 128;
          this.block = new Uint8Array(2 + this.dataSize + checkLength(this.checkValue));
          this.filled = 0;
          this.stateValue = 'in-block';
          this.deadline = now + this.timing.receiverCharMs;
        } else if (b === EOT) {
          step.send.push(Uint8Array.of(ACK));
          this.end('done', step, { kind: 'done', blocks: this.expected - 1, retries: this.retriesTotal });
        }
        // Anything else between blocks is line noise: ignored.
        return;
      case 'in-block':
        this.block[this.filled++] = b;
        this.deadline = now + this.timing.receiverCharMs;
        if (this.filled === this.block.length) this.onBlock(now, step);
        return;
      case 'purging':
        this.deadline = now + this.timing.receiverPurgeQuietMs; // the line is not quiet yet
        return;
      default:
        return;
    }
  }

  private onBlock(now: number, step: XmodemStep): void {
    const number = this.block[0];
    const complement = this.block[1];
    if (((number + complement) & 0xff) !== 0xff) {
      this.purge('bad-header', now);
      return;
    }
    const data = this.block.subarray(2, 2 + this.dataSize);
    if (!blockCheckMatches(data, this.block.subarray(2 + this.dataSize), this.checkValue)) {
      this.purge('bad-check', now);
      return;
    }
    if (number === (this.expected & 0xff)) {
      this.chunks.push(data.slice());
      this.receivedBytes += data.length;
      step.events.push({ kind: 'block-received', block: this.expected, bytes: data.length });
      this.expected++;
      this.errorsOfThis = 0;
      this.ack(now, step);
    } else if (number === ((this.expected - 1) & 0xff) && this.expected > 1) {
      // Our ACK was lost and the sender repeated the block: acknowledge again, keep nothing.
      step.events.push({ kind: 'duplicate-block', block: this.expected - 1 });
      this.ack(now, step);
    } else {
      step.send.push(CANCEL_SEQUENCE.slice());
      this.end('failed', step, {
        kind: 'failed',
        block: this.expected,
        reason: `Lost step with the sender: block ${number} arrived while block ${this.expected & 0xff} was expected.`,
      });
    }
  }

  private ack(now: number, step: XmodemStep): void {
    step.send.push(Uint8Array.of(ACK));
    this.stateValue = 'awaiting-block';
    this.deadline = now + this.timing.receiverWaitMs;
  }

  /** §7.4: wait for the line to clear before the <nak>, so that the sender sees it. */
  private purge(reason: RetryReason, now: number): void {
    this.pendingReason = reason;
    this.stateValue = 'purging';
    this.deadline = now + this.timing.receiverPurgeQuietMs;
  }

  private sendNak(now: number, step: XmodemStep): void {
    step.send.push(Uint8Array.of(NAK));
    this.stateValue = 'awaiting-block';
    this.deadline = now + this.timing.receiverWaitMs;
  }

  private sendStartRequest(now: number, step: XmodemStep): void {
    const crc = !this.started && this.checkValue === 'crc';
    step.send.push(Uint8Array.of(crc ? CRC_REQUEST : NAK));
    this.deadline = now + (crc ? this.timing.crcHandshakeMs : this.timing.receiverWaitMs);
  }

  private countError(reason: RetryReason, step: XmodemStep): void {
    this.errorsOfThis++;
    this.retriesTotal++;
    step.events.push({ kind: 'retry', block: this.expected, reason, retries: this.retriesTotal });
    if (this.errorsOfThis > this.timing.maxRetries) {
      step.send.push(CANCEL_SEQUENCE.slice());
      this.end('failed', step, {
        kind: 'failed',
        block: this.expected,
        reason: `Block ${this.expected} failed ${this.timing.maxRetries + 1} times; the last time ${RETRY_REASON_TEXT[reason]}.`,
      });
    }
  }

  private end(state: 'done' | 'cancelled' | 'failed', step: XmodemStep, event: XmodemStep['events'][number]): void {
    this.stateValue = state;
    this.deadline = null;
    step.events.push(event);
  }
}
