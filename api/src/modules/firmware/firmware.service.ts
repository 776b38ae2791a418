// Firmware library rules: upload (checksums computed while the bytes stream to storage, the
// maker's checksum compared, identical bytes for one model and unit refused), list, read, mark
// known-good, withdraw, download, and the track record ("what worked before").
// Services never see req/res: they take the signed-in person and parsed input.
import { QueryTypes, UniqueConstraintError, type Sequelize } from 'sequelize';
import type { Readable } from 'node:stream';
import { AppError, NotFoundError, ValidationError } from '../../errors';
import type { SessionUser } from '../auth/session-user';
import type { Page } from '../../contracts/lists';
import {
  FIRMWARE_UNIT_LABELS,
  type FirmwareChecksums,
  type FirmwareImage,
  type FirmwareUnit,
  type FirmwareUploaded,
  type TrackRecord,
} from '../../contracts/firmware';
import type { BlobStore } from '../../storage';
import { escapeLike } from '../tickets/ticket-search';
import type { FirmwareListQuery, UploadFields } from './firmware.schemas';
import type { StagedUpload } from './upload';

export interface FirmwareDeps {
  sequelize: Sequelize;
  store: BlobStore;
}

const iso = (d: Date | string | null) => (d === null ? null : (d instanceof Date ? d : new Date(d)).toISOString());

/** How a make/model is compared: lower case, single spaces. "Fenwick  Heron 100" = "fenwick heron 100". */
export function modelKey(model: string): string {
  return model.trim().replace(/\s+/g, ' ').toLowerCase();
}

const CHECKSUM_NAMES: Record<keyof FirmwareChecksums, string> = { sha256: 'SHA-256', crc32: 'CRC-32', crc16Xmodem: 'CRC-16/XMODEM' };

/** Which of our checksums a maker's published value is, by its length. */
export function makerChecksumKind(hex: string): keyof FirmwareChecksums {
  return hex.length === 64 ? 'sha256' : hex.length === 8 ? 'crc32' : 'crc16Xmodem';
}

/** A second upload of identical bytes for one model and unit: 409, pointing at the entry that has them. */
export class DuplicateImageError extends AppError {
  constructor(readonly existingId: number, existing: { model: string; unit: FirmwareUnit; version: string }) {
    super(
      409,
      'duplicate_image',
      `These exact bytes are already in the library as entry #${existingId} (${existing.model}, ${FIRMWARE_UNIT_LABELS[existing.unit]}, version ${existing.version}). Use that entry.`,
      { image: `Already in the library as entry #${existingId}.` },
    );
  }

  override toBody() {
    const body = super.toBody();
    return { error: { ...body.error, existingId: this.existingId } };
  }
}

async function findIdentical(sequelize: Sequelize, key: string, unit: FirmwareUnit, sha256: string) {
  const rows = await sequelize.query<{ id: number; model: string; unit: FirmwareUnit; version: string }>(
    'SELECT id, model, unit, version FROM firmware_images WHERE model_key = :key AND unit = :unit AND sha256 = :sha256 LIMIT 1',
    { replacements: { key, unit, sha256 }, type: QueryTypes.SELECT },
  );
  return rows[0];
}

/**
 * Stores an uploaded image. `upload` is the staged blob with its checksums (computed as it
 * streamed); it is committed under its SHA-256 only when every check passes, and discarded
 * otherwise, so a refused upload leaves neither a row nor a file.
 */
export async function addImage(deps: FirmwareDeps, user: SessionUser, fields: UploadFields, upload: StagedUpload): Promise<FirmwareUploaded> {
  const { sequelize } = deps;
  try {
    if (upload.size === 0) {
      throw new ValidationError('The file is empty: choose the image file itself.', { image: 'The file is empty.' });
    }
    let makerKind: keyof FirmwareChecksums | null = null;
    if (fields.makerChecksum) {
      makerKind = makerChecksumKind(fields.makerChecksum);
      const ours = upload.checksums[makerKind];
      if (ours !== fields.makerChecksum) {
        const name = CHECKSUM_NAMES[makerKind];
        throw new AppError(
          400,
          'checksum_mismatch',
          `The maker publishes ${name} ${fields.makerChecksum}, but the uploaded file has ${name} ${ours}. The file is damaged or not the one the maker published: download it again.`,
          { makerChecksum: `Maker: ${fields.makerChecksum}; this file: ${ours} (${name}).` },
        );
      }
    }
    const key = modelKey(fields.model);
    const existing = await findIdentical(sequelize, key, fields.unit, upload.checksums.sha256);
    if (existing) throw new DuplicateImageError(existing.id, existing);

    const id = await sequelize.transaction(async (transaction) => {
      const now = new Date();
      const [insertId] = await sequelize.query(
        'INSERT INTO firmware_images (model, model_key, unit, version, release_notes, source, original_name, size, sha256, crc32, ' +
          'crc16_xmodem, maker_checksum_kind, known_good, uploaded_by, created_at, updated_at) VALUES (:model, :key, :unit, :version, ' +
          ':notes, :source, :originalName, :size, :sha256, :crc32, :crc16, :makerKind, 0, :userId, :now, :now)',
        {
          replacements: {
            model: fields.model,
            key,
            unit: fields.unit,
            version: fields.version,
            notes: fields.releaseNotes ?? null,
            source: fields.source ?? null,
            originalName: displayName(upload.originalname),
            size: upload.size,
            sha256: upload.checksums.sha256,
            crc32: upload.checksums.crc32,
            crc16: upload.checksums.crc16Xmodem,
            makerKind,
            userId: user.id,
            now,
          },
          type: QueryTypes.INSERT,
          transaction,
        },
      );
      // The bytes become visible under their SHA-256 before the row commits; if the commit then
      // fails, an unreferenced object is left (harmless), never a row without its bytes.
      await upload.staged.commit(upload.checksums.sha256);
      return Number(insertId);
    });
    return { id, size: upload.size, checksums: upload.checksums };
  } catch (err) {
    if (err instanceof UniqueConstraintError) {
      // Two identical uploads raced past the check above: the unique index decided.
      const existing = await findIdentical(sequelize, modelKey(fields.model), fields.unit, upload.checksums.sha256);
      if (existing) throw new DuplicateImageError(existing.id, existing);
    }
    throw err;
  } finally {
    await upload.staged.discard(); // a no-op once committed
  }
}

/** The client's file name, for display only (never a path on the server): no folders, no control characters. */
function displayName(name: string | undefined): string | null {
  if (!name) return null;
  // eslint-disable-next-line no-control-regex
  const base = name.split(/[\\/]/).pop()!.replace(/[\u0000-\u001f\u007f]/g, '').trim();
  return base ? base.slice(0, 255) : null;
}

type ImageRecord = {
  id: number;
  model: string;
  unit: FirmwareUnit;
  version: string;
  size: number;
  sha256: string;
  crc32: string;
  crc16_xmodem: string;
  release_notes: string | null;
  source: string | null;
  original_name: string | null;
  maker_checksum_kind: keyof FirmwareChecksums | null;
  known_good: number | boolean;
  withdrawn_at: Date | null;
  withdrawn_reason: string | null;
  uploaded_by_name: string | null;
  created_at: Date;
};

const IMAGE_COLUMNS =
  'f.id, f.model, f.unit, f.version, f.size, f.sha256, f.crc32, f.crc16_xmodem, f.release_notes, f.source, f.original_name, ' +
  'f.maker_checksum_kind, f.known_good, f.withdrawn_at, f.withdrawn_reason, u.display_name AS uploaded_by_name, f.created_at';

function toImage(r: ImageRecord): FirmwareImage {
  const knownGood = Boolean(r.known_good);
  return {
    id: Number(r.id),
    model: r.model,
    unit: r.unit,
    version: r.version,
    size: Number(r.size),
    checksums: { sha256: r.sha256, crc32: r.crc32, crc16Xmodem: r.crc16_xmodem },
    releaseNotes: r.release_notes,
    source: r.source,
    originalName: r.original_name,
    makerChecksumKind: r.maker_checksum_kind,
    status: r.withdrawn_at ? 'withdrawn' : knownGood ? 'known_good' : 'available',
    knownGood,
    withdrawnAt: iso(r.withdrawn_at),
    withdrawnReason: r.withdrawn_reason,
    uploadedByName: r.uploaded_by_name,
    createdAt: iso(r.created_at)!,
  };
}

const SORT_COLUMNS: Record<FirmwareListQuery['sort'], string> = {
  model: 'f.model_key',
  unit: 'f.unit',
  version: 'f.version',
  size: 'f.size',
  createdAt: 'f.created_at',
};

export async function listImages(deps: FirmwareDeps, query: FirmwareListQuery): Promise<Page<FirmwareImage>> {
  const where: string[] = [];
  const replacements: Record<string, unknown> = {};
  if (query.unit) {
    where.push('f.unit = :unit');
    replacements.unit = query.unit;
  }
  if (query.status === 'withdrawn') where.push('f.withdrawn_at IS NOT NULL');
  if (query.status === 'usable') where.push('f.withdrawn_at IS NULL');
  if (query.status === 'known_good') where.push('f.withdrawn_at IS NULL AND f.known_good = 1');
  if (query.status === 'available') where.push('f.withdrawn_at IS NULL AND f.known_good = 0');
  if (query.q) {
    where.push('(f.model LIKE :like OR f.version LIKE :like OR f.release_notes LIKE :like OR f.source LIKE :like OR f.sha256 LIKE :prefix)');
    replacements.like = `%${escapeLike(query.q)}%`;
    replacements.prefix = `${escapeLike(query.q.toLowerCase())}%`;
  }
  const whereSql = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const dir = query.dir === 'asc' ? 'ASC' : 'DESC';
  const [count, rows] = await Promise.all([
    deps.sequelize.query<{ total: number | bigint }>(`SELECT COUNT(*) AS total FROM firmware_images f ${whereSql}`, {
      replacements,
      type: QueryTypes.SELECT,
    }),
    deps.sequelize.query<ImageRecord>(
      `SELECT ${IMAGE_COLUMNS} FROM firmware_images f LEFT JOIN users u ON u.id = f.uploaded_by ${whereSql} ` +
        `ORDER BY ${SORT_COLUMNS[query.sort]} ${dir}, f.id ${dir} LIMIT :limit OFFSET :offset`,
      { replacements: { ...replacements, limit: query.pageSize, offset: (query.page - 1) * query.pageSize }, type: QueryTypes.SELECT },
    ),
  ]);
  return { items: rows.map(toImage), total: Number(count[0]?.total ?? 0), page: query.page, pageSize: query.pageSize };
}

function parseId(id: string): number {
  const n = /^\d{1,10}$/.test(id) ? Number(id) : NaN;
  if (!Number.isSafeInteger(n) || n < 1) throw new NotFoundError('There is no such image in the Firmware library.', 'firmware_not_found');
  return n;
}

export async function getImage(deps: FirmwareDeps, idText: string): Promise<FirmwareImage> {
  const id = parseId(idText);
  const rows = await deps.sequelize.query<ImageRecord>(
    `SELECT ${IMAGE_COLUMNS} FROM firmware_images f LEFT JOIN users u ON u.id = f.uploaded_by WHERE f.id = :id`,
    { replacements: { id }, type: QueryTypes.SELECT },
  );
  if (!rows[0]) throw new NotFoundError(`There is no image #${id} in the Firmware library.`, 'firmware_not_found');
  return toImage(rows[0]);
}

export async function markImage(deps: FirmwareDeps, idText: string, knownGood: boolean): Promise<FirmwareImage> {
  const image = await getImage(deps, idText);
  if (image.status === 'withdrawn' && knownGood) {
    throw new AppError(422, 'image_withdrawn', `Image #${image.id} is withdrawn (${image.withdrawnReason ?? 'no reason given'}); a withdrawn image cannot be marked known good.`);
  }
  await deps.sequelize.query('UPDATE firmware_images SET known_good = :knownGood, updated_at = :now WHERE id = :id', {
    replacements: { knownGood, now: new Date(), id: image.id },
    type: QueryTypes.UPDATE,
  });
  return getImage(deps, String(image.id));
}

export async function withdrawImage(deps: FirmwareDeps, idText: string, reason: string): Promise<FirmwareImage> {
  const image = await getImage(deps, idText);
  if (image.status === 'withdrawn') {
    throw new AppError(409, 'already_withdrawn', `Image #${image.id} was already withdrawn: ${image.withdrawnReason ?? ''}`);
  }
  const now = new Date();
  await deps.sequelize.query(
    'UPDATE firmware_images SET withdrawn_at = :now, withdrawn_reason = :reason, known_good = 0, updated_at = :now WHERE id = :id AND withdrawn_at IS NULL',
    { replacements: { now, reason, id: image.id }, type: QueryTypes.UPDATE },
  );
  return getImage(deps, String(image.id));
}

/** The image's bytes and a safe attachment name (built from our own fields, never the client's path). */
export async function openDownload(deps: FirmwareDeps, idText: string): Promise<{ image: FirmwareImage; fileName: string; bytes: Readable }> {
  const image = await getImage(deps, idText);
  const safe = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'image';
  const fileName = `${safe(image.model)}_${image.unit}_${safe(image.version)}.bin`;
  return { image, fileName, bytes: await deps.store.read(image.checksums.sha256) };
}

/** Models named in the library and on tickets, for the upload form's suggestions. */
export async function modelSuggestions(deps: FirmwareDeps): Promise<string[]> {
  const rows = await deps.sequelize.query<{ model: string }>(
    '(SELECT model FROM firmware_images) UNION (SELECT make_model AS model FROM tickets WHERE equipment_kind = \'transceiver\') ORDER BY model LIMIT 200',
    { type: QueryTypes.SELECT },
  );
  const seen = new Set<string>();
  return rows.map((r) => r.model).filter((m) => (seen.has(modelKey(m)) ? false : (seen.add(modelKey(m)), true)));
}

/**
 * "What worked before" for one model and unit: every image of it, with how often it was tried,
 * how often it was verified running, the success rate and when it was last used.
 * Known-good first, then most verified, then newest; withdrawn images last.
 */
export async function trackRecord(deps: Pick<FirmwareDeps, 'sequelize'>, model: string, unit: FirmwareUnit): Promise<TrackRecord> {
  const rows = await deps.sequelize.query<{
    id: number;
    version: string;
    size: number;
    sha256: string;
    known_good: number | boolean;
    withdrawn_at: Date | null;
    withdrawn_reason: string | null;
    attempts: number | bigint;
    verified: number | bigint | string | null;
    last_used: Date | null;
  }>(
    'SELECT f.id, f.version, f.size, f.sha256, f.known_good, f.withdrawn_at, f.withdrawn_reason, COUNT(a.id) AS attempts, ' +
      "SUM(a.outcome = 'verified_running') AS verified, MAX(a.created_at) AS last_used " +
      'FROM firmware_images f LEFT JOIN flash_attempts a ON a.firmware_id = f.id ' +
      'WHERE f.model_key = :key AND f.unit = :unit GROUP BY f.id ' +
      'ORDER BY (f.withdrawn_at IS NOT NULL), f.known_good DESC, verified DESC, f.created_at DESC, f.id DESC',
    { replacements: { key: modelKey(model), unit }, type: QueryTypes.SELECT },
  );
  return {
    model,
    unit,
    images: rows.map((r) => {
      const attempts = Number(r.attempts);
      const verified = Number(r.verified ?? 0);
      return {
        firmwareId: Number(r.id),
        version: r.version,
        size: Number(r.size),
        sha256: r.sha256,
        knownGood: Boolean(r.known_good) && !r.withdrawn_at,
        withdrawn: !!r.withdrawn_at,
        withdrawnReason: r.withdrawn_reason,
        attempts,
        verified,
        successRate: attempts ? verified / attempts : null,
        lastUsedAt: iso(r.last_used),
      };
    }),
  };
}
