// /api/board: the Bench board for technicians and admins.
import { Router } from 'express';
import { z } from 'zod';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { idSchema } from '../../schemas';
import { requireRole } from '../auth/guards';
import { createBoardReader } from './board.service';

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

export function createBoardRouter(deps: Pick<AppDeps, 'sequelize'>): Router {
  const router = Router();
  const readBoard = createBoardReader(deps.sequelize);

  router.get('/', requireRole('technician', 'admin'), async (req, res) => {
    const filters = parseInput(boardQuerySchema, req.query);
    const board = await readBoard(filters);
    // Our own ETag (cheap) instead of Express hashing ~100 KiB per request; Express still answers
    // 304 to a matching If-None-Match.
    res.setHeader('ETag', board.etag);
    res.type('application/json').send(board.body);
  });

  return router;
}
