// /api/firmware: the Firmware library (technicians and admins; everyone else is refused).
// Thin handlers: parse at the edge, call the service, send the result.
import { Router } from 'express';
import type { AppDeps } from '../../deps';
import { pipeline } from 'node:stream/promises';
import { parseInput, ValidationError } from '../../errors';
import { requireRole, requireSignedIn, currentUser } from '../auth/guards';
import { blobStoreFor } from '../../storage';
import { firmwareListSchema, markSchema, trackRecordSchema, uploadFieldsSchema, withdrawSchema } from './firmware.schemas';
import { addImage, getImage, listImages, markImage, modelSuggestions, openDownload, trackRecord, withdrawImage } from './firmware.service';
import { imageUploader, runUpload, type StagedUpload } from './upload';

export type FirmwareRouterDeps = Pick<AppDeps, 'sequelize' | 'config'>;

export function createFirmwareRouter(deps: FirmwareRouterDeps): Router {
  const store = blobStoreFor(deps.config);
  const service = { sequelize: deps.sequelize, store };
  const upload = imageUploader(store, deps.config.RW_FIRMWARE_MAX_BYTES);
  const router = Router();
  // Checked before a byte of an upload is read.
  router.use(requireSignedIn, requireRole('technician', 'admin'));

  router.post('/', async (req, res) => {
    await runUpload(upload, req, res, { fileBytes: deps.config.RW_FIRMWARE_MAX_BYTES, what: 'image', field: 'image' });
    const file = req.file as (Express.Multer.File & StagedUpload) | undefined;
    try {
      const fields = parseInput(uploadFieldsSchema, { ...(req.body ?? {}) });
      if (!file) throw new ValidationError('Choose the image file to upload (form field "image").', { image: 'Choose the image file.' });
      res.status(201).json(await addImage(service, currentUser(req), fields, file));
    } finally {
      await file?.staged.discard();
    }
  });

  router.get('/', async (req, res) => {
    res.json(await listImages(service, parseInput(firmwareListSchema, req.query)));
  });

  router.get('/models', async (_req, res) => {
    res.json({ models: await modelSuggestions(service) });
  });

  router.get('/track-record', async (req, res) => {
    const query = parseInput(trackRecordSchema, req.query);
    res.json(await trackRecord(service, query.model, query.unit));
  });

  router.get('/:id', async (req, res) => {
    res.json(await getImage(service, String(req.params.id)));
  });

  router.post('/:id/known-good', async (req, res) => {
    const { knownGood } = parseInput(markSchema, req.body);
    res.json(await markImage(service, String(req.params.id), knownGood));
  });

  router.post('/:id/withdraw', async (req, res) => {
    const { reason } = parseInput(withdrawSchema, req.body);
    res.json(await withdrawImage(service, String(req.params.id), reason));
  });

  // The exact bytes, as an attachment (never rendered by the browser: nosniff comes from helmet).
  router.get('/:id/download', async (req, res) => {
    const { image, fileName, bytes } = await openDownload(service, String(req.params.id));
    res.attachment(fileName);
    res.type('application/octet-stream');
    res.setHeader('Content-Length', String(image.size));
    res.setHeader('X-Content-Type-Options', 'nosniff');
    // RFC 9530: the SHA-256 of the bytes sent, so a script can check the download.
    res.setHeader('Repr-Digest', `sha-256=:${Buffer.from(image.checksums.sha256, 'hex').toString('base64')}:`);
    await pipeline(bytes, res);
  });

  return router;
}
