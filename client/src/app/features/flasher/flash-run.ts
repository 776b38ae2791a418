// One run of the Flasher: our XMODEM sender engine driven over a SerialLink with real timers, its
// progress as a signal, and the serial log as it goes. Framework-light on purpose (signals only), so
// that the page stays thin and the tests run it with fake timers against the practice unit.
import { signal } from '@angular/core';
import { XmodemSender } from '@domain/xmodem-sender';
import { RETRY_REASON_TEXT, type RetryReason, type XmodemEvent, type XmodemStep } from '@domain/xmodem-wire';
import { bytesPerBlock, BITS_PER_BYTE_8N1, type XmodemBlockSize } from '@domain/xmodem';
import type { SerialLink } from './serial-link';

/** How a run ended, in the words of the flash-attempt record. */
export type FlashOutcome =
  | { kind: 'bootloader_not_entered'; block: 0; reason: string }
  | { kind: 'transfer_failed'; block: number; reason: string }
  | { kind: 'transfer_completed'; block: number; reason: string };

export interface FlashProgress {
  phase: 'waiting' | 'sending' | 'closing' | 'ended';
  /** Blocks acknowledged. */
  acknowledged: number;
  blocks: number;
  bytesSent: number;
  elapsedMs: number;
  /** Image bytes acknowledged per second so far. */
  rate: number;
  /** Seconds left at the line rate for the blocks still to go, or null before the start. */
  secondsLeft: number | null;
  retries: { block: number; reason: RetryReason; text: string }[];
  /** The unit printed text in the middle of the transfer (a restart banner, a loader menu): it may have reset. */
  unitTalkedMidTransfer: boolean;
  outcome: FlashOutcome | null;
}

export interface FlashRunOptions {
  block: XmodemBlockSize;
  baud: number;
  now?: () => number;
  setTimer?: (fn: () => void, ms: number) => unknown;
  clearTimer?: (handle: unknown) => void;
}

const printable = (bytes: Uint8Array) =>
  Array.from(bytes, (b) => (b === 0x0a || b === 0x0d || (b >= 0x20 && b < 0x7f) ? String.fromCharCode(b) : '')).join('');

export class FlashRun {
  readonly progress;
  /** The serial log: what the unit printed, and one line per protocol event, with times. */
  readonly log: string[] = [];
  private readonly sender: XmodemSender;
  private readonly now: () => number;
  private readonly setTimer: (fn: () => void, ms: number) => unknown;
  private readonly clearTimer: (handle: unknown) => void;
  private readonly started: number;
  private timer: unknown = null;
  private resolveEnd!: (outcome: FlashOutcome) => void;
  readonly ended: Promise<FlashOutcome>;

  constructor(private readonly link: SerialLink, image: Uint8Array, private readonly options: FlashRunOptions) {
    this.now = options.now ?? (() => performance.now());
    this.setTimer = options.setTimer ?? ((fn, ms) => setTimeout(fn, ms));
    this.clearTimer = options.clearTimer ?? ((h) => clearTimeout(h as ReturnType<typeof setTimeout>));
    this.sender = new XmodemSender(image, { block: options.block });
    this.started = this.now();
    this.progress = signal<FlashProgress>({
      phase: 'waiting',
      acknowledged: 0,
      blocks: this.sender.blocks,
      bytesSent: 0,
      elapsedMs: 0,
      rate: 0,
      secondsLeft: null,
      retries: [],
      unitTalkedMidTransfer: false,
      outcome: null,
    });
    this.ended = new Promise((resolve) => (this.resolveEnd = resolve));
    this.note(`Waiting for the unit to ask for the image (NAK or 'C'); ${this.sender.blocks} blocks of ${options.block} bytes.`);
    this.apply(this.sender.start(this.now()));
  }

  /** The check the unit asked for (null until it has asked). */
  get check(): 'crc' | 'sum' | null {
    return this.sender.check;
  }

  /** Bytes from the unit while the run is on. */
  receive(bytes: Uint8Array): void {
    if (this.sender.finished) return;
    // What the unit prints goes to the log: everything before the start, and text (not single
    // protocol bytes) during the transfer, such as the banner of a unit that restarted.
    const text = printable(bytes);
    const words = text.replace(/\s/g, '').length >= 4;
    if (text && (this.sender.state === 'waiting' || words)) this.log.push(text);
    if (words && this.sender.state !== 'waiting' && !this.progress().unitTalkedMidTransfer) {
      this.progress.update((p) => ({ ...p, unitTalkedMidTransfer: true }));
    }
    this.apply(this.sender.receive(bytes, this.now()));
  }

  /** The technician's Cancel: sends the cancel sequence and records the run as failed at the current block. */
  cancel(reason = 'Cancelled at the bench.'): void {
    this.apply(this.sender.cancel(reason));
  }

  /** The port went away mid-run (Web Serial threw, adapter unplugged). */
  lost(reason: string): void {
    if (this.sender.finished) return;
    this.sender.cancel(reason);
    this.finish({ kind: 'transfer_failed', block: this.sender.acknowledged + 1, reason });
  }

  private apply(step: XmodemStep): void {
    for (const bytes of step.send) {
      this.link.write(bytes).catch((err: Error) => this.lost(`Writing to the port failed: ${err.message}`));
    }
    for (const event of step.events) this.onEvent(event);
    this.update();
    this.schedule();
  }

  private onEvent(e: XmodemEvent): void {
    switch (e.kind) {
      case 'mode':
        this.note(`The unit asked for the image with ${e.check === 'crc' ? 'CRC-16' : 'the 8-bit checksum'}.`);
        break;
      case 'retry': {
        const text = RETRY_REASON_TEXT[e.reason];
        this.note(`Block ${e.block} sent again: ${text}.`);
        this.progress.update((p) => ({ ...p, retries: [...p.retries, { block: e.block, reason: e.reason, text }] }));
        break;
      }
      case 'done':
        this.note(`Transfer complete: ${e.blocks} blocks, ${e.retries} retries.`);
        this.finish({ kind: 'transfer_completed', block: e.blocks, reason: 'Every block was acknowledged and the end of transfer too.' });
        break;
      case 'failed':
      case 'cancelled': {
        const reason = e.kind === 'cancelled' && e.by === 'peer' ? 'The unit cancelled the transfer.' : e.reason;
        this.note(reason);
        if (this.sender.acknowledged === 0 && this.progress().phase === 'waiting') {
          this.finish({ kind: 'bootloader_not_entered', block: 0, reason });
        } else {
          this.finish({ kind: 'transfer_failed', block: Math.min(this.sender.acknowledged + 1, this.sender.blocks), reason });
        }
        break;
      }
      default:
        break;
    }
  }

  private finish(outcome: FlashOutcome): void {
    if (this.progress().outcome) return;
    if (this.timer !== null) this.clearTimer(this.timer);
    this.timer = null;
    this.progress.update((p) => ({ ...p, phase: 'ended', outcome, secondsLeft: 0 }));
    this.resolveEnd(outcome);
  }

  private update(): void {
    if (this.progress().outcome) return;
    const elapsedMs = this.now() - this.started;
    const acknowledged = this.sender.acknowledged;
    const left = this.sender.blocks - acknowledged;
    const check = this.sender.check;
    const phase = this.sender.state === 'waiting' ? 'waiting' : this.sender.state === 'closing' ? 'closing' : 'sending';
    this.progress.update((p) => ({
      ...p,
      phase,
      acknowledged,
      bytesSent: this.sender.bytesSent,
      elapsedMs,
      rate: elapsedMs > 0 ? (acknowledged * this.options.block * 1000) / elapsedMs : 0,
      secondsLeft: check ? (left * bytesPerBlock(this.options.block, check) * BITS_PER_BYTE_8N1) / this.options.baud : null,
    }));
  }

  private schedule(): void {
    if (this.timer !== null) this.clearTimer(this.timer);
    this.timer = null;
    const due = this.sender.nextDeadline;
    if (due === null) return;
    this.timer = this.setTimer(() => {
      this.timer = null;
      this.apply(this.sender.tick(this.now()));
    }, Math.max(0, due - this.now()));
  }

  private note(line: string): void {
    const t = ((this.now() - (this.started ?? this.now())) / 1000).toFixed(1);
    this.log.push(`\n[${t} s] ${line}\n`);
  }
}
