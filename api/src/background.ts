// Work that runs after the answer has gone out, so the answer cannot tell what the work found
// (a password-reset request answers before looking the address up). Failures are logged, never
// thrown at a client; shutdown waits for work in progress (idle()).
import type { Logger } from './logger';

export class BackgroundWork {
  private readonly running = new Set<Promise<void>>();

  /** Starts `task` now without waiting for it; its failure is logged under `label`. */
  run(label: string, logger: Logger | undefined, task: () => Promise<unknown>): void {
    const done: Promise<void> = Promise.resolve()
      .then(task)
      .then(
        () => undefined,
        (err: unknown) => logger?.error({ err, task: label }, 'background work failed'),
      )
      .finally(() => this.running.delete(done));
    this.running.add(done);
  }

  /** Resolves when every task started so far (and any they start) has finished. */
  async idle(): Promise<void> {
    while (this.running.size > 0) await Promise.all([...this.running]);
  }
}

/** The API's one queue of after-the-answer work (index.ts waits for it on shutdown). */
export const backgroundWork = new BackgroundWork();
