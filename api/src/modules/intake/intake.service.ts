// Intake details after hand-in: technicians correct them (each edit a timeline event saying what
// changed, for the bench only), and find the member they hand equipment in for.
import { Op, OptimisticLockError } from 'sequelize';
import { ConflictError, ForbiddenError, NotFoundError, RuleError } from '../../errors';
import type { SessionUser } from '../auth/session-user';
import { bumpBoardRevision } from '../board/board-revision';
import { User } from '../users/user.model';
import { escapeLike } from '../tickets/ticket-search';
import { Ticket, TicketEvent } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { findVisibleTicket, getTicketDetail, movesTickets, ticketLink, type TicketsDeps } from '../tickets/tickets.service';
import { readClubName } from '../club/club-settings.service';
import { readBookingSettings } from '../benches/booking-settings';
import { renderIntakeTag } from './intake-tag';
import type { IntakeEditInput } from '../tickets/tickets.schemas';
import { EQUIPMENT_KIND_LABELS, SYMPTOM_LABELS, type TicketDetail } from '../../contracts/tickets';

export const STALE_INTAKE_MESSAGE = 'Someone else changed this ticket a moment ago. Reload it, check their change, and make yours again.';

/** A member a technician may hand in for (`GET /api/tickets/owners`). */
export interface OwnerSuggestion {
  id: number;
  displayName: string;
  callSign: string | null;
  email: string;
}

/** Accounts matching the search (name, e-mail or call sign), at most 10, by name. */
export async function searchOwners(user: SessionUser, q: string | undefined): Promise<{ items: OwnerSuggestion[] }> {
  if (!movesTickets(user)) throw new ForbiddenError('Only technicians hand equipment in for someone else.');
  const like = `%${escapeLike(q ?? '')}%`;
  const rows = await User.findAll({
    attributes: ['id', 'displayName', 'callSign', 'email'],
    where: {
      disabled: false,
      ...(q ? { [Op.or]: [{ displayName: { [Op.like]: like } }, { email: { [Op.like]: like } }, { callSign: { [Op.like]: like } }] } : {}),
    },
    order: [
      ['displayName', 'ASC'],
      ['id', 'ASC'],
    ],
    limit: 10,
  });
  return { items: rows.map((u) => ({ id: u.id, displayName: u.displayName, callSign: u.callSign, email: u.email })) };
}

const quote = (v: string | null | undefined) => (v ? `“${v}”` : 'nothing');

/** "Accessories: added Microphone; removed Manual" style wording for a list that changed. */
function listChange(label: string, before: string[], after: string[]): string | null {
  const added = after.filter((a) => !before.includes(a));
  const removed = before.filter((b) => !after.includes(b));
  if (!added.length && !removed.length) return before.join('\u0000') === after.join('\u0000') ? null : `${label}: reordered`;
  return `${label}: ${[added.length ? `added ${added.join(', ')}` : '', removed.length ? `removed ${removed.join(', ')}` : ''].filter(Boolean).join('; ')}`;
}

/** What an edit changes, one line per field, in plain words (the timeline event's note). */
export function describeIntakeChanges(before: Pick<TicketDetail, 'equipmentKind' | 'makeModel' | 'serialNumber' | 'units' | 'symptoms' | 'faultReported' | 'accessories' | 'accessoriesNote' | 'firmwareVersions' | 'updatesBy' | 'ownerName' | 'ownerEmail' | 'ownerPhone' | 'ownerCallSign'>, edit: Omit<IntakeEditInput, 'version'>): string[] {
  const lines: (string | null)[] = [];
  const text = (label: string, from: string | null, to: string | null | undefined) => {
    if (to === undefined) return;
    const next = to ?? null;
    if ((from ?? null) !== next) lines.push(`${label}: ${quote(from)} → ${quote(next)}`);
  };
  if (edit.equipmentKind !== undefined && edit.equipmentKind !== before.equipmentKind) {
    lines.push(`Kind: ${EQUIPMENT_KIND_LABELS[before.equipmentKind]} → ${EQUIPMENT_KIND_LABELS[edit.equipmentKind]}`);
  }
  text('Make and model', before.makeModel, edit.makeModel);
  text('Serial number', before.serialNumber, edit.serialNumber);
  if (edit.units) lines.push(listChange('Units', before.units, edit.units));
  if (edit.symptoms) {
    lines.push(listChange('Symptoms', before.symptoms.map((s) => SYMPTOM_LABELS[s]), edit.symptoms.map((s) => SYMPTOM_LABELS[s])));
  }
  if (edit.faultReported !== undefined && edit.faultReported !== before.faultReported) lines.push('Fault as reported: rewritten');
  if (edit.accessories) lines.push(listChange('Accessories', before.accessories, edit.accessories));
  text('Note on accessories', before.accessoriesNote, edit.accessoriesNote);
  text('Firmware versions', before.firmwareVersions, edit.firmwareVersions);
  if (edit.updatesBy !== undefined && edit.updatesBy !== before.updatesBy) lines.push(`Updates by: ${before.updatesBy} → ${edit.updatesBy}`);
  if (edit.owner) {
    text('Owner’s name', before.ownerName, edit.owner.name ?? null);
    text('Owner’s e-mail', before.ownerEmail, edit.owner.email ?? null);
    text('Owner’s phone', before.ownerPhone, edit.owner.phone ?? null);
    text('Owner’s call sign', before.ownerCallSign, edit.owner.callSign ?? null);
  }
  return lines.filter((l): l is string => l !== null);
}

/**
 * Corrects intake details. The version the editor saw must still be the ticket's (409 otherwise);
 * the change and its 'intake_edited' event (owner_visible false: a bench record) commit together.
 * An edit that changes nothing answers the ticket as it is and records nothing.
 */
export async function editIntake(deps: TicketsDeps, user: SessionUser, input: { tag: string } & IntakeEditInput): Promise<TicketDetail> {
  if (!movesTickets(user)) throw new ForbiddenError('Only technicians change intake details.');
  const { tag, version, ...edit } = input;
  const found = await findVisibleTicket(user, tag);
  await deps.sequelize.transaction(async (transaction) => {
    const ticket = await Ticket.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!ticket) throw new NotFoundError(`There is no ticket ${formatTag(found.id)}.`, 'ticket_not_found');
    if (ticket.version !== version) throw new ConflictError('stale_version', STALE_INTAKE_MESSAGE);
    if (ticket.state === 'closed') throw new RuleError('ticket_closed', 'This ticket is closed; its intake details stay as they were.');
    if (edit.owner && ticket.ownerUserId !== null) {
      throw new RuleError('owner_has_account', 'This owner has an account: their name and contact details come from it, so change them there.');
    }
    const changes = describeIntakeChanges(
      {
        equipmentKind: ticket.equipmentKind,
        makeModel: ticket.makeModel,
        serialNumber: ticket.serialNumber,
        units: ticket.units,
        symptoms: ticket.symptoms,
        faultReported: ticket.faultReported,
        accessories: ticket.accessories,
        accessoriesNote: ticket.accessoriesNote ?? null,
        firmwareVersions: ticket.firmwareVersions,
        updatesBy: ticket.updatesBy,
        ownerName: ticket.ownerName,
        ownerEmail: ticket.ownerEmail,
        ownerPhone: ticket.ownerPhone,
        ownerCallSign: ticket.ownerCallSign,
      },
      edit,
    );
    if (!changes.length) return;

    if (edit.equipmentKind !== undefined) ticket.equipmentKind = edit.equipmentKind;
    if (edit.makeModel !== undefined) ticket.makeModel = edit.makeModel;
    if (edit.serialNumber !== undefined) ticket.serialNumber = edit.serialNumber ?? null;
    if (edit.units !== undefined) ticket.units = edit.units;
    if (edit.symptoms !== undefined) ticket.symptoms = edit.symptoms;
    if (edit.faultReported !== undefined) ticket.faultReported = edit.faultReported;
    if (edit.accessories !== undefined) ticket.accessories = edit.accessories;
    if (edit.accessoriesNote !== undefined) ticket.accessoriesNote = edit.accessoriesNote ?? null;
    if (edit.firmwareVersions !== undefined) ticket.firmwareVersions = edit.firmwareVersions ?? null;
    if (edit.owner) {
      ticket.ownerName = edit.owner.name!;
      ticket.ownerEmail = edit.owner.email ?? null;
      ticket.ownerPhone = edit.owner.phone ?? null;
      ticket.ownerCallSign = edit.owner.callSign ?? null;
    }
    if (edit.updatesBy !== undefined) ticket.updatesBy = edit.updatesBy;
    if (ticket.updatesBy === 'email' && !ticket.ownerEmail) {
      throw new RuleError('no_email_address', 'Updates by e-mail need the owner’s e-mail address: give one, or choose phone or none.');
    }
    if (ticket.updatesBy === 'phone' && !ticket.ownerPhone && ticket.ownerUserId === null) {
      throw new RuleError('no_phone_number', 'Updates by phone need the owner’s phone number: give one, or choose e-mail or none.');
    }
    ticket.notifyByEmail = ticket.updatesBy === 'email' && ticket.ownerEmail !== null;
    try {
      await ticket.save({ transaction });
    } catch (err) {
      if (err instanceof OptimisticLockError) throw new ConflictError('stale_version', STALE_INTAKE_MESSAGE);
      throw err;
    }
    await TicketEvent.create(
      { ticketId: ticket.id, actorId: user.id, kind: 'intake_edited', fromState: null, toState: null, note: `Intake details changed. ${changes.join('. ')}.`, ownerVisible: false, createdAt: deps.clock() },
      { transaction },
    );
    await bumpBoardRevision(deps.sequelize, transaction);
  });
  return getTicketDetail(deps, user, { tag: formatTag(found.id) });
}

/** The intake tag PDF of a ticket the person may see (technicians; a member only for their own ticket). */
export async function intakeTagOf(deps: TicketsDeps, user: SessionUser, tag: string): Promise<{ pdf: Buffer; fileName: string }> {
  const ticket = await findVisibleTicket(user, tag);
  const canonical = formatTag(ticket.id);
  const [clubName, settings] = await Promise.all([readClubName(), readBookingSettings(deps.sequelize)]);
  const pdf = await renderIntakeTag({
    clubName,
    tag: canonical,
    ownerName: ticket.ownerName,
    ownerCallSign: ticket.ownerCallSign,
    equipmentKind: ticket.equipmentKind,
    makeModel: ticket.makeModel,
    units: ticket.units,
    serialNumber: ticket.serialNumber,
    accessories: ticket.accessories,
    accessoriesNote: ticket.accessoriesNote ?? null,
    symptoms: ticket.symptoms,
    handedInAt: ticket.createdAt,
    timeZone: settings.timeZone,
    link: ticketLink(deps.config, canonical),
  });
  return { pdf, fileName: `intake-tag-${canonical}.pdf` };
}
