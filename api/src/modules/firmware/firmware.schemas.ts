// Input schemas for the Firmware library and flash attempts (zod 4). Multipart fields arrive as
// strings, so numbers are coerced; bodies are strict (unknown fields are refused, nothing is
// mass-assigned: status, checksums, size and numbering are the server's).
import { z } from 'zod';
import { FIRMWARE_UNITS, FLASH_OUTCOMES, SERIAL_PARITIES, SERIAL_STOP_BITS } from '../../contracts/firmware';
import { SERIAL_BAUDS } from '../../domain/xmodem';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';

const line = (min: number, max: number, missing: string) =>
  z.string(missing).trim().min(min, missing).max(max, `Keep it to ${max} characters.`).regex(SINGLE_LINE, SINGLE_LINE_MESSAGE);

const optional = <T extends z.ZodType>(schema: T) =>
  z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? undefined : v), schema.optional());

const unit = z.enum(FIRMWARE_UNITS, 'Choose the unit: display head, main board, DSP or other.');

/** A checksum the maker publishes: SHA-256 (64 hex digits), CRC-32 (8) or CRC-16/XMODEM (4); "0x" and spaces allowed. */
export const makerChecksumSchema = z
  .string()
  .transform((v) => v.replace(/\s+/g, '').replace(/^0x/i, '').toLowerCase())
  .refine((v) => /^[0-9a-f]+$/.test(v) && [4, 8, 64].includes(v.length), {
    message: 'Give the maker’s checksum as hex: 64 digits (SHA-256), 8 (CRC-32) or 4 (CRC-16/XMODEM).',
  });

export const uploadFieldsSchema = z.strictObject({
  model: line(1, 120, 'Give the equipment model this image is for.'),
  unit,
  version: line(1, 40, 'Give the firmware version, as the maker writes it.'),
  releaseNotes: optional(z.string().trim().max(4000, 'Keep the release notes to 4000 characters.')),
  source: optional(line(1, 300, 'Say where the file came from.')),
  makerChecksum: optional(makerChecksumSchema),
});
export type UploadFields = z.infer<typeof uploadFieldsSchema>;

export const FIRMWARE_SORTS = ['model', 'unit', 'version', 'size', 'createdAt'] as const;

export const firmwareListSchema = z.strictObject({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(FIRMWARE_SORTS).default('createdAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  q: optional(z.string().trim().max(120)),
  unit: optional(unit),
  status: optional(z.enum(['known_good', 'available', 'withdrawn', 'usable'])),
});
export type FirmwareListQuery = z.infer<typeof firmwareListSchema>;

export const markSchema = z.strictObject({
  knownGood: z.boolean('Say whether the image is known good (true or false).'),
});

export const withdrawSchema = z.strictObject({
  reason: z.string('Say why the image is withdrawn.').trim().min(3, 'Say why the image is withdrawn (at least 3 characters).').max(500, 'Keep the reason to 500 characters.'),
});

export const trackRecordSchema = z.strictObject({
  model: line(1, 120, 'Give the equipment model.'),
  unit,
});

export const attemptFieldsSchema = z
  .strictObject({
    unit,
    firmwareId: z.coerce.number('Choose an image from the Firmware library.').int().min(1, 'Choose an image from the Firmware library.'),
    port: line(1, 60, 'Give the serial port as the bench computer names it (e.g. COM3 or /dev/ttyUSB0).'),
    baud: z.coerce
      .number('Choose a baud rate.')
      .int()
      .refine((b) => (SERIAL_BAUDS as readonly number[]).includes(b), 'Choose one of the usual baud rates (1200 to 921600).')
      .default(115200),
    dataBits: z.coerce.number().int().min(5, 'Data bits are 5 to 8.').max(8, 'Data bits are 5 to 8.').default(8),
    parity: z.enum(SERIAL_PARITIES, 'Parity is none, even, odd, mark or space.').default('none'),
    stopBits: z.enum(SERIAL_STOP_BITS, 'Stop bits are 1, 1.5 or 2.').default('1'),
    block: z.coerce
      .number()
      .refine((b) => b === 128 || b === 1024, 'XMODEM blocks are 128 or 1024 bytes.')
      .default(128)
      .transform((b) => b as 128 | 1024),
    check: z.enum(['crc', 'sum'], 'The XMODEM check is crc or sum.').default('crc'),
    outcome: z.enum(FLASH_OUTCOMES, 'Choose the outcome of the attempt.'),
    failedAtBlock: optional(z.coerce.number('Give the block number as a whole number.').int('Give the block number as a whole number.').min(1, 'Blocks are counted from 1.')),
    notes: optional(z.string().trim().max(4000, 'Keep the notes to 4000 characters.')),
  })
  .superRefine((v, ctx) => {
    if (v.outcome === 'transfer_failed' && v.failedAtBlock === undefined) {
      ctx.addIssue({ code: 'custom', path: ['failedAtBlock'], message: 'Give the block at which the transfer failed.' });
    }
    if (v.outcome !== 'transfer_failed' && v.failedAtBlock !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['failedAtBlock'], message: 'A block number belongs only to a failed transfer.' });
    }
  });
export type AttemptFields = z.infer<typeof attemptFieldsSchema>;

export const attemptListSchema = z.strictObject({
  q: optional(z.string().trim().max(120)),
});
