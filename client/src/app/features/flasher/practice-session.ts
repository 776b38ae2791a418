// The practice unit on a simulated serial line: bytes take their real time on the wire (10 bits a
// byte at the baud rate, 8N1) in each direction, and the unit's own timers run. Runs inside the
// practice Web Worker (practice-unit.worker.ts); the clock is injected so tests can use fake timers.
import { PracticeUnit, type PracticeFaults, type PracticeUnitEvent, type PracticeUnitOptions } from '@domain/practice-unit';
import { BITS_PER_BYTE_8N1 } from '@domain/xmodem';

export interface PracticeSessionOptions {
  /** The baud rate the bench computer opened the port with. */
  hostBaud: number;
  /** The baud rate the simulated unit really uses; a different host baud turns the line to garbage. */
  unitBaud: number;
  unit: Omit<PracticeUnitOptions, 'faults'> & { faults?: Omit<PracticeFaults, 'baudMismatch'> };
}

export interface SessionClock {
  now(): number;
  setTimeout(fn: () => void, ms: number): unknown;
  clearTimeout(handle: unknown): void;
}

/** One direction of the line: chunks queue behind each other and arrive after their time on the wire. */
class LineDirection {
  private freeAt = 0;
  constructor(
    private readonly clock: SessionClock,
    private readonly msPerByte: number,
    private readonly deliver: (bytes: Uint8Array) => void,
  ) {}

  send(bytes: Uint8Array): void {
    if (bytes.length === 0) return;
    const now = this.clock.now();
    const start = Math.max(now, this.freeAt);
    this.freeAt = start + bytes.length * this.msPerByte;
    this.clock.setTimeout(() => this.deliver(bytes), this.freeAt - now);
  }
}

export class PracticeSession {
  readonly unit: PracticeUnit;
  private readonly toUnit: LineDirection;
  private readonly toHost: LineDirection;
  private timer: unknown = null;
  private stopped = false;

  constructor(
    options: PracticeSessionOptions,
    private readonly clock: SessionClock,
    emit: (bytes: Uint8Array) => void,
    private readonly onEvent: (event: PracticeUnitEvent) => void = () => {},
  ) {
    this.unit = new PracticeUnit({
      ...options.unit,
      faults: { ...options.unit.faults, baudMismatch: options.hostBaud !== options.unitBaud },
    });
    const msPerByte = (BITS_PER_BYTE_8N1 / options.unitBaud) * 1000;
    this.toHost = new LineDirection(clock, msPerByte, (b) => !this.stopped && emit(b));
    this.toUnit = new LineDirection(clock, msPerByte, (b) => this.apply(this.unit.receive(b, this.clock.now())));
  }

  powerOn(): void {
    this.apply(this.unit.powerOn(this.clock.now()));
  }

  /** Bytes the bench computer writes to the port. */
  write(bytes: Uint8Array): void {
    if (!this.stopped) this.toUnit.send(bytes);
  }

  stop(): void {
    this.stopped = true;
    if (this.timer !== null) this.clock.clearTimeout(this.timer);
    this.timer = null;
  }

  private apply(step: { send: Uint8Array[]; events: PracticeUnitEvent[] }): void {
    if (this.stopped) return;
    for (const bytes of step.send) this.toHost.send(bytes);
    for (const event of step.events) this.onEvent(event);
    this.schedule();
  }

  /** One timer at the unit's next deadline (its boot window, erase time or XMODEM timeouts). */
  private schedule(): void {
    if (this.timer !== null) this.clock.clearTimeout(this.timer);
    this.timer = null;
    const due = this.unit.nextDeadline;
    if (due === null) return;
    this.timer = this.clock.setTimeout(() => {
      this.timer = null;
      this.apply(this.unit.tick(this.clock.now()));
    }, Math.max(0, due - this.clock.now()));
  }
}
