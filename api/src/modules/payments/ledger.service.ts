// A ticket's (or booking's) money: charges from the fee schedule or parts at cost, waivers,
// payments and refunds, and the balance the hand-back guard reads. Every change locks the ticket
// row first, so two treasurers (or a webhook and a treasurer) never both spend one balance, and
// commits with its timeline event and its receipt mail.
import { DateTime } from 'luxon';
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { AppDeps } from '../../deps';
import { ForbiddenError, NotFoundError, RuleError, ValidationError } from '../../errors';
import { allocatePayment, balanceOf, formatMoney, lineAmount, nextMonth, priceOn, rateFor, requireMinorUnits, sumMinor } from '../../domain/money';
import { CalcInputError } from '../../domain/input-error';
import type { ChargeDto, LedgerDto, PaymentDto, PaymentMethod } from '../../contracts/payments';
import type { EventKind } from '../../contracts/tickets';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';
import { enqueueMail } from '../outbox/outbox.service';
import { readClubName } from '../club/club-settings.service';
import { Ticket, TicketEvent } from '../tickets/ticket.model';
import { formatTag, parseTag } from '../tickets/tag';
import { User, UserRole } from '../users/user.model';
import { Booking } from '../bookings/booking.model';
import { Charge, FeeItem, FeePriceRow, MonthClose, Payment, PaymentAllocation, Refund, Waiver } from './payments.model';
import { receiptMail, receiptPdf } from './receipts';

export type PaymentsDeps = Pick<AppDeps, 'sequelize' | 'config' | 'clock'>;

const iso = (d: Date | string) => (d instanceof Date ? d : new Date(d)).toISOString();

/** The club's currency and time zone (club_settings row 1; defaults when it is missing). */
export async function clubMoney(sequelize: Sequelize, transaction?: Transaction): Promise<{ currency: string; timeZone: string }> {
  const [row] = await sequelize.query<{ currency: string; time_zone: string }>('SELECT currency, time_zone FROM club_settings WHERE id = 1', {
    type: QueryTypes.SELECT,
    transaction,
  });
  return { currency: row?.currency ?? 'GBP', timeZone: row?.time_zone ?? 'Europe/London' };
}

/** The club's local date (YYYY-MM-DD) of an instant. */
export function localDate(at: Date, timeZone: string): string {
  return DateTime.fromJSDate(at).setZone(timeZone).toISODate()!;
}

export async function isMonthClosed(month: string, transaction?: Transaction): Promise<boolean> {
  return (await MonthClose.count({ where: { month }, transaction })) > 0;
}

/**
 * The month a record made now belongs to: the current month, or, when the treasurer has already
 * closed it, the first open month after it (a correction after a close lands in the next month).
 */
export async function ledgerMonthFor(now: Date, timeZone: string, transaction?: Transaction): Promise<string> {
  let month = localDate(now, timeZone).slice(0, 7);
  for (let i = 0; i < 24 && (await isMonthClosed(month, transaction)); i++) month = nextMonth(month);
  return month;
}

/** Field errors of the money rules as 400s with the field named. */
function amountOf(field: string, value: unknown, min = 0): number {
  try {
    return requireMinorUnits(field, value, min);
  } catch (err) {
    if (err instanceof CalcInputError) throw new ValidationError(`${field}: ${err.message}`, { [field]: err.message });
    throw err;
  }
}

// ---- reading a ledger ------------------------------------------------------------------------------

interface LedgerRows {
  charges: Charge[];
  waivers: Waiver[];
  payments: Payment[];
  allocations: PaymentAllocation[];
  refunds: Refund[];
}

async function loadLedger(where: { ticketId: number } | { bookingId: number }, transaction?: Transaction): Promise<LedgerRows> {
  const charges = await Charge.findAll({ where, order: [['id', 'ASC']], transaction });
  const chargeIds = charges.map((c) => c.id);
  const payments =
    'ticketId' in where ? await Payment.findAll({ where: { ticketId: where.ticketId, status: { [Op.ne]: 'pending' } }, order: [['id', 'ASC']], transaction }) : [];
  const paymentIds = payments.map((p) => p.id);
  const [waivers, allocations, refunds] = await Promise.all([
    chargeIds.length ? Waiver.findAll({ where: { chargeId: chargeIds }, order: [['id', 'ASC']], transaction }) : [],
    paymentIds.length ? PaymentAllocation.findAll({ where: { paymentId: paymentIds }, transaction }) : [],
    paymentIds.length ? Refund.findAll({ where: { paymentId: paymentIds }, order: [['id', 'ASC']], transaction }) : [],
  ]);
  return { charges, waivers, payments, allocations, refunds };
}

function totalsOf(rows: LedgerRows) {
  return {
    charges: sumMinor(rows.charges.map((c) => c.amount)),
    waivers: sumMinor(rows.waivers.map((w) => w.amount)),
    payments: sumMinor(rows.payments.filter((p) => p.status === 'succeeded').map((p) => p.amount)),
    refunds: sumMinor(rows.refunds.map((r) => r.amount)),
  };
}

/** Open amount of each charge (amount − waived − allocated), oldest first. */
function openCharges(rows: LedgerRows): { chargeId: number; open: number }[] {
  return rows.charges.map((c) => ({
    chargeId: c.id,
    open:
      c.amount -
      sumMinor(rows.waivers.filter((w) => w.chargeId === c.id).map((w) => w.amount)) -
      sumMinor(rows.allocations.filter((a) => a.chargeId === c.id).map((a) => a.amount)),
  }));
}

/** A ticket's balance: charges − waivers − payments + refunds. */
export async function ticketBalance(ticketId: number, transaction?: Transaction): Promise<number> {
  return balanceOf(totalsOf(await loadLedger({ ticketId }, transaction)));
}

/**
 * The fact the hand-back guard asks (recordedFactsOf in tickets.service.ts): the balance is zero,
 * whether by payment or by the treasurer's waiver.
 */
export async function balanceSettledOf(_sequelize: Sequelize, ticketId: number, transaction?: Transaction): Promise<boolean> {
  return (await ticketBalance(ticketId, transaction)) === 0;
}

async function namesOf(ids: (number | null)[], transaction?: Transaction): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((x): x is number => x !== null))];
  if (!wanted.length) return new Map();
  const users = await User.findAll({ where: { id: wanted }, attributes: ['id', 'displayName'], transaction });
  return new Map(users.map((u) => [u.id, u.displayName]));
}

async function ledgerDto(rows: LedgerRows, currency: string): Promise<LedgerDto> {
  const names = await namesOf(rows.waivers.map((w) => w.createdBy));
  const open = new Map(openCharges(rows).map((o) => [o.chargeId, o.open]));
  const charges: ChargeDto[] = rows.charges.map((c) => {
    const waivers = rows.waivers.filter((w) => w.chargeId === c.id);
    const waived = sumMinor(waivers.map((w) => w.amount));
    return {
      id: c.id,
      description: c.description,
      feeItemId: c.feeItemId,
      quantity: c.quantity,
      unitAmount: c.unitAmount,
      amount: c.amount,
      memberRate: c.memberRate,
      at: iso(c.createdAt),
      waived,
      paid: sumMinor(rows.allocations.filter((a) => a.chargeId === c.id).map((a) => a.amount)),
      open: open.get(c.id) ?? 0,
      waivers: waivers.map((w) => ({ id: w.id, amount: w.amount, reason: w.reason, at: iso(w.createdAt), byName: w.createdBy ? (names.get(w.createdBy) ?? null) : null, adjustment: w.adjustment })),
    };
  });
  const payments: PaymentDto[] = rows.payments.map((p) => {
    const refunds = rows.refunds.filter((r) => r.paymentId === p.id);
    return {
      id: p.id,
      method: p.method,
      status: p.status,
      amount: p.amount,
      reference: p.reference,
      receiptNumber: p.receiptNumber,
      paidAt: p.paidAt ? iso(p.paidAt) : null,
      failureMessage: p.failureMessage,
      refunded: sumMinor(refunds.map((r) => r.amount)),
      refunds: refunds.map((r) => ({ id: r.id, amount: r.amount, reason: r.reason, at: iso(r.createdAt), adjustment: r.adjustment })),
    };
  });
  const totals = totalsOf(rows);
  const balance = balanceOf(totals);
  return { currency, charges, payments, totals, balance, settled: balance === 0 };
}

// ---- tickets the person may see ----------------------------------------------------------------

function seesAllMoney(user: SessionUser): boolean {
  return hasRole(user, 'technician', 'treasurer', 'admin');
}

/** The ticket behind a tag if the person may see it, else 404 (another member's ticket is "not found"). */
async function visibleTicket(user: SessionUser, tag: string, transaction?: Transaction): Promise<Ticket> {
  const id = parseTag(tag);
  const ticket = id ? await Ticket.findByPk(id, { transaction }) : null;
  if (!ticket || (!seesAllMoney(user) && ticket.ownerUserId !== user.id)) {
    throw new NotFoundError(`There is no ticket ${tag.slice(0, 20)} that you can see.`, 'ticket_not_found');
  }
  return ticket;
}

/** Locks the ticket row for the rest of the transaction: money changes on one ticket queue up. */
export async function lockTicket(ticketId: number, transaction: Transaction): Promise<Ticket> {
  const ticket = await Ticket.findByPk(ticketId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!ticket) throw new NotFoundError('That ticket is gone.', 'ticket_not_found');
  return ticket;
}

export async function getTicketLedger(deps: PaymentsDeps, user: SessionUser, input: { tag: string }): Promise<LedgerDto> {
  const ticket = await visibleTicket(user, input.tag);
  const { currency } = await clubMoney(deps.sequelize);
  return ledgerDto(await loadLedger({ ticketId: ticket.id }), currency);
}

/**
 * A ticket's ledger by id, without a signed-in person: for the owner's signed status link, whose
 * route has already checked the link (the lead wires it with issue 7).
 */
export async function ticketLedgerById(deps: PaymentsDeps, ticketId: number): Promise<LedgerDto> {
  const { currency } = await clubMoney(deps.sequelize);
  return ledgerDto(await loadLedger({ ticketId }), currency);
}

async function timeline(transaction: Transaction, ticketId: number, actorId: number | null, kind: EventKind, note: string, now: Date): Promise<void> {
  await TicketEvent.create({ ticketId, actorId, kind, fromState: null, toState: null, note, ownerVisible: true, createdAt: now }, { transaction });
}

/** Whether the ticket's owner holds the member role (member rates), read from their account. */
async function ownerIsMember(ownerUserId: number | null, transaction: Transaction): Promise<boolean> {
  if (!ownerUserId) return false;
  return (await UserRole.count({ where: { userId: ownerUserId, role: 'member' }, transaction })) > 0;
}

export type ChargeInput = { feeItemId: number; quantity: number } | { description: string; amount: number };

/** The charge's description, quantity and copied price: from the schedule on today's date, or parts at cost. */
async function priceCharge(input: ChargeInput, isMember: boolean, today: string, transaction: Transaction) {
  if ('feeItemId' in input) {
    const item = await FeeItem.findByPk(input.feeItemId, { transaction });
    if (!item) throw new ValidationError('feeItemId: There is no such item in the fee schedule.', { feeItemId: 'There is no such item in the fee schedule.' });
    const prices = await FeePriceRow.findAll({ where: { feeItemId: item.id }, transaction });
    const price = priceOn(prices, today);
    if (!price) throw new RuleError('no_price', `${item.name} has no price in force yet (its first price starts later). Ask the treasurer.`);
    const unitAmount = rateFor(price, isMember);
    let amount: number;
    try {
      amount = lineAmount(unitAmount, input.quantity);
    } catch (err) {
      if (err instanceof CalcInputError) throw new ValidationError(`${err.field}: ${err.message}`, { [err.field]: err.message });
      throw err;
    }
    return { feeItemId: item.id, description: item.name, quantity: input.quantity, unitAmount, amount };
  }
  const amount = amountOf('amount', input.amount, 1);
  return { feeItemId: null, description: input.description, quantity: 1, unitAmount: amount, amount };
}

/** Technicians (and the treasurer and admins) add a charge to a ticket. */
export async function addTicketCharge(deps: PaymentsDeps, user: SessionUser, input: { tag: string } & ChargeInput): Promise<LedgerDto> {
  if (!hasRole(user, 'technician', 'treasurer', 'admin')) throw new ForbiddenError('Only the bench and the treasurer add charges.');
  const ticket = await visibleTicket(user, input.tag);
  const { currency, timeZone } = await clubMoney(deps.sequelize);
  await deps.sequelize.transaction(async (transaction) => {
    const locked = await lockTicket(ticket.id, transaction);
    if (locked.state === 'closed') throw new RuleError('ticket_closed', 'This ticket is closed; charges can no longer be added. Open a new ticket for new work.');
    const now = deps.clock();
    const isMember = await ownerIsMember(locked.ownerUserId, transaction);
    const priced = await priceCharge(input, isMember, localDate(now, timeZone), transaction);
    await Charge.create(
      { ticketId: ticket.id, bookingId: null, ...priced, memberRate: isMember, ledgerMonth: await ledgerMonthFor(now, timeZone, transaction), createdBy: user.id, createdAt: now },
      { transaction },
    );
    const each = priced.quantity > 1 ? ` (${priced.quantity} × ${formatMoney(priced.unitAmount, currency)})` : '';
    await timeline(transaction, ticket.id, user.id, 'charge_added', `${priced.description}: ${formatMoney(priced.amount, currency)}${each}${'feeItemId' in input ? (isMember ? ', member rate' : ', non-member rate') : ', parts at cost'}.`, now);
  });
  return getTicketLedger(deps, user, { tag: input.tag });
}

/** The treasurer waives part or all of a charge, with a reason; never more than is open on it or owed on the ticket. */
export async function waiveCharge(deps: PaymentsDeps, user: SessionUser, input: { chargeId: number; amount: number; reason: string }): Promise<LedgerDto> {
  if (!hasRole(user, 'treasurer')) throw new ForbiddenError('Only the treasurer waives charges.');
  const amount = amountOf('amount', input.amount, 1);
  const charge = await Charge.findByPk(input.chargeId);
  if (!charge) throw new NotFoundError('There is no such charge.', 'charge_not_found');
  const { currency, timeZone } = await clubMoney(deps.sequelize);
  await deps.sequelize.transaction(async (transaction) => {
    if (charge.ticketId) await lockTicket(charge.ticketId, transaction);
    else if (charge.bookingId) await Booking.findByPk(charge.bookingId, { transaction, lock: transaction.LOCK.UPDATE });
    const rows = await loadLedger(charge.ticketId ? { ticketId: charge.ticketId } : { bookingId: charge.bookingId! }, transaction);
    const open = openCharges(rows).find((o) => o.chargeId === charge.id)?.open ?? 0;
    const balance = balanceOf(totalsOf(rows));
    const limit = Math.min(open, balance);
    if (amount > limit) {
      throw new RuleError(
        'waiver_above_balance',
        limit <= 0
          ? 'Nothing is owed on this charge; there is nothing to waive.'
          : `You can waive at most ${formatMoney(limit, currency)} here (what is still owed on this charge and the ticket).`,
      );
    }
    const now = deps.clock();
    const month = await ledgerMonthFor(now, timeZone, transaction);
    await Waiver.create(
      { chargeId: charge.id, amount, reason: input.reason, ledgerMonth: month, adjustment: month !== charge.ledgerMonth && (await isMonthClosed(charge.ledgerMonth, transaction)), createdBy: user.id, createdAt: now },
      { transaction },
    );
    if (charge.ticketId) await timeline(transaction, charge.ticketId, user.id, 'charge_waived', `${formatMoney(amount, currency)} of ${charge.description} waived: ${input.reason}`, now);
  });
  if (charge.ticketId) return getTicketLedger(deps, user, { tag: formatTag(charge.ticketId) });
  return getBookingLedger(deps, user, { bookingId: charge.bookingId! });
}

/**
 * Marks a payment received inside the caller's transaction (the ticket row already locked):
 * allocates it to open charges, gives it a receipt number, writes the timeline event and queues
 * the receipt mail. A payment already received is left alone, so a replayed event changes nothing.
 */
export async function recordPaymentReceived(
  deps: PaymentsDeps,
  transaction: Transaction,
  payment: Payment,
  details: { actorId: number | null; paymentIntentId?: string | null; providerChargeId?: string | null },
): Promise<boolean> {
  if (payment.status === 'succeeded') {
    // A later event may bring the provider's charge id the first one lacked; nothing else changes.
    if (details.providerChargeId && !payment.providerChargeId) {
      payment.providerChargeId = details.providerChargeId;
      await payment.save({ transaction });
    }
    return false;
  }
  const { currency, timeZone } = await clubMoney(deps.sequelize, transaction);
  const now = deps.clock();
  const ticket = payment.ticketId ? await Ticket.findByPk(payment.ticketId, { transaction }) : null;
  const rows = payment.ticketId ? await loadLedger({ ticketId: payment.ticketId }, transaction) : null;
  payment.status = 'succeeded';
  payment.paidAt = now;
  payment.ledgerMonth = await ledgerMonthFor(now, timeZone, transaction);
  payment.receiptNumber = `R-${String(payment.id).padStart(6, '0')}`;
  payment.failureMessage = null;
  if (details.paymentIntentId) payment.paymentIntentId = details.paymentIntentId;
  if (details.providerChargeId) payment.providerChargeId = details.providerChargeId;
  await payment.save({ transaction });
  if (rows) {
    const { allocations } = allocatePayment(payment.amount, openCharges(rows));
    if (allocations.length) await PaymentAllocation.bulkCreate(allocations.map((a) => ({ paymentId: payment.id, ...a })), { transaction });
  }
  if (ticket) {
    const how = METHOD_WORDS[payment.method];
    await timeline(transaction, ticket.id, details.actorId, 'payment_received', `${formatMoney(payment.amount, currency)} received ${how}${payment.reference ? ` (reference ${payment.reference})` : ''}; receipt ${payment.receiptNumber}.`, now);
    const mail = receiptMail({
      clubName: await readClubName(transaction),
      ownerName: ticket.ownerName,
      tag: formatTag(ticket.id),
      amount: formatMoney(payment.amount, currency),
      method: how,
      receiptNumber: payment.receiptNumber,
      paidAt: localDate(now, timeZone),
      link: `${deps.config.RW_PUBLIC_URL.replace(/\/$/, '')}/tickets/${formatTag(ticket.id)}`,
    });
    if (ticket.ownerEmail) await enqueueMail(transaction, { kind: 'payment_receipt', to: ticket.ownerEmail, ticketId: ticket.id, ...mail }, now);
  }
  return true;
}

export const METHOD_WORDS: Record<PaymentMethod, string> = { card: 'by card', cash: 'in cash', bank_transfer: 'by bank transfer' };

/** The treasurer records cash or a bank transfer, with a reference; never more than is owed. */
export async function recordOfflinePayment(
  deps: PaymentsDeps,
  user: SessionUser,
  input: { tag: string; method: 'cash' | 'bank_transfer'; amount: number; reference: string },
): Promise<LedgerDto> {
  if (!hasRole(user, 'treasurer')) throw new ForbiddenError('Only the treasurer records cash and bank payments.');
  const amount = amountOf('amount', input.amount, 1);
  const ticket = await visibleTicket(user, input.tag);
  const { currency } = await clubMoney(deps.sequelize);
  await deps.sequelize.transaction(async (transaction) => {
    await lockTicket(ticket.id, transaction);
    const balance = await ticketBalance(ticket.id, transaction);
    if (balance <= 0) throw new RuleError('nothing_to_pay', 'Nothing is owed on this ticket, so there is nothing to record.');
    if (amount > balance) throw new RuleError('payment_above_balance', `Only ${formatMoney(balance, currency)} is owed; record at most that.`);
    const now = deps.clock();
    const payment = await Payment.create(
      {
        ticketId: ticket.id,
        method: input.method,
        status: 'pending',
        amount,
        currency,
        reference: input.reference,
        idempotencyKey: null,
        checkoutSessionId: null,
        checkoutUrl: null,
        paymentIntentId: null,
        providerChargeId: null,
        failureMessage: null,
        receiptNumber: null,
        paidAt: null,
        ledgerMonth: null,
        recordedBy: user.id,
        createdAt: now,
      },
      { transaction },
    );
    await recordPaymentReceived(deps, transaction, payment, { actorId: user.id });
  });
  return getTicketLedger(deps, user, { tag: input.tag });
}

/** Refunds at the provider, behind an interface so tests and the service share one path. */
export interface ProviderRefunds {
  refund(payment: Payment, amount: number, idempotencyKey: string): Promise<string>;
}

/**
 * The treasurer refunds part or all of a payment. A card payment is refunded at the provider
 * first (idempotency key from the payment and what was refunded before, so a retried request
 * refunds once), then recorded; cash and bank refunds are recorded as paid back by hand.
 */
export async function refundPayment(
  deps: PaymentsDeps,
  user: SessionUser,
  input: { paymentId: number; amount: number; reason: string },
  provider: ProviderRefunds,
): Promise<LedgerDto> {
  if (!hasRole(user, 'treasurer')) throw new ForbiddenError('Only the treasurer refunds payments.');
  const amount = amountOf('amount', input.amount, 1);
  const payment = await Payment.findByPk(input.paymentId);
  if (!payment || payment.status !== 'succeeded') throw new NotFoundError('There is no received payment with that number.', 'payment_not_found');
  const { currency, timeZone } = await clubMoney(deps.sequelize);
  const refundedBefore = sumMinor((await Refund.findAll({ where: { paymentId: payment.id } })).map((r) => r.amount));
  if (amount > payment.amount - refundedBefore) {
    throw new RuleError('refund_above_payment', `At most ${formatMoney(payment.amount - refundedBefore, currency)} of this payment can still be refunded.`);
  }
  const providerRefundId = payment.method === 'card' ? await provider.refund(payment, amount, `rw-refund-${payment.id}-${refundedBefore}-${amount}`) : null;
  await deps.sequelize.transaction(async (transaction) => {
    if (payment.ticketId) await lockTicket(payment.ticketId, transaction);
    const already = providerRefundId ? await Refund.findOne({ where: { providerRefundId }, transaction }) : null;
    if (already) return; // the same provider refund recorded by a retried request
    const refunded = sumMinor((await Refund.findAll({ where: { paymentId: payment.id }, transaction })).map((r) => r.amount));
    if (amount > payment.amount - refunded) throw new RuleError('refund_above_payment', 'Someone refunded this payment a moment ago; reload to see what is left.');
    const now = deps.clock();
    const month = await ledgerMonthFor(now, timeZone, transaction);
    await Refund.create(
      {
        paymentId: payment.id,
        amount,
        reason: input.reason,
        providerRefundId,
        ledgerMonth: month,
        adjustment: !!payment.ledgerMonth && month !== payment.ledgerMonth && (await isMonthClosed(payment.ledgerMonth, transaction)),
        createdBy: user.id,
        createdAt: now,
      },
      { transaction },
    );
    if (payment.ticketId) {
      await timeline(transaction, payment.ticketId, user.id, 'payment_refunded', `${formatMoney(amount, currency)} of receipt ${payment.receiptNumber} refunded ${METHOD_WORDS[payment.method]}: ${input.reason}`, now);
    }
  });
  if (payment.ticketId) return getTicketLedger(deps, user, { tag: formatTag(payment.ticketId) });
  throw new NotFoundError('That payment belongs to no ticket.', 'payment_not_found');
}

// ---- bookings --------------------------------------------------------------------------------

async function visibleBooking(user: SessionUser, bookingId: number, transaction?: Transaction): Promise<Booking> {
  const booking = await Booking.findByPk(bookingId, { transaction });
  if (!booking || (!seesAllMoney(user) && booking.userId !== user.id)) throw new NotFoundError('There is no such booking that you can see.', 'booking_not_found');
  return booking;
}

export async function getBookingLedger(deps: PaymentsDeps, user: SessionUser, input: { bookingId: number }): Promise<LedgerDto> {
  const booking = await visibleBooking(user, input.bookingId);
  const { currency } = await clubMoney(deps.sequelize);
  return ledgerDto(await loadLedger({ bookingId: booking.id }), currency);
}

/** A bench-session fee (or any schedule item) on a booking; paid with the ticket it is linked to, or in cash. */
export async function addBookingCharge(deps: PaymentsDeps, user: SessionUser, input: { bookingId: number } & ChargeInput): Promise<LedgerDto> {
  if (!hasRole(user, 'technician', 'treasurer', 'admin')) throw new ForbiddenError('Only the bench and the treasurer add charges.');
  const booking = await visibleBooking(user, input.bookingId);
  const { timeZone } = await clubMoney(deps.sequelize);
  await deps.sequelize.transaction(async (transaction) => {
    await Booking.findByPk(booking.id, { transaction, lock: transaction.LOCK.UPDATE });
    const now = deps.clock();
    const isMember = await ownerIsMember(booking.userId, transaction);
    const priced = await priceCharge(input, isMember, localDate(now, timeZone), transaction);
    await Charge.create(
      { ticketId: null, bookingId: booking.id, ...priced, memberRate: isMember, ledgerMonth: await ledgerMonthFor(now, timeZone, transaction), createdBy: user.id, createdAt: now },
      { transaction },
    );
  });
  return getBookingLedger(deps, user, { bookingId: booking.id });
}

/** A payment's receipt as a PDF: for the ticket's owner, the treasurer and admins. */
export async function receiptPdfFor(deps: PaymentsDeps, user: SessionUser, input: { paymentId: number }): Promise<{ filename: string; bytes: Buffer }> {
  const payment = await Payment.findByPk(input.paymentId);
  const ticket = payment?.ticketId ? await Ticket.findByPk(payment.ticketId) : null;
  const allowed = !!ticket && (ticket.ownerUserId === user.id || hasRole(user, 'treasurer', 'admin'));
  if (!payment || !ticket || payment.status !== 'succeeded' || !allowed) throw new NotFoundError('There is no receipt with that number that you can see.', 'receipt_not_found');
  const { currency, timeZone } = await clubMoney(deps.sequelize);
  const allocations = await PaymentAllocation.findAll({ where: { paymentId: payment.id } });
  const charges = allocations.length ? await Charge.findAll({ where: { id: allocations.map((a) => a.chargeId) } }) : [];
  const refunded = sumMinor((await Refund.findAll({ where: { paymentId: payment.id } })).map((r) => r.amount));
  const bytes = await receiptPdf({
    clubName: await readClubName(),
    ownerName: ticket.ownerName,
    tag: formatTag(ticket.id),
    amount: formatMoney(payment.amount, currency),
    method: METHOD_WORDS[payment.method],
    receiptNumber: payment.receiptNumber!,
    paidAt: localDate(payment.paidAt!, timeZone),
    link: '',
    lines: allocations.map((a) => ({ description: charges.find((c) => c.id === a.chargeId)?.description ?? 'Charge', amount: formatMoney(a.amount, currency) })),
    refunded: refunded ? formatMoney(refunded, currency) : null,
  });
  return { filename: `receipt-${payment.receiptNumber}.pdf`, bytes };
}
