import { ListQuery } from '../../core/http/api-error';
import type { FirmwareSort, FirmwareUnit, FlashOutcome, SerialParity, SerialStopBits } from '@contracts/firmware';

// What the server sends is the API's own (api/src/contracts/firmware.ts); bodies and queries are the client's.
export { FIRMWARE_UNITS, FIRMWARE_UNIT_LABELS, FLASH_OUTCOMES, FLASH_OUTCOME_LABELS, SERIAL_PARITIES, SERIAL_STOP_BITS } from '@contracts/firmware';
export type {
  FirmwareChecksums,
  FirmwareImage,
  FirmwareSort,
  FirmwareStatus,
  FirmwareUnit,
  FirmwareUploaded,
  FlashAttempt,
  FlashAttemptsView,
  FlashOutcome,
  TrackRecord,
  TrackRecordRow,
  UnitFirmware,
} from '@contracts/firmware';

export interface FirmwareQuery extends ListQuery {
  sort?: FirmwareSort;
  unit?: FirmwareUnit | '';
  status?: 'known_good' | 'available' | 'withdrawn' | 'usable' | '';
}

/** Fields of `POST /api/firmware` beside the file. */
export interface UploadFields {
  model: string;
  unit: FirmwareUnit;
  version: string;
  releaseNotes?: string;
  source?: string;
  makerChecksum?: string;
}

/** Fields of `POST /api/tickets/:tag/flash-attempts` beside the serial log. */
export interface AttemptFields {
  unit: FirmwareUnit;
  firmwareId: number;
  port: string;
  baud: number;
  dataBits: number;
  parity: SerialParity;
  stopBits: SerialStopBits;
  block: 128 | 1024;
  check: 'crc' | 'sum';
  outcome: FlashOutcome;
  failedAtBlock?: number;
  notes?: string;
}

/** Upload progress: 0-100 while sending, then the answer. */
export type UploadState<T> = { kind: 'progress'; percent: number } | { kind: 'done'; value: T };
