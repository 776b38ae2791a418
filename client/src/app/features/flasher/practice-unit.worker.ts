/// <reference lib="webworker" />
// The practice unit's Web Worker: a PracticeSession on the worker's own clock, talking to the page
// through messages (practice-link.ts is the other end).
import { PracticeSession, type PracticeSessionOptions } from './practice-session';

export type ToPracticeWorker =
  | { type: 'open'; options: PracticeSessionOptions }
  | { type: 'write'; bytes: Uint8Array }
  | { type: 'close' };

export type FromPracticeWorker = { type: 'data'; bytes: Uint8Array } | { type: 'event'; event: unknown };

let session: PracticeSession | null = null;

addEventListener('message', ({ data }: MessageEvent<ToPracticeWorker>) => {
  if (data.type === 'open') {
    session?.stop();
    session = new PracticeSession(
      data.options,
      { now: () => performance.now(), setTimeout: (fn, ms) => setTimeout(fn, ms), clearTimeout: (h) => clearTimeout(h as number) },
      (bytes) => postMessage({ type: 'data', bytes } satisfies FromPracticeWorker),
      (event) => postMessage({ type: 'event', event } satisfies FromPracticeWorker),
    );
    session.powerOn();
  } else if (data.type === 'write') {
    session?.write(data.bytes);
  } else if (data.type === 'close') {
    session?.stop();
    session = null;
  }
});
