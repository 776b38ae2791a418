// The API's data shapes for the Firmware library and flash attempts (client: `@contracts/firmware`).
// Plain TypeScript: types and `as const` lists only, no framework or node imports.

/** The unit of a radio an image is for. */
export const FIRMWARE_UNITS = ['display_head', 'main_board', 'dsp', 'other'] as const;
export type FirmwareUnit = (typeof FIRMWARE_UNITS)[number];

export const FIRMWARE_UNIT_LABELS: Record<FirmwareUnit, string> = {
  display_head: 'Display head',
  main_board: 'Main board',
  dsp: 'DSP',
  other: 'Other unit',
};

/** Checksums of an image: lower-case hex, 64, 8 and 4 digits. */
export interface FirmwareChecksums {
  sha256: string;
  crc32: string;
  crc16Xmodem: string;
}

/** The answer of `POST /api/firmware` (fixed by the product brief). */
export interface FirmwareUploaded {
  id: number;
  size: number;
  checksums: FirmwareChecksums;
}

export type FirmwareStatus = 'known_good' | 'available' | 'withdrawn';

/** A row of `GET /api/firmware` and the body of `GET /api/firmware/:id`. */
export interface FirmwareImage {
  id: number;
  model: string;
  unit: FirmwareUnit;
  version: string;
  size: number;
  checksums: FirmwareChecksums;
  releaseNotes: string | null;
  source: string | null;
  originalName: string | null;
  /** Which published checksum the upload was compared with, if one was given. */
  makerChecksumKind: keyof FirmwareChecksums | null;
  status: FirmwareStatus;
  knownGood: boolean;
  withdrawnAt: string | null;
  withdrawnReason: string | null;
  uploadedByName: string | null;
  createdAt: string;
}

export type FirmwareSort = 'model' | 'unit' | 'version' | 'size' | 'createdAt';

/** Outcome of one flash attempt, in the order a technician meets them. */
export const FLASH_OUTCOMES = ['bootloader_not_entered', 'transfer_failed', 'transfer_completed', 'verified_running'] as const;
export type FlashOutcome = (typeof FLASH_OUTCOMES)[number];

export const FLASH_OUTCOME_LABELS: Record<FlashOutcome, string> = {
  bootloader_not_entered: 'Bootloader not entered',
  transfer_failed: 'Transfer failed',
  transfer_completed: 'Transfer completed',
  verified_running: 'Verified running',
};

export const SERIAL_PARITIES = ['none', 'even', 'odd', 'mark', 'space'] as const;
export type SerialParity = (typeof SERIAL_PARITIES)[number];
export const SERIAL_STOP_BITS = ['1', '1.5', '2'] as const;
export type SerialStopBits = (typeof SERIAL_STOP_BITS)[number];
export const SERIAL_DATA_BITS = [5, 6, 7, 8] as const;

export interface SerialSettings {
  port: string;
  baud: number;
  dataBits: number;
  parity: SerialParity;
  stopBits: SerialStopBits;
  /** XMODEM block size and check used for the transfer. */
  block: 128 | 1024;
  check: 'crc' | 'sum';
}

/** One flash attempt on a ticket (`GET /api/tickets/:tag/flash-attempts`). */
export interface FlashAttempt {
  number: number;
  unit: FirmwareUnit;
  firmware: { id: number; model: string; version: string; size: number; sha256: string; withdrawn: boolean };
  serial: SerialSettings;
  outcome: FlashOutcome;
  /** For 'transfer_failed': the block that failed (1-based), out of `blocks`. */
  failedAtBlock: number | null;
  blocks: number;
  /** Share of the image sent before the failure, 0-100 (null unless the transfer failed). */
  failedAtPercent: number | null;
  notes: string | null;
  serialLog: { name: string | null; bytes: number } | null;
  /** Lines of the serial log that match the search (`?q=`), at most 5; empty without a search. */
  logMatches: string[];
  technicianName: string | null;
  at: string;
}

/** Firmware now on a unit of the ticket, set by the last attempt verified running. */
export interface UnitFirmware {
  unit: FirmwareUnit;
  version: string;
  firmwareId: number;
  attemptNumber: number;
  at: string;
}

export interface FlashAttemptsView {
  tag: string;
  reflashConsent: boolean;
  /** Attempts may be recorded only while the ticket is in the Reflash lane, with consent. */
  canRecord: boolean;
  /** Why not, when canRecord is false. */
  reason: string | null;
  /** The number the next attempt will get (attempts may be filtered by a search). */
  nextNumber: number;
  attempts: FlashAttempt[];
  unitFirmware: UnitFirmware[];
}

/** "What worked before": one image of a model and unit, with its record on the bench. */
export interface TrackRecordRow {
  firmwareId: number;
  version: string;
  size: number;
  sha256: string;
  knownGood: boolean;
  withdrawn: boolean;
  withdrawnReason: string | null;
  attempts: number;
  verified: number;
  /** verified / attempts, 0-1; null when never tried. */
  successRate: number | null;
  lastUsedAt: string | null;
}

export interface TrackRecord {
  model: string;
  unit: FirmwareUnit;
  /** Known-good first, then by verified count, then newest; withdrawn images last. */
  images: TrackRecordRow[];
}
