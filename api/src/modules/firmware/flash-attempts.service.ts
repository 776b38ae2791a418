// Flash attempts on a ticket: recorded from the Reflash lane, numbered per ticket, each naming the
// unit, the image from the Firmware library, the serial settings, the outcome, notes and the serial
// log. An attempt verified running sets the firmware now on that unit and releases the Reflash →
// Bench test guard (hasVerifiedFlash, read by tickets.service moveFactsOf).
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { AppError, NotFoundError, RuleError, ValidationError } from '../../errors';
import type { SessionUser } from '../auth/session-user';
import { planXmodemTransfer } from '../../domain/xmodem';
import {
  FIRMWARE_UNIT_LABELS,
  FLASH_OUTCOME_LABELS,
  type FirmwareUnit,
  type FlashAttempt,
  type FlashAttemptsView,
  type FlashOutcome,
  type SerialParity,
  type SerialStopBits,
  type UnitFirmware,
} from '../../contracts/firmware';
import { formatTag, parseTag } from '../tickets/tag';
import { escapeLike } from '../tickets/ticket-search';
import { modelKey } from './firmware.service';
import type { AttemptFields } from './firmware.schemas';

export interface FlashAttemptDeps {
  sequelize: Sequelize;
}

/** The fact the Reflash → Bench test guard waits for: an attempt on this ticket verified running. */
export async function hasVerifiedFlash(sequelize: Sequelize, ticketId: number, transaction?: Transaction): Promise<boolean> {
  const rows = await sequelize.query<{ found: number }>(
    "SELECT 1 AS found FROM flash_attempts WHERE ticket_id = :ticketId AND outcome = 'verified_running' LIMIT 1",
    { replacements: { ticketId }, type: QueryTypes.SELECT, transaction },
  );
  return rows.length > 0;
}

type TicketFacts = { id: number; state: string; reflash_consent: number | boolean; make_model: string };

async function findTicket(sequelize: Sequelize, tag: string, transaction?: Transaction, lock = false): Promise<TicketFacts> {
  const id = parseTag(tag);
  const rows = id
    ? await sequelize.query<TicketFacts>(
        `SELECT id, state, reflash_consent, make_model FROM tickets WHERE id = :id${lock ? ' FOR UPDATE' : ''}`,
        { replacements: { id }, type: QueryTypes.SELECT, transaction },
      )
    : [];
  if (!rows[0]) throw new NotFoundError(`There is no ticket ${tag.slice(0, 20)}.`, 'ticket_not_found');
  return rows[0];
}

/** Why attempts cannot be recorded on this ticket now, or null when they can. */
function recordRefusal(ticket: TicketFacts): { code: string; message: string } | null {
  if (!ticket.reflash_consent) {
    return {
      code: 'no_reflash_consent',
      message: 'The owner has not consented to a reflash (settings and memories may be lost). Record consent before any flash attempt.',
    };
  }
  if (ticket.state !== 'reflash') {
    return { code: 'not_in_reflash', message: 'Flash attempts are recorded while the ticket is in the Reflash lane. Move it to Reflash first.' };
  }
  return null;
}

type AttemptRecord = {
  number: number;
  unit: FirmwareUnit;
  firmware_id: number;
  f_model: string;
  f_version: string;
  f_size: number;
  f_sha256: string;
  f_withdrawn_at: Date | null;
  serial_port: string;
  baud: number;
  data_bits: number;
  parity: SerialParity;
  stop_bits: SerialStopBits;
  xmodem_block: number;
  xmodem_check: 'crc' | 'sum';
  outcome: FlashOutcome;
  failed_at_block: number | null;
  notes: string | null;
  serial_log_name: string | null;
  serial_log_bytes: number | null;
  serial_log?: string | null;
  technician_name: string | null;
  created_at: Date;
};

function matchingLines(text: string | null | undefined, q: string): string[] {
  if (!text) return [];
  const needle = q.toLowerCase();
  return text
    .split(/\r?\n/)
    .filter((l) => l.toLowerCase().includes(needle))
    .slice(0, 5)
    .map((l) => (l.length > 200 ? `${l.slice(0, 200)}…` : l));
}

function toAttempt(r: AttemptRecord, q?: string): FlashAttempt {
  const block = Number(r.xmodem_block) as 128 | 1024;
  const blocks = Math.ceil(Number(r.f_size) / block);
  const failedAt = r.failed_at_block === null ? null : Number(r.failed_at_block);
  return {
    number: Number(r.number),
    unit: r.unit,
    firmware: {
      id: Number(r.firmware_id),
      model: r.f_model,
      version: r.f_version,
      size: Number(r.f_size),
      sha256: r.f_sha256,
      withdrawn: !!r.f_withdrawn_at,
    },
    serial: {
      port: r.serial_port,
      baud: Number(r.baud),
      dataBits: Number(r.data_bits),
      parity: r.parity,
      stopBits: r.stop_bits,
      block,
      check: r.xmodem_check,
    },
    outcome: r.outcome,
    failedAtBlock: failedAt,
    blocks,
    // Blocks before the failed one got through: (N - 1) of all blocks.
    failedAtPercent: failedAt === null ? null : Math.round(((failedAt - 1) / blocks) * 1000) / 10,
    notes: r.notes,
    serialLog: r.serial_log_bytes === null ? null : { name: r.serial_log_name, bytes: Number(r.serial_log_bytes) },
    logMatches: q ? matchingLines(r.serial_log, q) : [],
    technicianName: r.technician_name,
    at: new Date(r.created_at).toISOString(),
  };
}

/** Attempts on a ticket (oldest first), the firmware now on its units, and whether more may be recorded. `q` searches notes and serial logs. */
export async function listAttempts(deps: FlashAttemptDeps, tag: string, q?: string): Promise<FlashAttemptsView> {
  const { sequelize } = deps;
  const ticket = await findTicket(sequelize, tag);
  const replacements: Record<string, unknown> = { id: ticket.id };
  let search = '';
  if (q) {
    search = ' AND (a.notes LIKE :like OR a.serial_log LIKE :like)';
    replacements.like = `%${escapeLike(q)}%`;
  }
  const [attempts, units, last] = await Promise.all([
    sequelize.query<AttemptRecord>(
      'SELECT a.number, a.unit, a.firmware_id, f.model AS f_model, f.version AS f_version, f.size AS f_size, f.sha256 AS f_sha256, ' +
        'f.withdrawn_at AS f_withdrawn_at, a.serial_port, a.baud, a.data_bits, a.parity, a.stop_bits, a.xmodem_block, a.xmodem_check, ' +
        `a.outcome, a.failed_at_block, a.notes, a.serial_log_name, a.serial_log_bytes${q ? ', a.serial_log' : ''}, ` +
        'u.display_name AS technician_name, a.created_at FROM flash_attempts a JOIN firmware_images f ON f.id = a.firmware_id ' +
        `LEFT JOIN users u ON u.id = a.technician_id WHERE a.ticket_id = :id${search} ORDER BY a.number`,
      { replacements, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ unit: FirmwareUnit; version: string; firmware_id: number; attempt_number: number; updated_at: Date }>(
      'SELECT unit, version, firmware_id, attempt_number, updated_at FROM ticket_unit_firmware WHERE ticket_id = :id ORDER BY unit',
      { replacements: { id: ticket.id }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ n: number | null }>('SELECT MAX(number) AS n FROM flash_attempts WHERE ticket_id = :id', {
      replacements: { id: ticket.id },
      type: QueryTypes.SELECT,
    }),
  ]);
  const refusal = recordRefusal(ticket);
  return {
    tag: formatTag(ticket.id),
    reflashConsent: !!ticket.reflash_consent,
    canRecord: !refusal,
    reason: refusal?.message ?? null,
    nextNumber: Number(last[0]?.n ?? 0) + 1,
    attempts: attempts.map((a) => toAttempt(a, q)),
    unitFirmware: units.map(
      (u): UnitFirmware => ({
        unit: u.unit,
        version: u.version,
        firmwareId: Number(u.firmware_id),
        attemptNumber: Number(u.attempt_number),
        at: new Date(u.updated_at).toISOString(),
      }),
    ),
  };
}

/** A serial log is text: UTF-8 without NUL bytes. Anything else is refused (it is not a log). */
export function decodeSerialLog(bytes: Buffer): string {
  if (bytes.length === 0) throw new ValidationError('The serial log file is empty. Save the terminal output to a text file and choose it.', { serialLog: 'The file is empty.' });
  if (bytes.includes(0)) {
    throw new ValidationError('The serial log must be a text file (this one holds binary data). Save the terminal output as text.', {
      serialLog: 'Not a text file.',
    });
  }
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new ValidationError('The serial log is not UTF-8 text. Save the terminal output as UTF-8 text and choose it again.', {
      serialLog: 'Not UTF-8 text.',
    });
  }
}

/**
 * Records one attempt. Refused, storing nothing: without the owner's consent, outside the Reflash
 * lane, with a withdrawn image, an image of another model or unit, or a block number past the end.
 * The attempt, its timeline note and (when verified running) the unit's firmware commit together.
 */
export async function recordAttempt(
  deps: FlashAttemptDeps,
  user: SessionUser,
  tag: string,
  fields: AttemptFields,
  log: { text: string; name: string | null; bytes: number } | null,
): Promise<FlashAttemptsView> {
  const { sequelize } = deps;
  await sequelize.transaction(async (transaction) => {
    // The ticket row lock serialises attempts on one ticket, so numbers never collide.
    const ticket = await findTicket(sequelize, tag, transaction, true);
    const refusal = recordRefusal(ticket);
    if (refusal) throw new RuleError(refusal.code, refusal.message);

    const images = await sequelize.query<{ id: number; model: string; model_key: string; unit: FirmwareUnit; version: string; size: number; withdrawn_at: Date | null; withdrawn_reason: string | null }>(
      'SELECT id, model, model_key, unit, version, size, withdrawn_at, withdrawn_reason FROM firmware_images WHERE id = :id',
      { replacements: { id: fields.firmwareId }, type: QueryTypes.SELECT, transaction },
    );
    const image = images[0];
    if (!image) throw new ValidationError('That image is not in the Firmware library.', { firmwareId: 'Choose an image from the list.' });
    if (image.withdrawn_at) {
      throw new AppError(422, 'image_withdrawn', `Image #${image.id} (version ${image.version}) is withdrawn: ${image.withdrawn_reason ?? 'no reason given'}. Choose another image.`, {
        firmwareId: 'This image is withdrawn.',
      });
    }
    if (image.model_key !== modelKey(ticket.make_model)) {
      throw new AppError(422, 'wrong_model', `Image #${image.id} is for ${image.model}, not for this ticket's ${ticket.make_model}. Choose an image for this model.`, {
        firmwareId: 'Image for another model.',
      });
    }
    if (image.unit !== fields.unit) {
      throw new AppError(
        422,
        'wrong_unit',
        `Image #${image.id} is for the ${FIRMWARE_UNIT_LABELS[image.unit].toLowerCase()}, not the ${FIRMWARE_UNIT_LABELS[fields.unit].toLowerCase()}. Choose the image for the unit you flash.`,
        { firmwareId: 'Image for another unit.' },
      );
    }
    const plan = planXmodemTransfer({ bytes: Number(image.size), block: fields.block, check: fields.check, baud: fields.baud });
    if (fields.failedAtBlock !== undefined && fields.failedAtBlock > plan.blocks) {
      throw new ValidationError(`This image is ${plan.blocks} blocks of ${fields.block} bytes; the failed block must be 1 to ${plan.blocks}.`, {
        failedAtBlock: `1 to ${plan.blocks}.`,
      });
    }

    const [last] = await sequelize.query<{ n: number | null }>('SELECT MAX(number) AS n FROM flash_attempts WHERE ticket_id = :id', {
      replacements: { id: ticket.id },
      type: QueryTypes.SELECT,
      transaction,
    });
    const number = Number(last?.n ?? 0) + 1;
    const now = new Date();
    await sequelize.query(
      'INSERT INTO flash_attempts (ticket_id, number, unit, firmware_id, serial_port, baud, data_bits, parity, stop_bits, xmodem_block, ' +
        'xmodem_check, outcome, failed_at_block, notes, serial_log, serial_log_name, serial_log_bytes, technician_id, created_at) VALUES ' +
        '(:ticketId, :number, :unit, :firmwareId, :port, :baud, :dataBits, :parity, :stopBits, :block, :check, :outcome, :failedAt, ' +
        ':notes, :log, :logName, :logBytes, :userId, :now)',
      {
        replacements: {
          ticketId: ticket.id,
          number,
          unit: fields.unit,
          firmwareId: image.id,
          port: fields.port,
          baud: fields.baud,
          dataBits: fields.dataBits,
          parity: fields.parity,
          stopBits: fields.stopBits,
          block: fields.block,
          check: fields.check,
          outcome: fields.outcome,
          failedAt: fields.failedAtBlock ?? null,
          notes: fields.notes ?? null,
          log: log?.text ?? null,
          logName: log?.name ?? null,
          logBytes: log?.bytes ?? null,
          userId: user.id,
          now,
        },
        type: QueryTypes.INSERT,
        transaction,
      },
    );
    const unitLabel = FIRMWARE_UNIT_LABELS[fields.unit];
    const outcome =
      fields.outcome === 'transfer_failed'
        ? `transfer failed at block ${fields.failedAtBlock} of ${plan.blocks}`
        : FLASH_OUTCOME_LABELS[fields.outcome].toLowerCase();
    await sequelize.query(
      "INSERT INTO ticket_events (ticket_id, actor_id, kind, from_state, to_state, note, created_at) VALUES (:ticketId, :userId, 'note', NULL, NULL, :note, :now)",
      {
        replacements: { ticketId: ticket.id, userId: user.id, now, note: `Flash attempt ${number}: ${unitLabel}, image ${image.version} (#${image.id}): ${outcome}.` },
        type: QueryTypes.INSERT,
        transaction,
      },
    );
    if (fields.outcome === 'verified_running') {
      await sequelize.query(
        'INSERT INTO ticket_unit_firmware (ticket_id, unit, version, firmware_id, attempt_number, updated_at) VALUES (:ticketId, :unit, :version, :firmwareId, :number, :now) ' +
          'ON DUPLICATE KEY UPDATE version = VALUES(version), firmware_id = VALUES(firmware_id), attempt_number = VALUES(attempt_number), updated_at = VALUES(updated_at)',
        { replacements: { ticketId: ticket.id, unit: fields.unit, version: image.version, firmwareId: image.id, number, now }, type: QueryTypes.INSERT, transaction },
      );
    }
  });
  return listAttempts(deps, tag);
}

/** The serial log of attempt `number`, as text. */
export async function readSerialLog(deps: FlashAttemptDeps, tag: string, numberText: string): Promise<{ text: string; fileName: string }> {
  const ticket = await findTicket(deps.sequelize, tag);
  const number = /^\d{1,6}$/.test(numberText) ? Number(numberText) : 0;
  const rows = await deps.sequelize.query<{ serial_log: string | null }>(
    'SELECT serial_log FROM flash_attempts WHERE ticket_id = :id AND number = :number',
    { replacements: { id: ticket.id, number }, type: QueryTypes.SELECT },
  );
  if (!rows[0]) throw new NotFoundError(`There is no flash attempt ${numberText.slice(0, 10)} on ${formatTag(ticket.id)}.`, 'attempt_not_found');
  if (rows[0].serial_log === null) throw new NotFoundError(`Flash attempt ${number} has no serial log.`, 'serial_log_not_found');
  return { text: rows[0].serial_log, fileName: `${formatTag(ticket.id)}-attempt-${number}-serial-log.txt` };
}
