// /api/tickets/:tag/flash-attempts: flash attempts on a ticket (technicians and admins).
import { Router, type Request } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { attemptFieldsSchema, attemptListSchema } from './firmware.schemas';
import { decodeSerialLog, listAttempts, readSerialLog, recordAttempt } from './flash-attempts.service';
import { runUpload, serialLogUploader } from './upload';

export type FlashAttemptsRouterDeps = Pick<AppDeps, 'sequelize' | 'config'>;

/** Mounted at /api/tickets/:tag/flash-attempts. */
export function createFlashAttemptsRouter(deps: FlashAttemptsRouterDeps): Router {
  const upload = serialLogUploader(deps.config.RW_SERIAL_LOG_MAX_BYTES);
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn, requireRole('technician', 'admin'));

  router.get('/', async (req, res) => {
    const { q } = parseInput(attemptListSchema, req.query);
    res.json(await listAttempts(deps, tagOf(req), q));
  });

  router.post('/', async (req, res) => {
    await runUpload(upload, req, res, { fileBytes: deps.config.RW_SERIAL_LOG_MAX_BYTES, what: 'serial log', field: 'serialLog' });
    const fields = parseInput(attemptFieldsSchema, { ...(req.body ?? {}) });
    const log = req.file ? { text: decodeSerialLog(req.file.buffer), name: safeName(req.file.originalname), bytes: req.file.size } : null;
    res.status(201).json(await recordAttempt(deps, currentUser(req), tagOf(req), fields, log));
  });

  router.get('/:number/log', async (req, res) => {
    const { text, fileName } = await readSerialLog(deps, tagOf(req), String(req.params.number));
    res.attachment(fileName);
    res.type('text/plain; charset=utf-8');
    res.send(text);
  });

  return router;
}

/** The ticket's tag from the mount path (mergeParams). */
function tagOf(req: Request): string {
  return String((req.params as Record<string, unknown>).tag ?? '');
}

function safeName(name: string | undefined): string | null {
  // eslint-disable-next-line no-control-regex
  const base = (name ?? '').split(/[\\/]/).pop()!.replace(/[\u0000-\u001f\u007f]/g, '').trim();
  return base ? base.slice(0, 255) : null;
}
