// A SerialLink to the practice unit. In the browser it runs in a Web Worker (its own clock, off the
// page's thread); where workers are missing (unit tests) the same session runs on the page's thread.
import type { PracticeUnitEvent } from '@domain/practice-unit';
import { PracticeSession, type PracticeSessionOptions, type SessionClock } from './practice-session';
import type { FromPracticeWorker, ToPracticeWorker } from './practice-unit.worker';
import type { SerialLink } from './serial-link';

export const PRACTICE_LABEL = 'Practice unit (simulated, no radio)';

export function openPracticeLink(options: PracticeSessionOptions, onUnitEvent: (e: PracticeUnitEvent) => void = () => {}): SerialLink {
  if (typeof Worker !== 'undefined') {
    const worker = new Worker(new URL('./practice-unit.worker', import.meta.url), { type: 'module' });
    const link: SerialLink = {
      kind: 'practice',
      label: PRACTICE_LABEL,
      onData: () => {},
      onLost: () => {},
      async write(bytes) {
        worker.postMessage({ type: 'write', bytes } satisfies ToPracticeWorker);
      },
      async close() {
        worker.postMessage({ type: 'close' } satisfies ToPracticeWorker);
        worker.terminate();
      },
    };
    worker.addEventListener('message', ({ data }: MessageEvent<FromPracticeWorker>) => {
      if (data.type === 'data') link.onData(data.bytes);
      else onUnitEvent(data.event as PracticeUnitEvent);
    });
    worker.addEventListener('error', () => link.onLost('The practice unit stopped working; open it again.'));
    worker.postMessage({ type: 'open', options } satisfies ToPracticeWorker);
    return link;
  }
  return openPracticeLinkInThread(options, realClock, onUnitEvent);
}

const realClock: SessionClock = {
  now: () => performance.now(),
  setTimeout: (fn, ms) => setTimeout(fn, ms),
  clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>),
};

/** The practice unit on the page's own thread (tests, and browsers without workers). */
export function openPracticeLinkInThread(
  options: PracticeSessionOptions,
  clock: SessionClock,
  onUnitEvent: (e: PracticeUnitEvent) => void = () => {},
): SerialLink {
  let session: PracticeSession | null = null;
  const link: SerialLink = {
    kind: 'practice',
    label: PRACTICE_LABEL,
    onData: () => {},
    onLost: () => {},
    async write(bytes) {
      session?.write(bytes);
    },
    async close() {
      session?.stop();
      session = null;
    },
  };
  session = new PracticeSession(options, clock, (bytes) => link.onData(bytes), onUnitEvent);
  // Power on once the caller has had the chance to set onData.
  clock.setTimeout(() => session?.powerOn(), 0);
  return link;
}
