// /api/tickets/:tag/photos: condition photos (stage intake) and repair photos (stage repair).
// Who may add is checked before a byte of the upload is read; the type is decided from the bytes.
import { Router, type Request } from 'express';
import multer from 'multer';
import { pipeline } from 'node:stream/promises';
import { z } from 'zod';
import type { AppDeps } from '../../deps';
import { parseInput, ValidationError } from '../../errors';
import { idSchema } from '../../schemas';
import { blobStoreFor } from '../../storage';
import { PHOTO_STAGES } from '../../contracts/photos';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { formatBytes, runUpload } from '../firmware/upload';
import { ticketPathParams } from '../tickets/tickets.schemas';
import { addPhoto, listPhotos, openPhoto, ticketForNewPhoto } from './photos.service';

const stageSchema = z.enum(PHOTO_STAGES, 'Say which stage the photo is for: intake or repair.');
const uploadFieldsSchema = z.strictObject({ stage: stageSchema });
const listQuerySchema = z.object({ stage: stageSchema.optional() });
const photoParams = ticketPathParams.extend({ photoId: idSchema });
const photoQuerySchema = z.object({ size: z.enum(['full', 'thumbnail'], 'Ask for size full or thumbnail.').default('full') });

/** Mounted at /api/tickets/:tag/photos. */
export function createPhotosRouter(deps: Pick<AppDeps, 'sequelize' | 'config' | 'clock'>): Router {
  const store = blobStoreFor(deps.config, 'photos');
  const maxBytes = deps.config.RW_PHOTO_MAX_BYTES;
  // In memory: one photo, bounded by the limit, is checked and re-encoded whole anyway.
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: maxBytes, files: 1, fields: 4, parts: 5, fieldSize: 1024, fieldNameSize: 100 },
  }).single('photo');
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn);
  const tagOf = (req: Request) => parseInput(ticketPathParams, { tag: req.params.tag }).tag;

  router.post('/', requireRole('member', 'technician', 'admin'), async (req, res) => {
    const ticket = await ticketForNewPhoto(currentUser(req), tagOf(req));
    await runUpload(upload, req, res, { fileBytes: maxBytes, what: 'photo', field: 'photo' });
    const { stage } = parseInput(uploadFieldsSchema, { ...(req.body ?? {}) });
    if (!req.file) throw new ValidationError('Choose the photo to upload (form field "photo").', { photo: 'Choose a photo.' });
    const photo = await addPhoto({ ...deps, store }, currentUser(req), ticket, stage, req.file, formatBytes(maxBytes));
    res.status(201).json(photo);
  });

  router.get('/', async (req, res) => {
    const { stage } = parseInput(listQuerySchema, req.query);
    res.json(await listPhotos(currentUser(req), tagOf(req), stage));
  });

  router.get('/:photoId', async (req, res) => {
    const { tag, photoId } = parseInput(photoParams, req.params);
    const { size } = parseInput(photoQuerySchema, req.query);
    const photo = await openPhoto({ store }, currentUser(req), tag, photoId, size);
    res.type(photo.mime);
    res.attachment(photo.name); // an <img> still shows it; opened directly, it downloads
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Cache-Control', 'private, max-age=300');
    await pipeline(photo.bytes, res);
  });

  return router;
}
