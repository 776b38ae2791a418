// /api/board: the Bench board for technicians and admins.
import { Router } from 'express';
import { z } from 'zod';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { idSchema } from '../../schemas';
import { requireRole } from '../auth/guards';
import { createBoardReader } from './board.service';
import { BOARD_STREAM_DEFAULTS, createRevisionWatch, serveBoardStream, type BoardStreamOptions } from './board-events';

const boardQuerySchema = z.object({
  technician: z
    .union([z.literal('none'), idSchema], 'Choose a technician by id (plain digits), or none.')
    .optional()
    .or(z.literal('').transform(() => undefined)),
  q: z
    .string()
    .trim()
    .max(100, 'Keep the search to 100 characters.')
    .optional()
    .transform((v) => (v ? v : undefined)),
});

export interface BoardRouterOptions {
  /** How often this process reads the board revision while event streams are open. */
  revisionPollMs?: number;
  stream?: Partial<BoardStreamOptions>;
}

export function createBoardRouter(deps: Pick<AppDeps, 'sequelize'> & Partial<Pick<AppDeps, 'logger'>>, options: BoardRouterOptions = {}): Router {
  const router = Router();
  const readBoard = createBoardReader(deps.sequelize);
  // One watch per process (per app), shared by every open stream: one revision read per interval.
  const watch = createRevisionWatch(deps.sequelize, { intervalMs: options.revisionPollMs ?? 1000, logger: deps.logger });
  const streamOptions = { ...BOARD_STREAM_DEFAULTS, ...options.stream };

  // Server-sent events: `event: revision` with `{ revision }` at once and after every board change.
  router.get('/events', requireRole('technician', 'admin'), async (req, res) => {
    await serveBoardStream(deps.sequelize, watch, req, res, streamOptions);
  });

  router.get('/', requireRole('technician', 'admin'), async (req, res) => {
    const filters = parseInput(boardQuerySchema, req.query);
    const board = await readBoard(filters);
    // Our own ETag (cheap) instead of Express hashing ~100 KiB per request; Express still answers
    // 304 to a matching If-None-Match.
    res.setHeader('ETag', board.etag);
    // The revision this board is at (or newer): the live board compares it with the event stream's.
    if (board.revision !== null) res.setHeader('X-Board-Revision', board.revision);
    res.type('application/json').send(board.body);
  });

  return router;
}
