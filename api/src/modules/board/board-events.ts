// The live board: `GET /api/board/events` streams the board revision as server-sent events.
//
// Every ticket write bumps club_settings.board_revision in its own transaction (board-revision.ts),
// on whichever replica served it. So the truth about "has the board changed" lives in the
// database, and each process finds out by reading it: one revision watch per process polls that
// one row every `intervalMs` while at least one stream is open, and fans the answer out to every
// open stream of that process. The cost is one primary-key read of one row per interval per
// process, however many boards are open; with no stream open the watch sleeps. Nothing here is
// process-local state that another replica would need: a stream on replica B sees a move made on
// replica A at B's next poll.
import type { Request, Response } from 'express';
import type { Sequelize } from 'sequelize';
import type { Logger } from '../../logger';
import { readBoardSettings } from './board-revision';

/** What a stream says: the board revision (null while the settings row is missing). */
export interface RevisionEvent {
  revision: string | null;
}

export type RevisionListener = (revision: string | null) => void;

export interface RevisionWatch {
  /** Calls `listener` whenever a poll finds a revision different from the last one; returns the unsubscribe. */
  subscribe(listener: RevisionListener): () => void;
  /** Streams open in this process (for tests and the log). */
  readonly listeners: number;
  /** Polls made since the process started (for tests: one poll per interval, not per stream). */
  readonly polls: number;
}

export function createRevisionWatch(sequelize: Sequelize, options: { intervalMs: number; logger?: Pick<Logger, 'warn'> }): RevisionWatch {
  const listeners = new Set<RevisionListener>();
  let timer: NodeJS.Timeout | undefined;
  let last: string | null | undefined;
  let polling = false;
  let polls = 0;

  const poll = async () => {
    if (polling) return; // a slow database never gets two reads from one process at once
    polling = true;
    polls++;
    try {
      const { revision } = await readBoardSettings(sequelize);
      if (revision !== last) {
        last = revision;
        for (const listener of [...listeners]) listener(revision);
      }
    } catch (err) {
      // The database is away: streams stay open and hear about the next change once it is back.
      options.logger?.warn({ err }, 'board revision poll failed');
    } finally {
      polling = false;
    }
  };

  return {
    subscribe(listener) {
      listeners.add(listener);
      if (!timer) {
        last = undefined;
        timer = setInterval(() => void poll(), options.intervalMs);
      }
      return () => {
        listeners.delete(listener);
        if (listeners.size === 0 && timer) {
          clearInterval(timer);
          timer = undefined;
        }
      };
    },
    get listeners() {
      return listeners.size;
    },
    get polls() {
      return polls;
    },
  };
}

export interface BoardStreamOptions {
  /** Comment line this often, so proxies and the browser keep an idle stream open. */
  heartbeatMs: number;
  /**
   * A stream ends after this long and the browser opens a new one (EventSource reconnects by
   * itself). The new request passes the session check again, so a signed-out, demoted or disabled
   * account stops hearing about the board within this time.
   */
  maxAgeMs: number;
  /** The browser waits this long before reconnecting after a stream ends or drops. */
  retryMs: number;
}

export const BOARD_STREAM_DEFAULTS: BoardStreamOptions = { heartbeatMs: 25_000, maxAgeMs: 10 * 60_000, retryMs: 3_000 };

/** Serves one event stream: the current revision at once, then each change the watch finds. */
export async function serveBoardStream(
  sequelize: Sequelize,
  watch: RevisionWatch,
  req: Request,
  res: Response,
  options: BoardStreamOptions = BOARD_STREAM_DEFAULTS,
): Promise<void> {
  res.status(200);
  res.setHeader('Content-Type', 'text/event-stream; charset=utf-8');
  res.setHeader('Cache-Control', 'no-store');
  res.setHeader('Connection', 'keep-alive');
  // Tells a buffering reverse proxy (nginx) to pass events through as they come.
  res.setHeader('X-Accel-Buffering', 'no');
  res.flushHeaders();
  res.write(`retry: ${options.retryMs}\n\n`);

  let closed = false;
  let sent: string | null | undefined;
  const send = (revision: string | null) => {
    if (closed || revision === sent) return;
    sent = revision;
    const event: RevisionEvent = { revision };
    res.write(`event: revision\ndata: ${JSON.stringify(event)}\n\n`);
  };
  const unsubscribe = watch.subscribe(send);
  const heartbeat = setInterval(() => res.write(': still here\n\n'), options.heartbeatMs);
  // Said before the planned end, so the browser's reconnect is not shown as a lost connection.
  const maxAge = setTimeout(() => res.end('event: reconnect\ndata: {}\n\n'), options.maxAgeMs);
  const stop = () => {
    if (closed) return;
    closed = true;
    unsubscribe();
    clearInterval(heartbeat);
    clearTimeout(maxAge);
  };
  req.on('close', stop);
  res.on('close', stop);

  // The first event comes from a read of its own, so a new stream does not wait for the next poll.
  try {
    const { revision } = await readBoardSettings(sequelize);
    if (sent === undefined) send(revision); // unless the watch already sent a newer one
  } catch {
    // The watch's next successful poll sends it.
  }
}
