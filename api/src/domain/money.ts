// Money in integer minor units of the club's currency (pence for GBP, cents for EUR): never a
// float. Amounts are whole numbers; a balance is charges − waivers − payments + refunds. Plain
// TypeScript, shared by the API, the client and the tests.
//
// Minor units per currency: ISO 4217 (the "minor unit" column), read through Intl.NumberFormat's
// maximumFractionDigits, which follows the same table (ECMA-402 §15, CurrencyDigits).
// The payment provider takes amounts the same way: "A positive integer representing how much to
// charge in the smallest currency unit" (docs.stripe.com/api/payment_intents/object, `amount`;
// docs.stripe.com/currencies, "Zero-decimal currencies").
import { CalcInputError } from './input-error';

/** Largest amount the API accepts in one record: 10,000,000 minor units (100,000.00 in a two-decimal currency). */
export const MAX_AMOUNT = 10_000_000;

/** Throws unless `amount` is a whole number of minor units from `min` (0 by default) to MAX_AMOUNT. */
export function requireMinorUnits(field: string, amount: unknown, min = 0): number {
  if (typeof amount !== 'number' || !Number.isFinite(amount)) throw new CalcInputError(field, 'Enter an amount in whole minor units (pence), like 1250.');
  if (!Number.isInteger(amount)) throw new CalcInputError(field, 'Amounts are whole minor units (pence): no fractions.');
  if (amount < min) throw new CalcInputError(field, min > 0 ? `Must be at least ${min}.` : 'Must not be negative.');
  if (amount > MAX_AMOUNT) throw new CalcInputError(field, `Must be at most ${MAX_AMOUNT}.`);
  return amount;
}

/** Digits after the decimal point of the currency (ISO 4217 minor unit): GBP 2, JPY 0, BHD 3. */
export function minorUnitDigits(currency: string): number {
  return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

/** "£12.50" for 1250 GBP; exact (integer arithmetic, the float only touches the formatter's input). */
export function formatMoney(minor: number, currency: string, locale = 'en-GB'): string {
  const digits = minorUnitDigits(currency);
  const sign = minor < 0 ? '-' : '';
  const abs = Math.abs(minor);
  const scale = 10 ** digits;
  const whole = Math.floor(abs / scale);
  const fraction = abs % scale;
  const fmt = new Intl.NumberFormat(locale, { style: 'currency', currency, minimumFractionDigits: digits, maximumFractionDigits: digits });
  // Format the whole part with the currency sign, then put the exact fraction in place.
  const parts = fmt.formatToParts(whole);
  const out = parts
    .map((p) => (p.type === 'fraction' ? String(fraction).padStart(digits, '0') : p.value))
    .join('');
  return sign + out;
}

/** "12.50" in major units, as a plain number string for CSV (no currency sign, no grouping). */
export function majorUnits(minor: number, currency: string): string {
  const digits = minorUnitDigits(currency);
  const sign = minor < 0 ? '-' : '';
  const abs = Math.abs(minor);
  if (digits === 0) return sign + String(abs);
  const scale = 10 ** digits;
  return `${sign}${Math.floor(abs / scale)}.${String(abs % scale).padStart(digits, '0')}`;
}

/**
 * Reads "12.5", "12.50" or "12" (major units, as a person types them) into minor units without a
 * float: 1250. Null when it is not such a number or has more decimals than the currency.
 */
export function parseMajorUnits(text: string, currency: string): number | null {
  const digits = minorUnitDigits(currency);
  const m = /^\s*(\d{1,9})(?:[.,](\d*))?\s*$/.exec(text);
  if (!m) return null;
  const fraction = m[2] ?? '';
  if (fraction.length > digits) return null;
  return Number(m[1]) * 10 ** digits + (fraction ? Number(fraction.padEnd(digits, '0')) : 0);
}

/** One price of a fee item: member and non-member rates, in force from a local date (YYYY-MM-DD). */
export interface FeePrice {
  effectiveFrom: string;
  memberPrice: number;
  nonMemberPrice: number;
}

/**
 * The price in force on `date` (YYYY-MM-DD, the club's local date): the latest price whose
 * effective-from date is on or before it. Null before the first price.
 */
export function priceOn(prices: readonly FeePrice[], date: string): FeePrice | null {
  let best: FeePrice | null = null;
  for (const p of prices) {
    if (p.effectiveFrom <= date && (!best || p.effectiveFrom > best.effectiveFrom)) best = p;
  }
  return best;
}

/** The rate a charge copies: members pay the member price, anyone else the non-member price. */
export function rateFor(price: FeePrice, isMember: boolean): number {
  return isMember ? price.memberPrice : price.nonMemberPrice;
}

/** A charge line: unit amount × quantity, refused when the product leaves the safe range. */
export function lineAmount(unitAmount: number, quantity: number): number {
  requireMinorUnits('unitAmount', unitAmount);
  if (!Number.isInteger(quantity) || quantity < 1 || quantity > 1000) throw new CalcInputError('quantity', 'Use a whole number from 1 to 1000.');
  return requireMinorUnits('amount', unitAmount * quantity);
}

export interface LedgerTotals {
  charges: number;
  waivers: number;
  payments: number;
  refunds: number;
}

/** What is still owed: charges − waivers − payments + refunds (negative: paid too much). */
export function balanceOf(t: LedgerTotals): number {
  return t.charges - t.waivers - t.payments + t.refunds;
}

/** Sum of whole minor-unit amounts, refusing anything that is not an integer. */
export function sumMinor(amounts: readonly number[]): number {
  let total = 0;
  for (const a of amounts) {
    if (!Number.isInteger(a)) throw new CalcInputError('amount', 'Amounts are whole minor units.');
    total += a;
  }
  return total;
}

/** One charge's open amount, for allocating a payment. */
export interface OpenCharge {
  chargeId: number;
  open: number;
}

/**
 * Spreads a payment over open charges, oldest first, never more than each one's open amount.
 * What is left over (a payment above the balance) is returned as `unallocated`.
 */
export function allocatePayment(amount: number, charges: readonly OpenCharge[]): { allocations: { chargeId: number; amount: number }[]; unallocated: number } {
  let left = requireMinorUnits('amount', amount);
  const allocations: { chargeId: number; amount: number }[] = [];
  for (const c of charges) {
    if (left === 0) break;
    if (c.open <= 0) continue;
    const take = Math.min(left, c.open);
    allocations.push({ chargeId: c.chargeId, amount: take });
    left -= take;
  }
  return { allocations, unallocated: left };
}

/**
 * The provider's processing fee on one card payment: a percentage in basis points plus a fixed
 * amount, the percentage rounded half up to the minor unit. The UK standard card rate of 1.5% +
 * 20p (stripe.com/gb/pricing, from memory of the published page) is the default of the local fake.
 */
export function processingFee(amount: number, percentBasisPoints: number, fixed: number): number {
  requireMinorUnits('amount', amount);
  // Half up without floats: (a × bp + 5000) ÷ 10000, whole-number division.
  return Math.floor((amount * percentBasisPoints + 5000) / 10000) + fixed;
}

/** 'YYYY-MM' of a local date 'YYYY-MM-DD'. */
export function monthOf(localDate: string): string {
  return localDate.slice(0, 7);
}

/** The month after 'YYYY-MM'. */
export function nextMonth(month: string): string {
  const [y, m] = month.split('-').map(Number) as [number, number];
  return m === 12 ? `${y + 1}-01` : `${y}-${String(m + 1).padStart(2, '0')}`;
}
