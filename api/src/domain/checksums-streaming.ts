// The three firmware-image checksums of checksums.ts, spread over two threads so that an upload can
// be summed at more than half the speed of SHA-256 alone (the aim in bench/checksums.ts).
//
// On one thread the per-byte costs add up (measured here: SHA-256 ~0.6 ms/MB, CRC-32 ~0.25,
// CRC-16/XMODEM in JS ~0.6-0.75), so "all three" can never reach half of SHA-256 alone. Here the
// main thread computes CRC-16/XMODEM (the JS table code of checksums.ts) and copies each chunk into
// a batch; a worker thread computes SHA-256 and CRC-32 (both native: node:crypto, node:zlib) from
// the batches. The split follows those costs: the main thread also pays for the copy (~0.1 ms/MB)
// and the messages, so CRC-32 goes to the worker (about 0.85 ms/MB on each side).
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

import { Worker } from 'node:worker_threads';
import { createHash } from 'node:crypto';
import { crc16XmodemUpdate, crc32Update, type ImageChecksums } from './checksums';

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

/** Messages, in the order the main thread sends them for one image: start, data..., end. */
type ToWorker =
  | { type: 'start'; job: number }
  | { type: 'data'; job: number; slot: number; length: number }
  | { type: 'data'; job: number; slot: -1; buf: ArrayBuffer; length: number }
  | { type: 'end'; job: number }
  | { type: 'drop'; job: number };
type FromWorker =
  | { type: 'summed'; job: number; length: number; buf?: ArrayBuffer }
  | { type: 'result'; job: number; sha256: string; crc32: number }
  | { type: 'error'; job: number; message: string };

// workerData: { ring: SharedArrayBuffer, busy: SharedArrayBuffer (Int32 per slot), batchBytes }.
// A slot is busy (1) from the moment the main thread fills it until the worker has summed it; the
// worker frees it with Atomics.store, so the main thread can reuse it without waiting for a message.
const WORKER_SOURCE = `
'use strict';
const { parentPort, workerData } = require('node:worker_threads');
const { createHash } = require('node:crypto');
const { crc32 } = require('node:zlib');
const busy = new Int32Array(workerData.busy);
const jobs = new Map();
parentPort.on('message', (m) => {
  if (m.type === 'start') {
    jobs.set(m.job, { sha: createHash('sha256'), crc32: 0 });
  } else if (m.type === 'data') {
    const j = jobs.get(m.job);
    const view = m.slot >= 0
      ? new Uint8Array(workerData.ring, m.slot * workerData.batchBytes, m.length)
      : new Uint8Array(m.buf, 0, m.length);
    if (j) {
      j.sha.update(view);
      j.crc32 = crc32(view, j.crc32);
    }
    if (m.slot >= 0) {
      Atomics.store(busy, m.slot, 0);
      parentPort.postMessage({ type: 'summed', job: m.job, length: m.length });
    } else {
      parentPort.postMessage({ type: 'summed', job: m.job, length: m.length, buf: m.buf }, [m.buf]);
    }
  } else if (m.type === 'end') {
    const j = jobs.get(m.job);
    jobs.delete(m.job);
    if (j) parentPort.postMessage({ type: 'result', job: m.job, sha256: j.sha.digest('hex'), crc32: j.crc32 >>> 0 });
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
  summed(bytes: number): void;
  result(sha256: string, crc32: number): void;
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
  send(job: number, batch: Batch, length: number): void {
    if (batch.slot >= 0) {
      // A slot from a ring that a crash replaced is simply dropped with the old ring.
      if (batch.bytes.buffer !== this.ring) throw new Error('checksum worker was restarted during the image');
      this.post({ type: 'data', job, slot: batch.slot, length });
    } else {
      const buf = batch.bytes.buffer as ArrayBuffer;
      this.post({ type: 'data', job, slot: -1, buf, length }, [buf]);
    }
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
    const busy = new SharedArrayBuffer(this.slotCount * 4);
    // execArgv: [] so that the worker does not load tsx (or a test runner's flags); it needs neither.
    const w = new Worker(this.source, {
      eval: true,
      execArgv: [],
      workerData: { ring, busy, batchBytes: this.batchBytes },
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
      this.jobs.get(m.job)?.summed(m.length);
      return;
    }
    const sink = this.jobs.get(m.job);
    if (!sink) return; // dropped meanwhile
    this.jobs.delete(m.job);
    if (m.type === 'result') sink.result(m.sha256, m.crc32);
    else sink.fail(new Error(`checksum worker: ${m.message}`));
    this.maybeIdle();
  }

  /** The worker is gone (crash, exit, close): fail its images, forget it and its ring. */
  private detach(w: Worker, error: Error): void {
    if (this.worker !== w) return;
    this.worker = null;
    this.ring = null;
    this.busy = null;
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
}

const hex = (value: number, digits: number) => value.toString(16).padStart(digits, '0');

/**
 * Starts an incremental computation of SHA-256, CRC-32/ISO-HDLC and CRC-16/XMODEM that uses a second
 * thread for images of `workerFromBytes` and more. Same results as createImageChecksums().
 */
export function createStreamingImageChecksums(options: StreamingOptions = {}): StreamingImageChecksummer {
  const pool = options.pool ?? defaultChecksumWorkerPool();
  const workerFromBytes = options.workerFromBytes ?? 1024 * 1024;
  const batchBytes = pool.batchBytes;

  type State = 'feeding' | 'digesting' | 'done' | 'aborted' | 'failed';
  let state: State = 'feeding';
  let crc16 = 0;
  let batch: Batch | null = null;
  let used = 0;
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

  const sink: JobSink = {
    summed(bytes) {
      summedBytes += bytes;
      wakeDrainers();
    },
    result(sha256, crc32) {
      state = 'done';
      settle?.resolve({ sha256, crc32: hex(crc32, 8), crc16Xmodem: hex(crc16, 4) });
      settle = null;
      wakeDrainers();
    },
    fail(error) {
      if (state === 'aborted' || state === 'done') return;
      state = 'failed';
      failure = error;
      settle?.reject(error);
      settle = null;
      wakeDrainers();
    },
  };

  const ship = (b: Batch, length: number) => {
    sentBytes += length;
    pool.send(job, b, length);
  };

  const fullBatch = () => {
    const b = batch!;
    batch = null;
    used = 0;
    if (job) return ship(b, batchBytes);
    held.push(b);
    heldBytes += batchBytes;
    if (heldBytes < workerFromBytes) return;
    try {
      handOff();
    } catch (error) {
      // The worker could not be started: this image cannot continue.
      state = 'failed';
      failure = error as Error;
      throw error;
    }
  };

  const handOff = () => {
    job = pool.open(sink);
    for (const h of held) ship(h, batchBytes);
    held.length = 0;
    heldBytes = 0;
  };

  const refusal = () => {
    if (state === 'failed') return failure!;
    if (state === 'aborted') return new Error('The checksums were aborted.');
    return new Error('The checksums were already digested.');
  };

  const sumHere = (): ImageChecksums => {
    const sha = createHash('sha256');
    let crc32 = 0;
    const parts = held.map((h) => h.bytes);
    if (batch) parts.push(batch.bytes.subarray(0, used));
    for (const part of parts) {
      sha.update(part);
      crc32 = crc32Update(part, crc32);
    }
    return { sha256: sha.digest('hex'), crc32: hex(crc32, 8), crc16Xmodem: hex(crc16, 4) };
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
      crc16 = crc16XmodemUpdate(chunk, crc16);
      let at = 0;
      while (at < chunk.length) {
        batch ??= job ? pool.takeBatch() : { slot: -1, bytes: new Uint8Array(pool.ownBuffer()) };
        const n = Math.min(chunk.length - at, batchBytes - used);
        batch.bytes.set(at === 0 && n === chunk.length ? chunk : chunk.subarray(at, at + n), used);
        used += n;
        at += n;
        if (used === batchBytes) fullBatch();
      }
    },

    digest() {
      if (state !== 'feeding') return Promise.reject(refusal());
      state = 'digesting';
      wakeDrainers();
      if (!job && heldBytes + used >= workerFromBytes) {
        try {
          handOff();
        } catch (error) {
          state = 'failed';
          failure = error as Error;
          releaseAll();
          return Promise.reject(failure);
        }
      }
      if (!job) {
        // A small image: the worker is never involved.
        const sums = sumHere();
        releaseAll();
        state = 'done';
        return Promise.resolve(sums);
      }
      return new Promise<ImageChecksums>((resolve, reject) => {
        settle = { resolve, reject };
        try {
          if (batch && used > 0) ship(batch, used);
          else if (batch) pool.release(batch);
          batch = null;
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
