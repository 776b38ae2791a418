// Seeder: a small Firmware library for the demo club and a few flash attempts on its tickets.
// The images are invented: deterministic pseudo-random bytes (SHA-256 in counter mode over the
// entry's name), a few tens of KiB each, for the demo club's own invented models. They are not
// firmware of any real product and would flash nothing.
import { createHash } from 'node:crypto';
import { once } from 'node:events';
import { QueryTypes, type Sequelize } from 'sequelize';
import { loadConfig } from '../../api/src/config';
import { imageChecksums } from '../../api/src/domain/checksums';
import { blobStoreFor } from '../../api/src/storage';
import { modelKey } from '../../api/src/modules/firmware/firmware.service';
import type { FirmwareUnit, FlashOutcome } from '../../api/src/contracts/firmware';

interface DemoImage {
  key: string;
  model: string;
  unit: FirmwareUnit;
  version: string;
  size: number;
  notes: string;
  source: string;
  knownGood?: boolean;
  withdrawn?: string;
  daysAgo: number;
}

const HERON = 'Fenwick Heron 100 HF transceiver';
const WARBLER = 'Marsh Warbler 50 VHF all-mode';
const TEAL = 'Carrow Teal 7 HF/6 m transceiver';
const REEDLING = 'Fenwick Reedling 2 dual-band mobile';

export const DEMO_IMAGES: DemoImage[] = [
  { key: 'heron-head-107', model: HERON, unit: 'display_head', version: '1.07', size: 49_152, knownGood: true, daysAgo: 200,
    notes: 'Display head release; fixes the dim backlight at power-on.', source: 'Maker’s support page, copied by Q2KFT' },
  { key: 'heron-main-209', model: HERON, unit: 'main_board', version: '2.09', size: 131_072, daysAgo: 240,
    notes: 'Older main board release, kept for units that will not take 2.11.', source: 'Club archive USB stick' },
  { key: 'heron-main-210', model: HERON, unit: 'main_board', version: '2.10', size: 132_480, daysAgo: 120,
    withdrawn: 'Recalled by the maker: the band-stack memory is wiped on every start-up.',
    notes: 'Adds the 60 m channel list.', source: 'Maker’s support page' },
  { key: 'heron-main-211', model: HERON, unit: 'main_board', version: '2.11', size: 133_120, knownGood: true, daysAgo: 60,
    notes: 'Replaces 2.10; band-stack fix.', source: 'Maker’s support page, checksum compared' },
  { key: 'warbler-24', model: WARBLER, unit: 'main_board', version: '2.4', size: 98_304, knownGood: true, daysAgo: 90,
    notes: 'Recovery image for units stuck on the start-up logo.', source: 'Owner’s CD, checked against the maker’s SHA-256' },
  { key: 'teal-112', model: TEAL, unit: 'main_board', version: '1.12', size: 180_224, knownGood: true, daysAgo: 150,
    notes: 'Current release.', source: 'Maker’s support page' },
  { key: 'reedling-head-40', model: REEDLING, unit: 'display_head', version: '4.0', size: 40_960, daysAgo: 30,
    notes: 'Control head image; must match the body’s 4.x.', source: 'Maker’s support page' },
];

interface DemoAttempt {
  serial: string;
  image: string;
  outcome: FlashOutcome;
  failedAtBlock?: number;
  notes: string;
  log?: string;
  hoursAfterOpened: number;
  technician: string;
}

export const DEMO_ATTEMPTS: DemoAttempt[] = [
  { serial: 'FH100-19260', image: 'heron-head-107', outcome: 'bootloader_not_entered', hoursAfterOpened: 50, technician: 'tech@kestrelfen.example',
    notes: 'No prompt on the head’s port; try again with the key held before power-on.',
    log: 'Opening /dev/ttyUSB0 at 115200 8N1\nWaiting for bootloader prompt...\n(no answer after 5 s)\n' },
  { serial: 'CT7-38894', image: 'teal-112', outcome: 'transfer_failed', failedAtBlock: 611, hoursAfterOpened: 20, technician: 'tech2@kestrelfen.example',
    notes: 'Transfer stopped when the shack supply’s fan kicked in.',
    log: 'Bootloader 1.0 ready\nErase ... OK\nC\nBlock 611: NAK\nBlock 611: NAK\nBlock 611: NAK\nToo many errors, transfer aborted\n' },
  { serial: 'CT7-38894', image: 'teal-112', outcome: 'verified_running', hoursAfterOpened: 22, technician: 'tech2@kestrelfen.example',
    notes: 'On the bench supply this time; boots to 1.12, memories cleared as the owner expected.',
    log: 'Bootloader 1.0 ready\nErase ... OK\nC\nTransfer complete, 1408 blocks\nCRC OK\nBooting 1.12\n' },
  { serial: 'MW50-2954', image: 'warbler-24', outcome: 'verified_running', hoursAfterOpened: 200, technician: 'tech2@kestrelfen.example',
    notes: 'Display back; no RF output, so on to Repair.', log: 'Loader 2\nErase OK\nTransfer complete\nVerify OK\nRun\n' },
];

/** Deterministic invented bytes: SHA-256 of key:counter, concatenated. */
function demoBytes(key: string, size: number): Buffer {
  const out = Buffer.alloc(size);
  for (let at = 0, i = 0; at < size; at += 32, i++) createHash('sha256').update(`${key}:${i}`).digest().copy(out, at);
  return out;
}

export async function up({ context: sequelize }: { context: Sequelize }): Promise<void> {
  const store = blobStoreFor(loadConfig());
  const now = Date.now();
  const ids = new Map<string, { id: number; version: string; unit: FirmwareUnit; size: number }>();
  const users = new Map(
    (await sequelize.query<{ id: number; email: string }>('SELECT id, email FROM users', { type: QueryTypes.SELECT })).map((u) => [u.email, u.id]),
  );
  for (const img of DEMO_IMAGES) {
    const bytes = demoBytes(img.key, img.size);
    const sums = imageChecksums(bytes);
    const staged = store.stage();
    staged.stream.end(bytes);
    await once(staged.stream, 'finish');
    await staged.commit(sums.sha256);
    const at = new Date(now - img.daysAgo * 86_400_000);
    const [id] = await sequelize.query(
      'INSERT INTO firmware_images (model, model_key, unit, version, release_notes, source, original_name, size, sha256, crc32, crc16_xmodem, ' +
        'maker_checksum_kind, known_good, withdrawn_at, withdrawn_reason, uploaded_by, created_at, updated_at) VALUES (:model, :key, :unit, ' +
        ':version, :notes, :source, :name, :size, :sha256, :crc32, :crc16, NULL, :good, :withdrawnAt, :reason, :by, :at, :at)',
      {
        replacements: {
          model: img.model, key: modelKey(img.model), unit: img.unit, version: img.version, notes: img.notes, source: img.source,
          name: `${img.key}.bin`, size: img.size, sha256: sums.sha256, crc32: sums.crc32, crc16: sums.crc16Xmodem,
          good: !!img.knownGood, withdrawnAt: img.withdrawn ? new Date(at.getTime() + 7 * 86_400_000) : null, reason: img.withdrawn ?? null,
          by: users.get('tech@kestrelfen.example') ?? null, at,
        },
        type: QueryTypes.INSERT,
      },
    );
    ids.set(img.key, { id: Number(id), version: img.version, unit: img.unit, size: img.size });
  }
  const numbers = new Map<number, number>();
  for (const a of DEMO_ATTEMPTS) {
    const [ticket] = await sequelize.query<{ id: number; created_at: Date }>('SELECT id, created_at FROM tickets WHERE serial_number = :serial', {
      replacements: { serial: a.serial },
      type: QueryTypes.SELECT,
    });
    const img = ids.get(a.image);
    if (!ticket || !img) continue;
    const number = (numbers.get(ticket.id) ?? 0) + 1;
    numbers.set(ticket.id, number);
    const at = new Date(new Date(ticket.created_at).getTime() + a.hoursAfterOpened * 3_600_000);
    await sequelize.query(
      'INSERT INTO flash_attempts (ticket_id, number, unit, firmware_id, serial_port, baud, data_bits, parity, stop_bits, xmodem_block, xmodem_check, ' +
        "outcome, failed_at_block, notes, serial_log, serial_log_name, serial_log_bytes, technician_id, created_at) VALUES (:ticket, :number, :unit, :fw, " +
        "'/dev/ttyUSB0', 115200, 8, 'none', '1', 128, 'crc', :outcome, :failedAt, :notes, :log, :logName, :logBytes, :tech, :at)",
      {
        replacements: {
          ticket: ticket.id, number, unit: img.unit, fw: img.id, outcome: a.outcome, failedAt: a.failedAtBlock ?? null, notes: a.notes,
          log: a.log ?? null, logName: a.log ? 'serial-log.txt' : null, logBytes: a.log ? Buffer.byteLength(a.log) : null,
          tech: users.get(a.technician) ?? null, at,
        },
        type: QueryTypes.INSERT,
      },
    );
    if (a.outcome === 'verified_running') {
      await sequelize.query(
        'REPLACE INTO ticket_unit_firmware (ticket_id, unit, version, firmware_id, attempt_number, updated_at) VALUES (:ticket, :unit, :version, :fw, :number, :at)',
        { replacements: { ticket: ticket.id, unit: img.unit, version: img.version, fw: img.id, number, at }, type: QueryTypes.INSERT },
      );
    }
  }
}

export async function down({ context: sequelize }: { context: Sequelize }): Promise<void> {
  await sequelize.query('DELETE FROM ticket_unit_firmware');
  await sequelize.query('DELETE FROM flash_attempts');
  await sequelize.query('DELETE FROM firmware_images WHERE original_name IN (:names)', {
    replacements: { names: DEMO_IMAGES.map((i) => `${i.key}.bin`) },
  });
}
