// Multipart uploads for the firmware and flash-attempt routes.
//
// ChecksummingStorage is a multer storage engine: the image's bytes stream from the request
// through the one-thread createImageChecksums() (SHA-256, CRC-32, CRC-16/XMODEM) into a staged
// blob, never held whole in memory. The route decides afterwards whether to commit it (under its
// SHA-256) or discard it; a refused upload leaves no file behind.
import type { Request, RequestHandler } from 'express';
import multer, { MulterError, type StorageEngine } from 'multer';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { createImageChecksums, type ImageChecksums } from '../../domain/checksums';
import { AppError, ValidationError } from '../../errors';
import type { BlobStore, StagedBlob } from '../../storage';

export interface StagedUpload {
  size: number;
  checksums: ImageChecksums;
  staged: StagedBlob;
  originalname: string;
}

type EngineFile = Express.Multer.File & Partial<StagedUpload>;

export class ChecksummingStorage implements StorageEngine {
  constructor(private readonly store: BlobStore) {}

  _handleFile(_req: Request, file: Express.Multer.File, cb: (error?: unknown, info?: Partial<EngineFile>) => void): void {
    const staged = this.store.stage();
    const sums = createImageChecksums();
    let size = 0;
    const tap = new Transform({
      transform(chunk: Buffer, _enc, done) {
        sums.update(chunk);
        size += chunk.length;
        done(null, chunk);
      },
    });
    pipeline(file.stream, tap, staged.stream).then(
      () => cb(null, { size, checksums: sums.digest(), staged } as Partial<EngineFile>),
      (err: unknown) => void staged.discard().finally(() => cb(err)),
    );
  }

  _removeFile(_req: Request, file: EngineFile, cb: (error: Error | null) => void): void {
    (file.staged ? file.staged.discard() : Promise.resolve()).then(
      () => cb(null),
      (err: Error) => cb(err),
    );
  }
}

/** multer's errors in the API's one error shape (413 for sizes and counts, 400 for the rest). */
function toAppError(err: unknown, limits: { fileBytes: number; what: string; field: string }): unknown {
  if (!(err instanceof MulterError)) return err;
  switch (err.code) {
    case 'LIMIT_FILE_SIZE':
      return new AppError(413, 'file_too_large', `The ${limits.what} is larger than ${formatBytes(limits.fileBytes)}, the most this bench accepts.`, {
        [limits.field]: `At most ${formatBytes(limits.fileBytes)}.`,
      });
    case 'LIMIT_FILE_COUNT':
    case 'LIMIT_PART_COUNT':
    case 'LIMIT_FIELD_COUNT':
      return new AppError(413, 'too_many_parts', `Send one ${limits.what} and the form's fields, nothing more.`);
    case 'LIMIT_UNEXPECTED_FILE':
      return new ValidationError(`Send the ${limits.what} in the field "${limits.field}".`, { [limits.field]: `Send the file in the field "${limits.field}".` });
    case 'LIMIT_FIELD_VALUE':
      return new AppError(413, 'field_too_large', `The field "${err.field ?? ''}" is too long.`);
    default:
      return new ValidationError('The form could not be read. Send it again as multipart/form-data.');
  }
}

export function formatBytes(n: number): string {
  if (n >= 1024 * 1024) return `${+(n / (1024 * 1024)).toFixed(1)} MiB`;
  if (n >= 1024) return `${+(n / 1024).toFixed(1)} KiB`;
  return `${n} bytes`;
}

/**
 * Runs a multer `.single(field)` middleware as a promise, so the handler can clean up in one
 * place and multer's errors become the API's (Express 5 forwards the rejection).
 */
export function runUpload(middleware: RequestHandler, req: Request, res: Parameters<RequestHandler>[1], limits: { fileBytes: number; what: string; field: string }): Promise<void> {
  return new Promise((resolve, reject) => {
    middleware(req, res, (err?: unknown) => (err ? reject(toAppError(err, limits)) : resolve()));
  });
}

export function imageUploader(store: BlobStore, maxBytes: number): RequestHandler {
  // multer 2.5 passes highWaterMark and fileHwm to busboy; @types/multer does not list them yet.
  const options: multer.Options & { highWaterMark?: number; fileHwm?: number } = {
    storage: new ChecksummingStorage(store),
    // Larger buffers than busboy's 16 KiB default: fewer, bigger chunks through the checksums
    // and the file (bench/upload.ts); still a bounded few hundred KiB per upload.
    highWaterMark: 256 * 1024,
    fileHwm: 256 * 1024,
    limits: { fileSize: maxBytes, files: 1, fields: 12, parts: 14, fieldSize: 8 * 1024, fieldNameSize: 100 },
  };
  return multer(options).single('image');
}

export function serialLogUploader(maxBytes: number): RequestHandler {
  return multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: maxBytes, files: 1, fields: 20, parts: 22, fieldSize: 16 * 1024, fieldNameSize: 100 },
  }).single('serialLog');
}
