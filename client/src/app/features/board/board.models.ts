// The board's answer shapes are the API's own (api/src/contracts/board.ts); the rest is the client's.
import type { Board } from '@contracts/board';
export type { Board, Card, Lane } from '@contracts/board';

/** Filters sent to `GET /api/board`: the text search (the technician filter works on the page, by id). */
export interface BoardFilter {
  q?: string;
}

/** A board as loaded: the server's answer, the revision it is at, and the search it answers. */
export interface LoadedBoard extends Board {
  /** `X-Board-Revision`: compared with the live stream's revision to know when to reload. */
  revision: string | null;
  q: string;
}

/** What the live stream (`GET /api/board/events`) says. */
export type LiveSignal = { kind: 'open' } | { kind: 'revision'; revision: string | null } | { kind: 'lost' };
