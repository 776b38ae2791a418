// A FlashRun that records itself: while it goes, its outcome so far and its serial log are kept in
// localStorage every second (a reload or a closed tab loses nothing), and when it ends, for any
// reason (done, failed, cancelled, the port lost), `finished` gives the run to save as a flash attempt.
import type { FirmwareUnit } from '@contracts/firmware';
import type { XmodemBlockSize } from '@domain/xmodem';
import { FlashRun, type FlashRunOptions } from './flash-run';
import { cleanLog, keepPendingRun, type PendingRun } from './flasher-record';
import type { SerialLink, SerialSettings } from './serial-link';

export interface RunContext {
  tag: string;
  unit: FirmwareUnit;
  firmwareId: number;
  imageVersion: string;
  blocks: number;
  settings: SerialSettings;
  block: XmodemBlockSize;
  planSeconds: number;
  /** What the terminal showed before the run (the banner, the loader commands). */
  logBefore: string;
}

export interface RecordedRunOptions extends Pick<FlashRunOptions, 'now' | 'setTimer' | 'clearTimer'> {
  storage?: Storage;
  keepEveryMs?: number;
  startedAt?: Date;
}

export class RecordedRun {
  readonly run: FlashRun;
  readonly pending: PendingRun;
  /** Resolves with the finished run, already kept in storage, ready to be saved. */
  readonly finished: Promise<PendingRun>;
  private timer: ReturnType<typeof setInterval> | null;

  constructor(link: SerialLink, image: Uint8Array, ctx: RunContext, options: RecordedRunOptions = {}) {
    const storage = options.storage ?? localStorage;
    this.run = new FlashRun(link, image, { block: ctx.block, baud: ctx.settings.baudRate, now: options.now, setTimer: options.setTimer, clearTimer: options.clearTimer });
    this.pending = {
      v: 1,
      tag: ctx.tag,
      unit: ctx.unit,
      firmwareId: ctx.firmwareId,
      imageVersion: ctx.imageVersion,
      blocks: ctx.blocks,
      port: link.label,
      settings: { ...ctx.settings },
      block: ctx.block,
      check: 'crc',
      startedAt: (options.startedAt ?? new Date()).toISOString(),
      elapsedMs: 0,
      acknowledged: 0,
      phase: 'waiting',
      retries: [],
      outcome: null,
      planSeconds: ctx.planSeconds,
      log: cleanLog(ctx.logBefore),
    };
    const keep = () => {
      const p = this.run.progress();
      Object.assign(this.pending, {
        elapsedMs: p.elapsedMs,
        acknowledged: p.acknowledged,
        phase: p.phase,
        retries: p.retries.map((r) => ({ block: r.block, text: r.text })),
        outcome: p.outcome,
        check: this.run.check ?? 'crc',
        log: cleanLog(ctx.logBefore + this.run.log.join('')),
      });
      keepPendingRun(this.pending, storage);
    };
    keep();
    this.timer = setInterval(keep, options.keepEveryMs ?? 1000);
    this.finished = this.run.ended.then(() => {
      this.stopKeeping();
      keep();
      return this.pending;
    });
  }

  /** Stops keeping the run in storage (the page goes away); what was kept stays for the next visit. */
  stopKeeping(): void {
    if (this.timer !== null) clearInterval(this.timer);
    this.timer = null;
  }
}
