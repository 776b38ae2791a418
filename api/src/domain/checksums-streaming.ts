// The three firmware-image checksums of checksums.ts, spread over two threads so that an upload can
// be summed at more than half the speed of SHA-256 alone (the aim in bench/checksums.ts).
//
// On one thread the per-byte costs add up (measured here: SHA-256 ~0.6 ms/MB, CRC-32 ~0.25-0.35,
// CRC-16/XMODEM in JS ~0.75-1.05), so "all three" can never reach half of SHA-256 alone. Here the
// main thread copies each chunk into a batch (256 KiB); a worker thread computes SHA-256 (node:crypto)
// over the batches, and each batch's CRC-32 and CRC-16 are computed on their own, on whichever
// thread has room for them (see SHARE_BY_QUEUE), then joined in order on the main thread
// (checksums-combine.ts: CRCs are linear, as zlib's crc32_combine uses). A fixed split (CRC-16 on
// main, SHA-256 + CRC-32 in the worker) was measured first: the worker fell behind on some runs and
// the main thread on others, because the JS CRC-16's speed varies from process to process here.
//
// Getting the bytes across: batches (256 KiB) are written into slots of a SharedArrayBuffer ring
// that the worker frees with Atomics.store once summed, so the main thread reuses them without
// waiting for a message and allocates nothing; a message per batch says which slot to read. When
// every slot is busy, a batch goes in an ArrayBuffer of its own that is transferred (not cloned).
// Never post a chunk as it comes: a Buffer view is cloned with its whole backing store (a 64 KiB
// subarray of a 16 MiB buffer copies 16 MiB, measured at ~5 ms per message here). bench/checksums.ts
// runs the ring and a transfer-only pool side by side.
//
// The worker is one long-lived thread shared by every checksummer in the process (a pool of one):
// starting a thread costs ~25-40 ms here, more than summing a 16 MiB image. It is unref'd whenever
// no image is in flight, so it never keeps a process (or a test run) alive, and it ends itself after
// `idleMs` without work. Images that end before `workerFromBytes` (1 MiB by default) never touch the
// worker: their batches are summed on the main thread at digest().
//
// Back-pressure: update() never blocks, so a producer faster than the worker piles up batches.
// checksumStream() pauses reading above 8 MiB in flight; direct callers can await drained().
//
// The worker body is plain JavaScript (eval: true) that needs only node:crypto and node:zlib, so it
// runs the same under tsx, under `node --test` and in a compiled build, and it does not load tsx.
// The price is a second copy of the CRC-16 slice-by-16 loop in it; the tests compare every split
// (share: 'crcs-there' puts all CRCs in the worker) with checksums.ts and independent packages.

import { Worker } from 'node:worker_threads';
import { createHash } from 'node:crypto';
import { crc16XmodemUpdate, crc32Update, type ImageChecksums } from './checksums';
import { crc16XmodemCombine, crc32IsoHdlcCombine } from './checksums-combine';

export interface StreamingImageChecksummer {
  /**
   * Feeds the next chunk, in order. The chunk is copied before update() returns, so the caller may
   * reuse it. Throws once the checksummer was digested or aborted, or when the worker has failed.
   */
  update(chunk: Uint8Array): void;
  /** Finishes; resolves with the three checksums. A second call rejects. */
  digest(): Promise<ImageChecksums>;
  /** Gives up: drops the image, rejects a pending digest(), and stops the worker if nobody else uses it. */
  abort(): void;
  /** Bytes handed to the worker and not yet summed there (for back-pressure). */
  readonly pendingBytes: number;
  /** Resolves once pendingBytes is at or below `maxPendingBytes` (or the checksummer has ended). */
  drained(maxPendingBytes?: number): Promise<void>;
}

export interface ChecksumWorkerPoolOptions {
  /** Ends the idle worker after this many milliseconds without an image (default 10 s). */
  idleMs?: number;
  /** Bytes per batch sent to the worker (default 256 KiB). */
  batchBytes?: number;
  /** Batches in the shared ring (default 16, i.e. 4 MiB with the default batch). */
  slots?: number;
  /**
   * The worker's JavaScript source. Only tests replace it (to make a worker that crashes); the
   * default is WORKER_SOURCE below.
   */
  workerSource?: string;
}

/**
 * A batch on its way to the worker: either a slot of the shared ring (`slot` ≥ 0, `buf` the ring) or,
 * when every slot is taken, an ArrayBuffer of its own that is transferred (`slot` = -1).
 */
interface Batch {
  slot: number;
  bytes: Uint8Array;
}

/**
 * Messages, in the order the main thread sends them for one image: start, data..., end. The worker
 * always feeds SHA-256; `seg` numbers the batches of an image, and `crc16` / `crc32` ask the worker
 * for that batch's CRC-16/XMODEM and CRC-32 on their own (from the start value), which the main
 * thread joins in order (checksums-combine.ts).
 */
interface BatchWork {
  crc16: boolean;
  crc32: boolean;
}
type ToWorker =
  | { type: 'start'; job: number }
  | ({ type: 'data'; job: number; seg: number; slot: number; length: number } & BatchWork)
  | ({ type: 'data'; job: number; seg: number; slot: -1; buf: ArrayBuffer; length: number } & BatchWork)
  | { type: 'end'; job: number }
  | { type: 'drop'; job: number };
type FromWorker =
  | { type: 'summed'; job: number; seg: number; length: number; crc16: number; crc32: number; buf?: ArrayBuffer }
  | { type: 'result'; job: number; sha256: string }
  | { type: 'error'; job: number; message: string };

// workerData: { ring: SharedArrayBuffer, busy: SharedArrayBuffer, batchBytes, slots }. busy holds an
// Int32 per slot, 1 from the moment the main thread fills the slot until the worker has summed it
// (the worker frees it with Atomics.store, so the main thread can reuse it without waiting for a
// message), then a count of own-buffer batches summed. Both tell the main thread how far behind
// the worker is while it is still busy feeding and has not read the worker's messages.
const WORKER_SOURCE = `
'use strict';
const { parentPort, workerData } = require('node:worker_threads');
const { createHash } = require('node:crypto');
const { crc32 } = require('node:zlib');
const busy = new Int32Array(workerData.busy);
// CRC-16/XMODEM slice-by-16, the same table and loop as crc16XmodemUpdate in checksums.ts.
const TABLE = new Uint16Array(256 * 16);
for (let b = 0; b < 256; b++) {
  let c = b << 8;
  for (let k = 0; k < 8; k++) c = c & 0x8000 ? ((c << 1) ^ 0x1021) & 0xffff : (c << 1) & 0xffff;
  TABLE[b] = c;
}
for (let s = 1; s < 16; s++) {
  for (let b = 0; b < 256; b++) {
    const prev = TABLE[(s - 1) * 256 + b];
    TABLE[s * 256 + b] = ((prev << 8) & 0xffff) ^ TABLE[prev >>> 8];
  }
}
function crc16Bytewise(data, from, to, crc) {
  for (let i = from; i < to; i++) crc = ((crc << 8) & 0xffff) ^ TABLE[((crc >>> 8) ^ data[i]) & 0xff];
  return crc;
}
function crc16Xmodem(data) {
  const n = data.length;
  const lead = Math.min(n, (4 - (data.byteOffset & 3)) & 3);
  let crc = crc16Bytewise(data, 0, lead, 0);
  const groups = (n - lead) >>> 4;
  if (groups > 0) {
    const words = new Uint32Array(data.buffer, data.byteOffset + lead, groups * 4);
    for (let j = 0; j < words.length; j += 4) {
      const w0 = words[j], w1 = words[j + 1], w2 = words[j + 2], w3 = words[j + 3];
      crc =
        TABLE[3840 + ((w0 & 0xff) ^ (crc >>> 8))] ^ TABLE[3584 + (((w0 >>> 8) & 0xff) ^ (crc & 0xff))] ^
        TABLE[3328 + ((w0 >>> 16) & 0xff)] ^ TABLE[3072 + (w0 >>> 24)] ^
        TABLE[2816 + (w1 & 0xff)] ^ TABLE[2560 + ((w1 >>> 8) & 0xff)] ^ TABLE[2304 + ((w1 >>> 16) & 0xff)] ^ TABLE[2048 + (w1 >>> 24)] ^
        TABLE[1792 + (w2 & 0xff)] ^ TABLE[1536 + ((w2 >>> 8) & 0xff)] ^ TABLE[1280 + ((w2 >>> 16) & 0xff)] ^ TABLE[1024 + (w2 >>> 24)] ^
        TABLE[768 + (w3 & 0xff)] ^ TABLE[512 + ((w3 >>> 8) & 0xff)] ^ TABLE[256 + ((w3 >>> 16) & 0xff)] ^ TABLE[w3 >>> 24];
    }
  }
  return crc16Bytewise(data, lead + groups * 16, n, crc);
}
const jobs = new Map();
parentPort.on('message', (m) => {
  if (m.type === 'start') {
    jobs.set(m.job, createHash('sha256'));
  } else if (m.type === 'data') {
    const j = jobs.get(m.job);
    const view = m.slot >= 0
      ? new Uint8Array(workerData.ring, m.slot * workerData.batchBytes, m.length)
      : new Uint8Array(m.buf, 0, m.length);
    let c16 = -1;
    let c32 = -1;
    if (j) {
      j.update(view);
      if (m.crc16) c16 = crc16Xmodem(view);
      if (m.crc32) c32 = crc32(view, 0) >>> 0;
    }
    const reply = { type: 'summed', job: m.job, seg: m.seg, length: m.length, crc16: c16, crc32: c32 };
    if (m.slot >= 0) {
      Atomics.store(busy, m.slot, 0);
      parentPort.postMessage(reply);
    } else {
      Atomics.add(busy, workerData.slots, 1);
      reply.buf = m.buf;
      parentPort.postMessage(reply, [m.buf]);
    }
  } else if (m.type === 'end') {
    const j = jobs.get(m.job);
    jobs.delete(m.job);
    if (j) parentPort.postMessage({ type: 'result', job: m.job, sha256: j.digest('hex') });
    else parentPort.postMessage({ type: 'error', job: m.job, message: 'unknown image ' + m.job });
  } else if (m.type === 'drop') {
    jobs.delete(m.job);
  } else {
    throw new Error('checksum worker: unknown message ' + String(m.type));
  }
});
`;

/** What the pool tells one image's checksummer about the worker. */
interface JobSink {
  /** Batch `seg` (`bytes` long) is summed; its CRC-16 and CRC-32 where asked for, else -1. */
  summed(seg: number, bytes: number, crc16: number, crc32: number): void;
  result(sha256: string): void;
  fail(error: Error): void;
}

/**
 * One worker thread shared by all streaming checksummers that use this pool. Most code uses the
 * process-wide default (see `defaultChecksumWorkerPool`); tests make their own.
 */
export class ChecksumWorkerPool {
  readonly idleMs: number;
  readonly batchBytes: number;
  readonly slotCount: number;
  private readonly source: string;
  private worker: Worker | null = null;
  private ring: SharedArrayBuffer | null = null;
  private busy: Int32Array | null = null;
  private nextSlot = 0;
  private readonly jobs = new Map<number, JobSink>();
  private nextJob = 1;
  private idleTimer: NodeJS.Timeout | null = null;
  private spares: ArrayBuffer[] = [];
  private overflowSent = 0;
  private started = 0;

  constructor(options: ChecksumWorkerPoolOptions = {}) {
    this.idleMs = options.idleMs ?? 10_000;
    this.batchBytes = options.batchBytes ?? 256 * 1024;
    this.slotCount = options.slots ?? 16;
    this.source = options.workerSource ?? WORKER_SOURCE;
  }

  /** True while a worker thread exists (running or starting). */
  get running(): boolean {
    return this.worker !== null;
  }

  /** How many worker threads this pool has started so far (one, unless it was stopped or crashed). */
  get workersStarted(): number {
    return this.started;
  }

  /** Stops the worker now; images in flight reject with "checksum worker stopped ...". */
  async close(): Promise<void> {
    const w = this.worker;
    if (!w) return;
    this.detach(w, new Error('checksum worker stopped before the image was summed'));
    await w.terminate();
  }

  /** A buffer of batchBytes that belongs to the caller (for images not yet handed to the worker). */
  ownBuffer(): ArrayBuffer {
    return this.spares.pop() ?? new ArrayBuffer(this.batchBytes);
  }

  giveBack(buf: ArrayBuffer): void {
    // Keep a few for the next image; the rest go to the garbage collector.
    if (buf.byteLength === this.batchBytes && this.spares.length < 16) this.spares.push(buf);
  }

  /** The next batch to fill for the worker: a free ring slot, else a buffer of its own. */
  takeBatch(): Batch {
    const busy = this.busy;
    if (busy) {
      for (let k = 0; k < this.slotCount; k++) {
        const slot = (this.nextSlot + k) % this.slotCount;
        if (Atomics.load(busy, slot) === 0) {
          Atomics.store(busy, slot, 1);
          this.nextSlot = (slot + 1) % this.slotCount;
          return { slot, bytes: new Uint8Array(this.ring!, slot * this.batchBytes, this.batchBytes) };
        }
      }
    }
    return { slot: -1, bytes: new Uint8Array(this.ownBuffer()) };
  }

  /** Registers an image; the worker starts if it is not running. */
  open(sink: JobSink): number {
    const job = this.nextJob++;
    const w = this.ensureWorker();
    this.jobs.set(job, sink);
    if (this.idleTimer) {
      clearTimeout(this.idleTimer);
      this.idleTimer = null;
    }
    w.ref();
    this.post({ type: 'start', job });
    return job;
  }

  /** Sends the first `length` bytes of a batch; the batch must not be touched afterwards. */
  send(job: number, seg: number, batch: Batch, length: number, work: BatchWork): void {
    const { crc16, crc32 } = work;
    if (batch.slot >= 0) {
      if (batch.bytes.buffer !== this.ring) throw new Error('checksum worker was restarted during the image');
      this.post({ type: 'data', job, seg, crc16, crc32, slot: batch.slot, length });
    } else {
      const buf = batch.bytes.buffer as ArrayBuffer;
      this.post({ type: 'data', job, seg, crc16, crc32, slot: -1, buf, length }, [buf]);
      this.overflowSent++;
    }
  }

  /**
   * Batches sent to the worker and not yet summed, from every image. Ring slots are counted from the
   * shared flags, which the worker clears as it goes, so the count is current even while this
   * thread has not yet read the worker's messages.
   */
  queuedBatches(): number {
    const busy = this.busy;
    if (!busy) return 0;
    let n = this.overflowSent - Atomics.load(busy, this.slotCount);
    for (let slot = 0; slot < this.slotCount; slot++) n += Atomics.load(busy, slot);
    return n;
  }

  /** Returns a batch that will not be sent (a slot is freed). */
  release(batch: Batch): void {
    if (batch.slot < 0) this.giveBack(batch.bytes.buffer as ArrayBuffer);
    else if (batch.bytes.buffer === this.ring) Atomics.store(this.busy!, batch.slot, 0);
  }

  end(job: number): void {
    this.post({ type: 'end', job });
  }

  /** Forgets an image; stops the worker when no other image uses it. */
  drop(job: number): void {
    if (!this.jobs.delete(job)) return;
    if (this.jobs.size === 0) void this.close();
    else this.post({ type: 'drop', job });
  }

  private post(message: ToWorker, transfer?: ArrayBuffer[]): void {
    if (!this.worker) throw new Error('checksum worker is not running');
    this.worker.postMessage(message, transfer);
  }

  private ensureWorker(): Worker {
    if (this.worker) return this.worker;
    // A fresh ring per worker: a worker that crashed may have left slots marked busy.
    const ring = new SharedArrayBuffer(this.slotCount * this.batchBytes);
    // One Int32 flag per slot, then a count of own-buffer batches summed.
    const busy = new SharedArrayBuffer((this.slotCount + 1) * 4);
    // execArgv: [] so that the worker does not load tsx (or a test runner's flags); it needs neither.
    const w = new Worker(this.source, {
      eval: true,
      execArgv: [],
      workerData: { ring, busy, batchBytes: this.batchBytes, slots: this.slotCount },
    });
    this.started++;
    this.worker = w;
    this.ring = ring;
    this.busy = new Int32Array(busy);
    this.nextSlot = 0;
    w.on('message', (m: FromWorker) => this.onMessage(m));
    w.on('error', (err: Error) => this.detach(w, new Error(`checksum worker failed: ${err.message}`, { cause: err })));
    w.on('exit', (code) => this.detach(w, new Error(`checksum worker exited (code ${code}) before the image was summed`)));
    return w;
  }

  private onMessage(m: FromWorker): void {
    if (m.type === 'summed') {
      if (m.buf) this.giveBack(m.buf);
      this.jobs.get(m.job)?.summed(m.seg, m.length, m.crc16, m.crc32);
      return;
    }
    const sink = this.jobs.get(m.job);
    if (!sink) return; // dropped meanwhile
    this.jobs.delete(m.job);
    if (m.type === 'result') sink.result(m.sha256);
    else sink.fail(new Error(`checksum worker: ${m.message}`));
    this.maybeIdle();
  }

  /** The worker is gone (crash, exit, close): fail its images, forget it and its ring. */
  private detach(w: Worker, error: Error): void {
    if (this.worker !== w) return;
    this.worker = null;
    this.ring = null;
    this.busy = null;
    this.overflowSent = 0;
    if (this.idleTimer) {
      clearTimeout(this.idleTimer);
      this.idleTimer = null;
    }
    const sinks = [...this.jobs.values()];
    this.jobs.clear();
    for (const sink of sinks) sink.fail(error);
  }

  private maybeIdle(): void {
    const w = this.worker;
    if (!w || this.jobs.size > 0) return;
    w.unref();
    this.idleTimer = setTimeout(() => {
      this.idleTimer = null;
      if (this.worker === w && this.jobs.size === 0) void this.close();
    }, this.idleMs);
    this.idleTimer.unref();
  }
}

let defaultPool: ChecksumWorkerPool | null = null;

/** The process-wide pool used when none is given. */
export function defaultChecksumWorkerPool(): ChecksumWorkerPool {
  defaultPool ??= new ChecksumWorkerPool();
  return defaultPool;
}

export interface StreamingOptions {
  pool?: ChecksumWorkerPool;
  /**
   * Below this many bytes the image is summed on the main thread at digest() and the worker is never
   * used (default 1 MiB): for small images a round trip and, when cold, a thread start cost more
   * than the sums.
   */
  workerFromBytes?: number;
  /**
   * Which thread computes each batch's CRCs (the worker always does SHA-256). 'balanced' (default)
   * decides batch by batch from how many batches wait for the worker (see SHARE_BY_QUEUE); the
   * fixed ones are for the bench and the tests: 'crc16-here' (CRC-16 on this thread, CRC-32 in the
   * worker), 'crcs-here' (both CRCs on this thread), 'crcs-there' (both in the worker).
   */
  share?: 'balanced' | 'crc16-here' | 'crcs-here' | 'crcs-there';
}

/**
 * 'balanced': with at most `workerIdle` batches waiting the worker is about to run dry and takes
 * both CRCs as well as SHA-256; with `workerBehind` or more it falls behind and keeps only
 * SHA-256; in between it takes CRC-32 (the usual split: per MB, SHA-256 + CRC-32 in the worker cost
 * about what copy + CRC-16 cost here). Each thread thus takes more work while the other is busy,
 * without knowing the machine's speeds, and when the worker gets little CPU (a busy machine) the
 * CRCs stay here rather than pile up behind it.
 */
const SHARE_BY_QUEUE = { workerIdle: 1, workerBehind: 4 };

function workFor(share: NonNullable<StreamingOptions['share']>, pool: ChecksumWorkerPool): BatchWork {
  switch (share) {
    case 'crc16-here':
      return { crc16: false, crc32: true };
    case 'crcs-here':
      return { crc16: false, crc32: false };
    case 'crcs-there':
      return { crc16: true, crc32: true };
    case 'balanced': {
      const waiting = pool.queuedBatches();
      return { crc16: waiting <= SHARE_BY_QUEUE.workerIdle, crc32: waiting < SHARE_BY_QUEUE.workerBehind };
    }
  }
}

const hex = (value: number, digits: number) => value.toString(16).padStart(digits, '0');

/**
 * Starts an incremental computation of SHA-256, CRC-32/ISO-HDLC and CRC-16/XMODEM that uses a second
 * thread for images of `workerFromBytes` and more. Same results as createImageChecksums().
 */
export function createStreamingImageChecksums(options: StreamingOptions = {}): StreamingImageChecksummer {
  const pool = options.pool ?? defaultChecksumWorkerPool();
  const workerFromBytes = options.workerFromBytes ?? 1024 * 1024;
  const share = options.share ?? 'balanced';
  const batchBytes = pool.batchBytes;

  type State = 'feeding' | 'digesting' | 'done' | 'aborted' | 'failed';
  let state: State = 'feeding';
  let batch: Batch | null = null;
  let used = 0;
  // Every batch of the image in order: its length and its CRCs on their own (-1 while the worker has them).
  const segLength: number[] = [];
  const segCrc16: number[] = [];
  const segCrc32: number[] = [];
  // Full batches kept on this thread until the image reaches workerFromBytes.
  const held: Batch[] = [];
  let heldBytes = 0;
  let job = 0; // 0 = not handed to the worker (yet)
  let sentBytes = 0;
  let summedBytes = 0;
  let failure: Error | null = null;
  let settle: { resolve: (r: ImageChecksums) => void; reject: (e: Error) => void } | null = null;
  const drainWaiters: { limit: number; resolve: () => void }[] = [];

  const wakeDrainers = () => {
    for (let i = drainWaiters.length - 1; i >= 0; i--) {
      const w = drainWaiters[i];
      if (state !== 'feeding' || sentBytes - summedBytes <= w.limit) {
        drainWaiters.splice(i, 1);
        w.resolve();
      }
    }
  };

  const fail = (error: Error) => {
    state = 'failed';
    failure = error;
    settle?.reject(error);
    settle = null;
    wakeDrainers();
  };

  /** The image's CRCs, joined from its batches' in order. */
  const crcsOfImage = (): { crc32: string; crc16Xmodem: string } => {
    let crc16 = 0;
    let crc32 = 0;
    for (let i = 0; i < segLength.length; i++) {
      if (segCrc16[i] < 0 || segCrc32[i] < 0) throw new Error(`checksum worker did not return the CRCs of batch ${i}`);
      crc16 = crc16XmodemCombine(crc16, segCrc16[i], segLength[i]);
      crc32 = crc32IsoHdlcCombine(crc32, segCrc32[i], segLength[i]);
    }
    return { crc32: hex(crc32, 8), crc16Xmodem: hex(crc16, 4) };
  };

  const sink: JobSink = {
    summed(seg, bytes, crc16, crc32) {
      summedBytes += bytes;
      if (crc16 >= 0) segCrc16[seg] = crc16;
      if (crc32 >= 0) segCrc32[seg] = crc32;
      wakeDrainers();
    },
    result(sha256) {
      try {
        const sums = { sha256, ...crcsOfImage() };
        state = 'done';
        settle?.resolve(sums);
        settle = null;
        wakeDrainers();
      } catch (error) {
        fail(error as Error);
      }
    },
    fail(error) {
      if (state === 'aborted' || state === 'done') return;
      fail(error);
    },
  };

  const ship = (seg: number, b: Batch, length: number, work: BatchWork) => {
    sentBytes += length;
    pool.send(job, seg, b, length, work);
  };

  /** Records a batch as the image's next segment and sends it on (or holds it, before the hand-off). */
  const closeBatch = (b: Batch, length: number) => {
    const seg = segLength.length;
    segLength.push(length);
    const work = job ? workFor(share, pool) : { crc16: false, crc32: false };
    const bytes = b.bytes.subarray(0, length);
    segCrc16.push(work.crc16 ? -1 : crc16XmodemUpdate(bytes));
    segCrc32.push(work.crc32 ? -1 : crc32Update(bytes));
    if (job) return ship(seg, b, length, work);
    held.push(b);
    heldBytes += length;
  };

  const handOff = () => {
    job = pool.open(sink);
    const first = segLength.length - held.length;
    held.forEach((h, k) => ship(first + k, h, segLength[first + k], { crc16: false, crc32: false }));
    held.length = 0;
    heldBytes = 0;
  };

  const refusal = () => {
    if (state === 'failed') return failure!;
    if (state === 'aborted') return new Error('The checksums were aborted.');
    return new Error('The checksums were already digested.');
  };

  const releaseAll = () => {
    for (const h of held) pool.release(h);
    if (batch) pool.release(batch);
    held.length = 0;
    heldBytes = 0;
    batch = null;
  };

  return {
    get pendingBytes() {
      return sentBytes - summedBytes;
    },

    update(chunk) {
      if (state !== 'feeding') throw refusal();
      let at = 0;
      while (at < chunk.length) {
        batch ??= job ? pool.takeBatch() : { slot: -1, bytes: new Uint8Array(pool.ownBuffer()) };
        const n = Math.min(chunk.length - at, batchBytes - used);
        batch.bytes.set(at === 0 && n === chunk.length ? chunk : chunk.subarray(at, at + n), used);
        used += n;
        at += n;
        if (used < batchBytes) continue;
        const full = batch;
        batch = null;
        used = 0;
        closeBatch(full, batchBytes);
        if (!job && heldBytes >= workerFromBytes) {
          try {
            handOff();
          } catch (error) {
            // The worker could not be started: this image cannot continue.
            fail(error as Error);
            throw error;
          }
        }
      }
    },

    digest() {
      if (state !== 'feeding') return Promise.reject(refusal());
      state = 'digesting';
      wakeDrainers();
      try {
        if (!job && heldBytes + used >= workerFromBytes) handOff();
      } catch (error) {
        fail(error as Error);
        releaseAll();
        return Promise.reject(failure);
      }
      if (!job) {
        // A small image: the worker is never involved.
        if (batch && used > 0) closeBatch(batch, used);
        else if (batch) pool.release(batch);
        batch = null;
        const sha = createHash('sha256');
        held.forEach((h, k) => sha.update(h.bytes.subarray(0, segLength[k])));
        const sums = { sha256: sha.digest('hex'), ...crcsOfImage() };
        releaseAll();
        state = 'done';
        return Promise.resolve(sums);
      }
      return new Promise<ImageChecksums>((resolve, reject) => {
        settle = { resolve, reject };
        try {
          const last = batch;
          batch = null;
          if (last && used > 0) closeBatch(last, used);
          else if (last) pool.release(last);
          pool.end(job);
        } catch (error) {
          sink.fail(error as Error);
        }
      });
    },

    abort() {
      if (state === 'done' || state === 'aborted') return;
      const wasFailed = state === 'failed';
      state = 'aborted';
      settle?.reject(new Error('The checksums were aborted.'));
      settle = null;
      releaseAll();
      if (job && !wasFailed) pool.drop(job);
      wakeDrainers();
    },

    drained(maxPendingBytes = 8 * 1024 * 1024) {
      if (state !== 'feeding' || sentBytes - summedBytes <= maxPendingBytes) return Promise.resolve();
      return new Promise<void>((resolve) => drainWaiters.push({ limit: maxPendingBytes, resolve }));
    },
  };
}

/**
 * The three checksums of a stream of bytes (a Node Readable, a web ReadableStream or any async
 * iterable of byte chunks), e.g. an upload as it arrives. Reading pauses while more than 8 MiB wait
 * for the worker. If the stream fails, the work is aborted and the stream's error is thrown.
 */
export async function checksumStream(
  source: AsyncIterable<Uint8Array | string>,
  options: StreamingOptions = {},
): Promise<ImageChecksums> {
  const sums = createStreamingImageChecksums(options);
  try {
    for await (const chunk of source) {
      if (typeof chunk === 'string') throw new TypeError('checksumStream needs bytes, not text: do not set an encoding on the stream.');
      sums.update(chunk);
      if (sums.pendingBytes > 8 * 1024 * 1024) await sums.drained();
    }
  } catch (error) {
    sums.abort();
    throw error;
  }
  return sums.digest();
}
