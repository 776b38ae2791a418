// The practice unit: a simulated radio display unit with a serial bootloader, so that volunteers can
// rehearse a reflash without a radio and the browser tests can flash through it. It is our own
// invention (its banner, menu and wording are ours) and says plainly that it is a simulation.
//
// Like the XMODEM engines it is a transport-free state machine: fed the bytes the bench computer
// sends and timer ticks, it answers with the bytes the unit would print. The Flasher runs it in a
// Web Worker behind the same port interface as Web Serial; the line timing (10 bits a byte at the
// chosen baud) is the transport's job. It receives images with the XMODEM receiver engine.
//
// The procedure it teaches is the common one for serial bootloaders (common practice, no published
// source): power on, press a key within the boot window (about two seconds here) to stop in the
// loader, erase, start the receive, send the image by XMODEM, then boot the new image.

import { crc16XmodemUpdate } from './crc16-xmodem';
import { XmodemReceiver } from './xmodem-receiver';
import type { XmodemStep } from './xmodem-wire';

export interface PracticeFaults {
  /** Probability that any one bit the unit receives is flipped (line noise), e.g. 1e-5. */
  bitErrorRate?: number;
  /** Drops the n-th byte (0-based) the unit receives during the transfer. */
  dropByteAt?: number;
  /** The supply dips when block n (1-based) starts arriving: the unit restarts mid-transfer. */
  powerDipAtBlock?: number;
  /** The unit ignores keys in its boot window (the key came too late). */
  missBootWindow?: boolean;
  /** The bench computer's baud rate differs from the unit's: both directions turn to garbage. */
  baudMismatch?: boolean;
}

export interface PracticeUnitOptions {
  /** What the unit runs before the flash. */
  installedVersion?: string;
  /** The image the Flasher is about to send: its length, CRC-16/XMODEM and version, as in the library. */
  expected: { length: number; crc16: number; version: string };
  faults?: PracticeFaults;
  bootWindowMs?: number;
  eraseMs?: number;
  /** A random source in [0, 1), seeded in tests. */
  random?: () => number;
}

export type PracticeUnitState = 'off' | 'boot-window' | 'menu' | 'erasing' | 'receiving' | 'running';

export type PracticeUnitEvent =
  | { kind: 'state'; state: PracticeUnitState }
  | { kind: 'power-dip'; block: number }
  | { kind: 'flashed'; ok: boolean; version: string | null }
  | { kind: 'transfer'; step: XmodemStep['events'][number] };

export interface PracticeUnitStep {
  send: Uint8Array[];
  events: PracticeUnitEvent[];
}

const text = (s: string) => new TextEncoder().encode(s);
const RESTART_MS = 400;

export const PRACTICE_MENU = 'Loader menu (practice unit):\r\n  E  erase the application area\r\n  R  receive a new image by XMODEM\r\n  B  boot the application\r\n> ';

/** A simple seeded generator for repeatable faults (mulberry32; any uniform source would do). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export class PracticeUnit {
  private stateValue: PracticeUnitState = 'off';
  private deadline: number | null = null;
  private application: { version: string } | null;
  private erased = false;
  private receiver: XmodemReceiver | null = null;
  private receivedInTransfer = 0;
  private dipped = false;
  private readonly faults: PracticeFaults;
  private readonly random: () => number;
  private readonly bootWindowMs: number;
  private readonly eraseMs: number;

  constructor(private readonly options: PracticeUnitOptions) {
    this.faults = options.faults ?? {};
    this.random = options.random ?? Math.random;
    this.bootWindowMs = options.bootWindowMs ?? 2000;
    this.eraseMs = options.eraseMs ?? 1500;
    this.application = options.installedVersion ? { version: options.installedVersion } : null;
  }

  get state(): PracticeUnitState {
    return this.stateValue;
  }

  get nextDeadline(): number | null {
    return this.receiver && this.stateValue === 'receiving' ? this.receiver.nextDeadline : this.deadline;
  }

  /** The version now in the application area, or null when it is erased or damaged. */
  get runningVersion(): string | null {
    return this.application?.version ?? null;
  }

  powerOn(now: number): PracticeUnitStep {
    const step: PracticeUnitStep = { send: [], events: [] };
    this.receiver = null;
    this.setState('boot-window', step);
    this.deadline = now + this.bootWindowMs;
    this.print(
      step,
      '\r\nRigwright practice unit: a SIMULATED display unit, no radio attached.\r\n' +
        'Serial loader 1.0. Press any key within 2 s to stop in the loader.\r\n',
    );
    return step;
  }

  receive(bytes: Uint8Array, now: number): PracticeUnitStep {
    const step: PracticeUnitStep = { send: [], events: [] };
    const input = this.faults.baudMismatch ? bytes.map((b) => (b * 37 + 11) & 0xff) : bytes;
    switch (this.stateValue) {
      case 'boot-window':
        if (!this.faults.missBootWindow && input.length > 0) {
          this.deadline = null;
          this.setState('menu', step);
          this.print(step, 'Stopped in the loader.\r\n' + PRACTICE_MENU);
        }
        break;
      case 'menu':
        for (const b of input) this.menuKey(String.fromCharCode(b).toUpperCase(), now, step);
        break;
      case 'receiving':
        this.feedTransfer(input, now, step);
        break;
      default:
        break; // off, erasing, running: the unit does not listen
    }
    return step;
  }

  tick(now: number): PracticeUnitStep {
    const step: PracticeUnitStep = { send: [], events: [] };
    if (this.stateValue === 'receiving' && this.receiver) {
      this.afterTransferStep(this.receiver.tick(now), step);
      return step;
    }
    if (this.deadline === null || now < this.deadline) return step;
    this.deadline = null;
    switch (this.stateValue) {
      case 'off':
        return this.powerOn(now);
      case 'boot-window':
        this.boot(step);
        break;
      case 'erasing':
        this.erased = true;
        this.setState('menu', step);
        this.print(step, 'done.\r\n> ');
        break;
    }
    return step;
  }

  private menuKey(key: string, now: number, step: PracticeUnitStep): void {
    if (key === '\r' || key === '\n' || key === ' ') return;
    if (key === 'E') {
      this.application = null;
      this.setState('erasing', step);
      this.deadline = now + this.eraseMs;
      this.print(step, 'E\r\nErasing the application area... ');
    } else if (key === 'R') {
      if (!this.erased) {
        this.print(step, 'R\r\nErase first (E): the application area still holds an image.\r\n> ');
        return;
      }
      this.print(step, 'R\r\nReady to receive the image by XMODEM with a 16-bit check. Start sending now.\r\n');
      this.setState('receiving', step);
      this.receiver = new XmodemReceiver({ check: 'crc' });
      this.receivedInTransfer = 0;
      this.afterTransferStep(this.receiver.start(now), step);
    } else if (key === 'B') {
      this.print(step, 'B\r\n');
      this.boot(step);
    } else {
      this.print(step, `?\r\n${PRACTICE_MENU}`);
    }
  }

  private feedTransfer(input: Uint8Array, now: number, step: PracticeUnitStep): void {
    const receiver = this.receiver!;
    const kept: number[] = [];
    for (const original of input) {
      const index = this.receivedInTransfer++;
      if (this.faults.dropByteAt === index) continue;
      let b = original;
      const ber = this.faults.bitErrorRate ?? 0;
      if (ber > 0) for (let bit = 0; bit < 8; bit++) if (this.random() < ber) b ^= 1 << bit;
      kept.push(b);
    }
    const dipAt = this.faults.powerDipAtBlock;
    if (dipAt !== undefined && !this.dipped && receiver.blocksReceived >= dipAt - 1 && kept.length > 0) {
      // The supply dips as block `dipAt` arrives: the unit goes dark and starts again.
      this.dipped = true;
      step.events.push({ kind: 'power-dip', block: dipAt });
      this.receiver = null;
      this.erased = false;
      this.application = null; // a half-written image does not start
      this.setState('off', step);
      this.deadline = now + RESTART_MS;
      this.print(step, '\r\n\x00\xff\x00');
      return;
    }
    this.afterTransferStep(receiver.receive(Uint8Array.from(kept), now), step);
  }

  private afterTransferStep(t: XmodemStep, step: PracticeUnitStep): void {
    step.send.push(...t.send);
    for (const e of t.events) step.events.push({ kind: 'transfer', step: e });
    const receiver = this.receiver!;
    if (!receiver.finished) return;
    this.receiver = null;
    this.setState('menu', step);
    if (receiver.state !== 'done') {
      this.print(step, '\r\nTransfer stopped: the application area is incomplete. Erase and receive again.\r\n> ');
      this.erased = false;
      return;
    }
    const { length, crc16, version } = this.options.expected;
    const data = receiver.data();
    const got = length <= data.length ? crc16XmodemUpdate(data.subarray(0, length)) : -1;
    const ok = got === crc16;
    const hex = (n: number) => n.toString(16).padStart(4, '0');
    if (ok) {
      this.application = { version };
      this.print(step, `\r\nImage received, ${length} bytes, CRC-16 ${hex(got)}: check passed.\r\n> `);
    } else {
      this.application = null;
      this.print(step, `\r\nImage received but its check FAILED (CRC-16 ${got < 0 ? 'short image' : hex(got)}, expected ${hex(crc16)}). Erase and receive again.\r\n> `);
    }
    this.erased = false;
    step.events.push({ kind: 'flashed', ok, version: ok ? version : null });
  }

  private boot(step: PracticeUnitStep): void {
    if (this.application) {
      this.setState('running', step);
      this.print(step, `Starting the application...\r\nDisplay unit running firmware ${this.application.version}.\r\n`);
    } else {
      this.setState('menu', step);
      this.print(step, 'No valid application image: staying in the loader.\r\n' + PRACTICE_MENU);
    }
  }

  private print(step: PracticeUnitStep, message: string): void {
    const bytes = text(message);
    step.send.push(this.faults.baudMismatch ? bytes.map((b) => (b * 73 + 5) & 0xff) : bytes);
  }

  private setState(state: PracticeUnitState, step: PracticeUnitStep): void {
    this.stateValue = state;
    step.events.push({ kind: 'state', state });
  }
}
