// The treasurer's month: every payment matched to the charges it paid, every payout of the
// provider matched to the payments (and refunds) in it with the provider's fees, what does not
// match, totals by fee item and by method, income per day, the CSV for the club's accounts, and
// closing the month (its records are then final; later corrections land in the next month).
//
// Payout matching follows the provider's documented model: a payout's balance transactions
// (GET /v1/balance_transactions?payout=po_...) each carry amount, fee and net = amount − fee, and
// the payout's amount is the sum of their nets (docs.stripe.com/api/balance_transactions/object,
// docs.stripe.com/payouts/reconciliation).
import { DateTime } from 'luxon';
import Stripe from 'stripe';
import { ConflictError, ForbiddenError, RuleError } from '../../errors';
import { majorUnits, sumMinor } from '../../domain/money';
import type { PaymentMethod, ReconciliationDto, ReconPayoutRow, ReconProblem } from '../../contracts/payments';
import { PAYMENT_METHODS } from '../../contracts/payments';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';
import { formatTag } from '../tickets/tag';
import { User } from '../users/user.model';
import { Charge, FeeItem, MonthClose, Payment, PaymentAllocation, Refund, Waiver } from './payments.model';
import { clubMoney, localDate, type PaymentsDeps } from './ledger.service';
import { providerClient } from './checkout.service';

function requireTreasurer(user: SessionUser) {
  if (!hasRole(user, 'treasurer')) throw new ForbiddenError('Only the treasurer reconciles the month.');
}

const iso = (d: Date) => d.toISOString();

/** The provider's payouts that arrived in the month, each with its balance transactions. */
async function providerPayouts(deps: PaymentsDeps, fromSec: number, toSec: number) {
  const stripe = providerClient(deps.config);
  const out: { payout: Stripe.Payout; txns: Stripe.BalanceTransaction[] }[] = [];
  for await (const payout of stripe.payouts.list({ arrival_date: { gte: fromSec, lt: toSec }, limit: 100 })) {
    const txns: Stripe.BalanceTransaction[] = [];
    for await (const t of stripe.balanceTransactions.list({ payout: payout.id, limit: 100 })) txns.push(t);
    out.push({ payout, txns });
  }
  return out;
}

export async function reconcileMonth(deps: PaymentsDeps, user: SessionUser, input: { month: string }): Promise<ReconciliationDto> {
  requireTreasurer(user);
  const { month } = input;
  const { currency, timeZone } = await clubMoney(deps.sequelize);
  const start = DateTime.fromISO(`${month}-01`, { zone: timeZone });
  const end = start.plus({ months: 1 });

  const [payments, refunds, charges, waivers, items, close] = await Promise.all([
    Payment.findAll({ where: { ledgerMonth: month, status: 'succeeded' }, order: [['paidAt', 'ASC'], ['id', 'ASC']] }),
    Refund.findAll({ where: { ledgerMonth: month }, order: [['id', 'ASC']] }),
    Charge.findAll({ where: { ledgerMonth: month } }),
    Waiver.findAll({ where: { ledgerMonth: month }, include: [{ association: 'charge', attributes: ['feeItemId', 'description'] }] }),
    FeeItem.findAll(),
    MonthClose.findByPk(month),
  ]);
  const allocations = payments.length ? await PaymentAllocation.findAll({ where: { paymentId: payments.map((p) => p.id) } }) : [];
  // Refunds of this month may belong to payments of earlier months; every refund of this month's payments counts too.
  const allRefundsOfPayments = payments.length ? await Refund.findAll({ where: { paymentId: payments.map((p) => p.id) } }) : [];

  let providerError: string | null = null;
  let fetched: Awaited<ReturnType<typeof providerPayouts>> = [];
  try {
    fetched = await providerPayouts(deps, Math.floor(start.toSeconds()), Math.floor(end.toSeconds()));
  } catch (err) {
    providerError = `The payment service could not be asked for payouts (${(err as Error).message.slice(0, 120)}). Card payments are listed; payouts are not.`;
  }

  // Provider records (charges and refunds) that any payout holds, to find them from either side.
  const byCharge = new Map((await Payment.findAll({ where: { method: 'card', status: 'succeeded' } })).filter((p) => p.providerChargeId).map((p) => [p.providerChargeId!, p]));
  const byRefund = new Map((await Refund.findAll()).filter((r) => r.providerRefundId).map((r) => [r.providerRefundId!, r]));
  const paidOutIn = new Map<number, string>();
  const problems: ReconProblem[] = [];

  const payouts: ReconPayoutRow[] = fetched.map(({ payout, txns }) => {
    const itemsOut = txns
      .filter((t) => t.type !== 'payout')
      .map((t) => {
        const source = typeof t.source === 'string' ? t.source : (t.source?.id ?? '');
        const payment = t.type === 'charge' || t.type === 'payment' ? byCharge.get(source) : undefined;
        const refund = t.type === 'refund' ? byRefund.get(source) : undefined;
        const matched = payment ? payment.amount === t.amount : refund ? refund.amount === -t.amount : false;
        if (payment) paidOutIn.set(payment.id, payout.id);
        if (!payment && !refund) {
          problems.push(
            t.type === 'refund'
              ? { kind: 'refund_not_reflected', message: `A refund of ${majorUnits(-t.amount, currency)} at the payment service (${source}) is not recorded here.`, payoutId: payout.id, source, amount: t.amount }
              : { kind: 'provider_payment_unknown', message: `A payment of ${majorUnits(t.amount, currency)} at the payment service (${source}) has no payment here.`, payoutId: payout.id, source, amount: t.amount },
          );
        }
        return { balanceTransactionId: t.id, type: t.type, source, amount: t.amount, fee: t.fee, net: t.net, paymentId: payment?.id ?? null, refundId: refund?.id ?? null, matched };
      });
    const itemsNet = sumMinor(itemsOut.map((i) => i.net));
    const addsUp = itemsNet === payout.amount && itemsOut.every((i) => i.matched);
    if (itemsNet !== payout.amount) {
      problems.push({ kind: 'payout_does_not_add_up', message: `Payout ${payout.id} is ${majorUnits(payout.amount, currency)} but its items add up to ${majorUnits(itemsNet, currency)}.`, payoutId: payout.id, amount: payout.amount });
    }
    return {
      payoutId: payout.id,
      arrivalDate: localDate(new Date(payout.arrival_date * 1000), timeZone),
      amount: payout.amount,
      gross: sumMinor(itemsOut.map((i) => i.amount)),
      fees: sumMinor(itemsOut.map((i) => i.fee)),
      itemsNet,
      addsUp,
      items: itemsOut,
    };
  });

  const paymentRows = payments.map((p) => {
    const allocated = sumMinor(allocations.filter((a) => a.paymentId === p.id).map((a) => a.amount));
    const refunded = sumMinor(allRefundsOfPayments.filter((r) => r.paymentId === p.id).map((r) => r.amount));
    const matched = allocated === p.amount;
    if (!matched) {
      problems.push({ kind: 'payment_without_charge', message: `Receipt ${p.receiptNumber}: ${majorUnits(p.amount - allocated, currency)} of it pays no charge.`, paymentId: p.id, amount: p.amount - allocated });
    }
    if (p.method === 'card' && !paidOutIn.has(p.id) && !providerError) {
      problems.push({ kind: 'card_payment_not_paid_out', message: `Receipt ${p.receiptNumber} (card) is in no payout of this month yet; payouts arrive daily, so a payment of the last days may be in next month's.`, paymentId: p.id, amount: p.amount });
    }
    return {
      paymentId: p.id,
      ticketTag: p.ticketId ? formatTag(p.ticketId) : null,
      method: p.method,
      amount: p.amount,
      paidAt: iso(p.paidAt!),
      receiptNumber: p.receiptNumber,
      reference: p.reference,
      allocated,
      refunded,
      matched,
      payoutId: paidOutIn.get(p.id) ?? null,
      adjustment: false,
    };
  });

  const refundPayments = refunds.length ? await Payment.findAll({ where: { id: [...new Set(refunds.map((r) => r.paymentId))] } }) : [];
  for (const r of refunds) {
    const p = refundPayments.find((x) => x.id === r.paymentId);
    if (p?.method === 'card' && !r.providerRefundId) {
      problems.push({ kind: 'refund_not_reflected', message: `Refund ${r.id} of receipt ${p.receiptNumber} was recorded here but not made at the payment service.`, paymentId: p.id, amount: r.amount });
    }
  }

  const itemName = new Map(items.map((i) => [i.id, i.name]));
  const feeTotals = new Map<string, { feeItemId: number | null; name: string; charged: number; waived: number }>();
  const feeKey = (id: number | null) => (id === null ? 'parts' : String(id));
  for (const c of charges) {
    const k = feeKey(c.feeItemId);
    const row = feeTotals.get(k) ?? { feeItemId: c.feeItemId, name: c.feeItemId ? (itemName.get(c.feeItemId) ?? c.description) : 'Parts at cost', charged: 0, waived: 0 };
    row.charged += c.amount;
    feeTotals.set(k, row);
  }
  for (const w of waivers) {
    const charge = (w as unknown as { charge?: Charge }).charge;
    const id = charge?.feeItemId ?? null;
    const k = feeKey(id);
    const row = feeTotals.get(k) ?? { feeItemId: id, name: id ? (itemName.get(id) ?? '') : 'Parts at cost', charged: 0, waived: 0 };
    row.waived += w.amount;
    feeTotals.set(k, row);
  }

  const methodOfPayment = new Map([...payments, ...refundPayments].map((p) => [p.id, p.method]));
  const totalsByMethod = PAYMENT_METHODS.map((method) => {
    const received = sumMinor(payments.filter((p) => p.method === method).map((p) => p.amount));
    const refunded = sumMinor(refunds.filter((r) => methodOfPayment.get(r.paymentId) === method).map((r) => r.amount));
    return { method, received, refunded, net: received - refunded };
  });

  const days: ReconciliationDto['daily'] = [];
  for (let d = start; d < end; d = d.plus({ days: 1 })) days.push({ date: d.toISODate()!, card: 0, cash: 0, bank_transfer: 0 });
  const dayOf = (at: Date) => days.find((x) => x.date === localDate(at, timeZone));
  for (const p of payments) {
    const day = dayOf(p.paidAt!);
    if (day) day[p.method] += p.amount;
  }
  for (const r of refunds) {
    const day = dayOf(r.createdAt);
    const method = methodOfPayment.get(r.paymentId) as PaymentMethod | undefined;
    if (day && method) day[method] -= r.amount;
  }

  const received = sumMinor(payments.map((p) => p.amount));
  const refunded = sumMinor(refunds.map((r) => r.amount));
  const fees = sumMinor(payouts.map((p) => p.fees));
  let closed: ReconciliationDto['closed'] = null;
  if (close) {
    const by = close.closedBy ? await User.findByPk(close.closedBy, { attributes: ['displayName'] }) : null;
    closed = { at: iso(close.closedAt), byName: by?.displayName ?? null };
  }
  return {
    month,
    currency,
    closed,
    payments: paymentRows,
    refunds: refunds.map((r) => ({ refundId: r.id, paymentId: r.paymentId, amount: r.amount, at: iso(r.createdAt), reason: r.reason, providerRefundId: r.providerRefundId, adjustment: r.adjustment })),
    payouts,
    problems,
    totalsByFeeItem: [...feeTotals.values()].sort((a, b) => a.name.localeCompare(b.name)),
    totalsByMethod,
    daily: days,
    totals: { received, refunded, fees, paidOut: sumMinor(payouts.map((p) => p.amount)), net: received - refunded - fees },
    providerError,
  };
}

/**
 * One CSV cell: quoted when it holds a comma, quote or line break (RFC 4180 §2), and text that a
 * spreadsheet would run as a formula (= + - @, tab, CR at the start) prefixed with ' (OWASP "CSV
 * Injection"). Numbers are written as they are.
 */
export function csvCell(value: string | number | null): string {
  if (value === null) return '';
  if (typeof value === 'number') return String(value);
  let s = value;
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The month as CSV for the club's accounts: one line per payment, refund and payout, amounts in major units. */
export async function monthCsv(deps: PaymentsDeps, user: SessionUser, input: { month: string }): Promise<string> {
  const r = await reconcileMonth(deps, user, input);
  const money = (n: number) => majorUnits(n, r.currency);
  const lines = [['record', 'date', 'ticket', 'receipt', 'method', 'reference', 'amount', 'fee', 'net', 'payout', 'matched', 'note'].join(',')];
  const fee = new Map<number, number>();
  for (const p of r.payouts) for (const i of p.items) if (i.paymentId) fee.set(i.paymentId, i.fee);
  for (const p of r.payments) {
    const f = fee.get(p.paymentId) ?? 0;
    lines.push([csvCell('payment'), csvCell(p.paidAt.slice(0, 10)), csvCell(p.ticketTag), csvCell(p.receiptNumber), csvCell(p.method), csvCell(p.reference), money(p.amount), money(f), money(p.amount - f), csvCell(p.payoutId), csvCell(p.matched ? 'yes' : 'no'), ''].join(','));
  }
  for (const x of r.refunds) {
    lines.push([csvCell('refund'), csvCell(x.at.slice(0, 10)), '', '', '', csvCell(x.providerRefundId), money(-x.amount), money(0), money(-x.amount), '', csvCell(x.adjustment ? 'adjustment' : 'yes'), csvCell(x.reason)].join(','));
  }
  for (const p of r.payouts) {
    lines.push([csvCell('payout'), csvCell(p.arrivalDate), '', '', csvCell('card'), csvCell(p.payoutId), money(p.gross), money(p.fees), money(p.amount), csvCell(p.payoutId), csvCell(p.addsUp ? 'yes' : 'no'), ''].join(','));
  }
  for (const x of r.problems) lines.push([csvCell('unmatched'), '', '', '', '', csvCell(x.source ?? x.payoutId ?? null), x.amount !== undefined ? money(x.amount) : '', '', '', '', csvCell('no'), csvCell(x.message)].join(','));
  return `${lines.join('\r\n')}\r\n`;
}

/** Closes a month that is over: its totals are kept, and records made later land in the next month. */
export async function closeMonth(deps: PaymentsDeps, user: SessionUser, input: { month: string }): Promise<ReconciliationDto> {
  requireTreasurer(user);
  const { timeZone } = await clubMoney(deps.sequelize);
  const current = localDate(deps.clock(), timeZone).slice(0, 7);
  if (input.month >= current) throw new RuleError('month_not_over', `${input.month} is not over yet; close it from the first day of the next month.`);
  if (await MonthClose.findByPk(input.month)) throw new ConflictError('month_closed', `${input.month} is already closed. Corrections go into the current month as adjustments.`);
  const r = await reconcileMonth(deps, user, input);
  try {
    await MonthClose.create({ month: input.month, closedBy: user.id, closedAt: deps.clock(), summary: { totals: r.totals, totalsByMethod: r.totalsByMethod, problems: r.problems.length } });
  } catch (err) {
    if ((err as Error).name === 'SequelizeUniqueConstraintError') throw new ConflictError('month_closed', `${input.month} is already closed.`);
    throw err;
  }
  return reconcileMonth(deps, user, input);
}
