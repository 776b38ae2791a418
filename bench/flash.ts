// Benchmark: a reflash of the practice unit over a simulated serial line, against the transfer plan.
// The line is simulated in virtual time (10 bits a byte at the baud rate, each direction its own
// wire, bytes delivered when their last bit has arrived); the CPU time the engines actually take for
// each call is measured with performance.now() and added to the virtual clock, so the figure shows
// the turnaround our engines add beyond the protocol's own.
//
// Prints, side by side for one image: the plan's time (wire limit), the run's time and the ratio
// (aim: at least 0.95 with no faults), and a run with line noise that damages about one block in a
// hundred, which must still complete, with the retries it reports.
import { crc16XmodemUpdate } from '../api/src/domain/crc16-xmodem';
import { PracticeUnit, seededRandom, type PracticeFaults } from '../api/src/domain/practice-unit';
import { XmodemSender } from '../api/src/domain/xmodem-sender';
import { BITS_PER_BYTE_8N1, planXmodemTransfer, type XmodemBlockSize } from '../api/src/domain/xmodem';
import type { XmodemStep } from '../api/src/domain/xmodem-wire';

const BAUD = Number(process.env.BENCH_BAUD ?? 115200);
const BYTES = Number(process.env.BENCH_IMAGE_BYTES ?? 1024 * 1024);

interface Delivery {
  at: number;
  bytes: Uint8Array;
}

/** One direction of the serial line: a chunk starts when the wire is free and arrives byte by byte. */
class Wire {
  private freeAt = 0;
  readonly queue: Delivery[] = [];
  constructor(private readonly byteSeconds: number) {}
  put(chunks: Uint8Array[], now: number) {
    for (const bytes of chunks) {
      if (bytes.length === 0) continue;
      const start = Math.max(now, this.freeAt);
      this.freeAt = start + bytes.length * this.byteSeconds;
      this.queue.push({ at: this.freeAt, bytes });
    }
  }
  next(): number {
    return this.queue.length ? this.queue[0].at : Infinity;
  }
}

function run(block: XmodemBlockSize, faults: PracticeFaults) {
  const image = Uint8Array.from({ length: BYTES }, (_, i) => (i * 131 + (i >>> 8)) & 0xff);
  const byteSeconds = BITS_PER_BYTE_8N1 / BAUD;
  const unit = new PracticeUnit({ expected: { length: image.length, crc16: crc16XmodemUpdate(image), version: 'bench' }, faults, random: seededRandom(7) });
  const toUnit = new Wire(byteSeconds);
  const toHost = new Wire(byteSeconds);
  let clock = 0; // seconds of virtual time
  let cpu = 0;
  const timed = <T>(f: () => T): T => {
    const t0 = performance.now();
    const r = f();
    const spent = (performance.now() - t0) / 1000;
    clock += spent;
    cpu += spent;
    return r;
  };
  const ms = () => clock * 1000;

  // The procedure at the unit: power on, a key in the boot window, erase, receive.
  unit.powerOn(ms());
  unit.receive(Uint8Array.of(0x20), ms());
  unit.receive(new TextEncoder().encode('e'), ms());
  clock += 2;
  unit.tick(ms());
  // The technician starts the send once the unit says it is ready: what the unit printed before
  // that went to the terminal, and the sender answers the unit's next 'C'.
  const startStep = unit.receive(new TextEncoder().encode('r'), ms());
  const sender = new XmodemSender(image, { block });
  timed(() => sender.start(ms()));
  const started = clock;
  toHost.put(startStep.send.slice(-1), clock);

  for (let guard = 0; guard < 50_000_000 && !sender.finished; guard++) {
    const senderDue = (sender.nextDeadline ?? Infinity) / 1000;
    const unitDue = (unit.nextDeadline ?? Infinity) / 1000;
    const t = Math.min(toHost.next(), toUnit.next(), senderDue, unitDue);
    if (t === Infinity) break;
    clock = Math.max(clock, t);
    if (toHost.next() <= clock) {
      const d = toHost.queue.shift()!;
      const step: XmodemStep = timed(() => sender.receive(d.bytes, ms()));
      toUnit.put(step.send, clock);
    } else if (toUnit.next() <= clock) {
      const d = toUnit.queue.shift()!;
      const step = timed(() => unit.receive(d.bytes, ms()));
      toHost.put(step.send, clock);
    } else {
      toUnit.put(timed(() => sender.tick(ms())).send, clock);
      toHost.put(timed(() => unit.tick(ms())).send, clock);
    }
  }
  const seconds = clock - started;
  const plan = planXmodemTransfer({ bytes: image.length, block, check: 'crc', baud: BAUD });
  return { state: sender.state, seconds, planSeconds: plan.seconds, ratio: plan.seconds / seconds, retries: sender.retries, cpu, blocks: plan.blocks };
}

const fmt = (n: number, d = 2) => n.toFixed(d);
console.log(`Reflash of a ${BYTES} byte image to the practice unit at ${BAUD} baud, 8N1 (10 bits a byte), CRC-16.`);
for (const block of [1024, 128] as const) {
  // A bit error rate that damages about 1 block in 100: 1 − (1 − p)^(bits per block) = 0.01.
  const bitsPerBlock = (3 + block + 2) * 8;
  const ber = 1 - Math.pow(0.99, 1 / bitsPerBlock);
  for (const [title, faults] of [
    ['no faults', {}],
    [`line noise (BER ${ber.toExponential(2)}, ~1 block in 100)`, { bitErrorRate: ber }],
  ] as const) {
    const r = run(block, faults);
    console.log(
      `  ${String(block).padStart(4)}-byte blocks, ${title}: ${r.state}; plan ${fmt(r.planSeconds)} s, run ${fmt(r.seconds)} s, ` +
        `effective rate ${fmt(r.ratio * 100, 1)} % of the wire limit; retries ${r.retries} over ${r.blocks} blocks; engine CPU ${fmt(r.cpu * 1000, 0)} ms`,
    );
    if (r.state !== 'done') process.exitCode = 1;
  }
}
