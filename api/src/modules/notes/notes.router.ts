// /api/tickets/:tag/notes: notes with their audience. Everyone who may see the ticket reads its
// notes (members: only those for the owner); technicians and admins write them.
import { Router, type Request } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { ticketPathParams } from '../tickets/tickets.schemas';
import { noteListSchema, noteSchema } from './notes.schemas';
import { addNote, listNotes } from './notes.service';

const tagOf = (req: Request) => parseInput(ticketPathParams, req.params).tag;

/** Mounted at /api/tickets/:tag/notes. */
export function createNotesRouter(deps: Pick<AppDeps, 'sequelize' | 'config' | 'clock'>): Router {
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn);

  router.get('/', async (req, res) => {
    const query = parseInput(noteListSchema, req.query);
    res.json(await listNotes(deps, currentUser(req), { tag: tagOf(req), ...query }));
  });

  router.post('/', requireRole('technician', 'admin'), async (req, res) => {
    const tag = tagOf(req);
    const input = parseInput(noteSchema, req.body);
    res.status(201).json(await addNote(deps, currentUser(req), { tag, ...input }));
  });

  return router;
}
