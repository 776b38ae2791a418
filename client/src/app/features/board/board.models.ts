// The board's answer shapes are the API's own (api/src/contracts/board.ts); only the filter is the client's.
export type { Board, Card, Lane } from '@contracts/board';

export interface BoardFilter {
  technician?: string;
  q?: string;
}
