// Ticket photos: who may add and see them, what is accepted (JPEG, PNG or WebP decided from the
// bytes by file-type, never from the name or the Content-Type), and how they are kept: re-encoded
// by sharp (which drops embedded metadata such as a camera's location and anything smuggled after
// the image data), with a WebP thumbnail, both in the blob store under their SHA-256.
import { createHash } from 'node:crypto';
import type { Readable } from 'node:stream';
import { fileTypeFromBuffer } from 'file-type';
import sharp, { type OutputInfo } from 'sharp';
import { AppError, ForbiddenError, NotFoundError, RuleError, ValidationError } from '../../errors';
import type { BlobStore } from '../../storage';
import type { SessionUser } from '../auth/session-user';
import type { PhotoStage, TicketPhoto } from '../../contracts/photos';
import { Ticket, TicketEvent } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { findVisibleTicket, movesTickets, type TicketsDeps } from '../tickets/tickets.service';
import { Photo } from './photo.model';

export type PhotosDeps = TicketsDeps & { store: BlobStore };

/** Photos one ticket may hold per stage; a few dozen tell the story, more is a mistake. */
export const MAX_PHOTOS_PER_STAGE = 24;
const THUMBNAIL_PX = 320;
/** Larger images are refused before decoding (a decompression bomb stays a small file). */
const MAX_PIXELS = 60_000_000;

const ACCEPTED = { jpg: 'image/jpeg', png: 'image/png', webp: 'image/webp' } as const;
type AcceptedExt = keyof typeof ACCEPTED;

/**
 * The uploader's file name, for display only: the last path segment, without control, bidi or
 * path characters, at most 120 characters ("../../etc/passwd" becomes "passwd").
 */
export function displayName(original: string | undefined): string {
  const last = (original ?? '').split(/[/\\]/).pop() ?? '';
  const clean = last
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069"<>:|?*]/gu, '')
    .replace(/^\.+/, '')
    .trim()
    .slice(0, 120);
  return clean || 'photo';
}

/** Checked before a byte of the upload is read: the ticket must be one the person may add photos to. */
export async function ticketForNewPhoto(user: SessionUser, tag: string): Promise<Ticket> {
  const ticket = await findVisibleTicket(user, tag);
  if (ticket.state === 'closed') throw new RuleError('ticket_closed', 'This ticket is closed: it takes no more photos.');
  if (!movesTickets(user) && ticket.state !== 'intake') {
    throw new ForbiddenError('Owners add photos while their ticket is at intake; after that, hand them to the bench.', 'photos_closed_to_owner');
  }
  return ticket;
}

async function putBytes(store: BlobStore, bytes: Buffer): Promise<string> {
  const key = createHash('sha256').update(bytes).digest('hex');
  const staged = store.stage();
  try {
    await new Promise<void>((resolve, reject) => {
      staged.stream.once('error', reject);
      staged.stream.end(bytes, () => resolve());
    });
    await staged.commit(key);
    return key;
  } catch (err) {
    await staged.discard();
    throw err;
  }
}

export interface UploadedPhoto {
  buffer: Buffer;
  originalname: string;
  size: number;
}

/** Adds a photo to a ticket: checked, re-encoded, thumbnailed, stored; its row and timeline event commit together. */
export async function addPhoto(deps: PhotosDeps, user: SessionUser, ticket: Ticket, stage: PhotoStage, file: UploadedPhoto, photoLimit: string): Promise<TicketPhoto> {
  if (!movesTickets(user) && stage !== 'intake') {
    throw new ForbiddenError('Owners add condition photos at intake only.', 'photos_closed_to_owner');
  }
  if (file.size === 0) throw new ValidationError('The file is empty: choose the photo itself.', { photo: 'The file is empty.' });
  const type = await fileTypeFromBuffer(file.buffer);
  if (!type || !(type.ext in ACCEPTED)) {
    const what = type ? `a ${type.ext.toUpperCase()} file (${type.mime})` : 'not a picture this bench can read';
    throw new AppError(415, 'unsupported_photo_type', `That file is ${what}, whatever its name says. Send a JPEG, PNG or WebP photo of at most ${photoLimit}.`, {
      photo: 'Send a JPEG, PNG or WebP photo.',
    });
  }
  const ext = type.ext as AcceptedExt;
  let full: { data: Buffer; info: OutputInfo };
  let thumb: Buffer;
  try {
    // rotate(): apply the camera's orientation before the metadata is dropped.
    const pipeline = sharp(file.buffer, { limitInputPixels: MAX_PIXELS, failOn: 'error' }).rotate();
    const encoded = ext === 'jpg' ? pipeline.jpeg({ quality: 90, mozjpeg: true }) : ext === 'png' ? pipeline.png() : pipeline.webp({ quality: 90 });
    full = await encoded.toBuffer({ resolveWithObject: true });
    thumb = await sharp(full.data).resize(THUMBNAIL_PX, THUMBNAIL_PX, { fit: 'inside', withoutEnlargement: true }).webp({ quality: 75 }).toBuffer();
  } catch {
    throw new ValidationError(
      `That photo could not be read: it may be damaged or larger than ${MAX_PIXELS / 1_000_000} megapixels. Take or export it again and send it.`,
      { photo: 'The photo could not be read.' },
    );
  }

  const count = await Photo.count({ where: { ticketId: ticket.id, stage } });
  if (count >= MAX_PHOTOS_PER_STAGE) {
    throw new RuleError('too_many_photos', `This ticket already has ${MAX_PHOTOS_PER_STAGE} ${stage} photos, the most it keeps: describe anything more in a note.`);
  }
  const [blobKey, thumbKey] = [await putBytes(deps.store, full.data), await putBytes(deps.store, thumb)];
  const name = displayName(file.originalname);
  const photo = await deps.sequelize.transaction(async (transaction) => {
    const now = deps.clock();
    const row = await Photo.create(
      { ticketId: ticket.id, stage, blobKey, thumbKey, mime: ACCEPTED[ext], size: full.data.length, width: full.info.width, height: full.info.height, originalName: name, uploadedBy: user.id, createdAt: now },
      { transaction },
    );
    await TicketEvent.create(
      { ticketId: ticket.id, actorId: user.id, kind: 'photo_added', fromState: null, toState: null, note: `${stage === 'intake' ? 'Condition' : 'Repair'} photo added: ${name}`, ownerVisible: false, createdAt: now },
      { transaction },
    );
    return row;
  });
  return toDto(ticket.id, photo, user.displayName);
}

function toDto(ticketId: number, p: Photo, uploadedBy: string | null): TicketPhoto {
  const base = `/api/tickets/${formatTag(ticketId)}/photos/${p.id}`;
  return {
    id: p.id,
    stage: p.stage,
    name: p.originalName,
    mime: p.mime,
    size: p.size,
    width: p.width,
    height: p.height,
    uploadedBy,
    at: (p.createdAt instanceof Date ? p.createdAt : new Date(p.createdAt)).toISOString(),
    url: base,
    thumbnailUrl: `${base}?size=thumbnail`,
  };
}

/** The ticket's photos, oldest first (a member sees only their own tickets': others are 404). */
export async function listPhotos(user: SessionUser, tag: string, stage?: PhotoStage): Promise<{ items: TicketPhoto[] }> {
  const ticket = await findVisibleTicket(user, tag);
  const rows = await Photo.findAll({
    where: { ticketId: ticket.id, ...(stage ? { stage } : {}) },
    include: [{ association: 'uploader', attributes: ['id', 'displayName'] }],
    order: [['id', 'ASC']],
  });
  return { items: rows.map((p) => toDto(ticket.id, p, p.uploader?.displayName ?? null)) };
}

/** One photo's bytes (or its thumbnail's) for someone who may see the ticket; 404 otherwise. */
export async function openPhoto(deps: Pick<PhotosDeps, 'store'>, user: SessionUser, tag: string, id: number, size: 'full' | 'thumbnail'): Promise<{ bytes: Readable; mime: string; name: string }> {
  const ticket = await findVisibleTicket(user, tag);
  const photo = await Photo.findOne({ where: { id, ticketId: ticket.id } });
  if (!photo) throw new NotFoundError(`Ticket ${formatTag(ticket.id)} has no photo ${id}.`, 'photo_not_found');
  if (size === 'thumbnail') return { bytes: await deps.store.read(photo.thumbKey), mime: 'image/webp', name: `${formatTag(ticket.id)}-photo-${photo.id}-thumbnail.webp` };
  const ext = photo.mime === 'image/jpeg' ? 'jpg' : photo.mime === 'image/png' ? 'png' : 'webp';
  return { bytes: await deps.store.read(photo.blobKey), mime: photo.mime, name: `${formatTag(ticket.id)}-photo-${photo.id}.${ext}` };
}
