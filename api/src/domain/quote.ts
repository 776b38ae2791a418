// Quote arithmetic in integer minor units of the club's currency (pence, cents; no floats).
// A line is quantity × unit price. Quantities may have up to two decimals (1.5 hours of labour),
// so they are carried as whole hundredths: line total = quantityHundredths × unitPriceMinor / 100,
// rounded half up to a whole minor unit (the usual commercial rounding of a line amount; common
// practice, no published source). The quote's total is the sum of its line totals.
// Minor-unit digits per currency: ISO 4217 (e.g. GBP 2, EUR 2, JPY 0, KWD 3), read through the
// runtime's Intl data (CLDR), which follows ISO 4217 for these currencies.
import { CalcInputError } from './input-error';

/** Largest quantity on one line (1000.00). */
export const MAX_QUANTITY_HUNDREDTHS = 100_000;
/** Largest unit price (10 000 000 minor units: 100 000.00 in a two-digit currency). */
export const MAX_UNIT_PRICE_MINOR = 10_000_000;
export const MAX_QUOTE_LINES = 30;

export interface QuoteLineAmounts {
  quantityHundredths: number;
  unitPriceMinor: number;
}

/** A quantity typed as a decimal (e.g. 1.5) in whole hundredths (150); throws when it has more than two decimals. */
export function quantityToHundredths(quantity: number): number {
  if (!Number.isFinite(quantity) || quantity <= 0) throw new CalcInputError('quantity', 'Give a quantity above zero.');
  const hundredths = Math.round(quantity * 100);
  if (Math.abs(quantity * 100 - hundredths) > 1e-6) throw new CalcInputError('quantity', 'Give the quantity with at most two decimals, e.g. 1.5.');
  if (hundredths > MAX_QUANTITY_HUNDREDTHS) throw new CalcInputError('quantity', 'Give a quantity up to 1000.');
  return hundredths;
}

/** quantityHundredths × unitPriceMinor / 100, rounded half up, in whole minor units. */
export function lineTotalMinor(line: QuoteLineAmounts): number {
  const { quantityHundredths: q, unitPriceMinor: p } = line;
  if (!Number.isSafeInteger(q) || q <= 0 || q > MAX_QUANTITY_HUNDREDTHS) throw new CalcInputError('quantity', 'Give a quantity above zero, up to 1000.');
  if (!Number.isSafeInteger(p) || p < 0 || p > MAX_UNIT_PRICE_MINOR) {
    throw new CalcInputError('unitPriceMinor', `Give the unit price in whole minor units from 0 to ${MAX_UNIT_PRICE_MINOR}.`);
  }
  // q × p ≤ 1e5 × 1e7 = 1e12, well inside the exact integers of a double (2^53 ≈ 9e15).
  const product = q * p;
  return Math.floor((product + 50) / 100);
}

/** The quote's total: the sum of its line totals, in minor units. */
export function quoteTotalMinor(lines: readonly QuoteLineAmounts[]): number {
  return lines.reduce((sum, line) => sum + lineTotalMinor(line), 0);
}

/** Whether a quote of this total needs the owner's approval: only strictly above the club's threshold. */
export function needsOwnerApproval(totalMinor: number, thresholdMinor: number): boolean {
  return totalMinor > thresholdMinor;
}

/** Digits of the minor unit of an ISO 4217 currency (GBP 2, JPY 0, KWD 3). */
export function currencyMinorDigits(code: string): number {
  return new Intl.NumberFormat('en', { style: 'currency', currency: code }).resolvedOptions().maximumFractionDigits ?? 2;
}

/** Whether the code is a currency the runtime knows (three letters, upper case). */
export function isCurrencyCode(code: string): boolean {
  if (!/^[A-Z]{3}$/.test(code)) return false;
  try {
    return Intl.supportedValuesOf('currency').includes(code);
  } catch {
    return false;
  }
}

/** The amount as a plain decimal string, exactly: 7250 GBP → "72.50", 1500 JPY → "1500". */
export function minorToDecimal(minor: number, code: string): string {
  const digits = currencyMinorDigits(code);
  const sign = minor < 0 ? '-' : '';
  const abs = Math.abs(minor);
  if (digits === 0) return `${sign}${abs}`;
  const s = String(abs).padStart(digits + 1, '0');
  return `${sign}${s.slice(0, -digits)}.${s.slice(-digits)}`;
}

/** Money for people: "£72.50", "¥1,500". Formatted from the exact decimal string (Intl accepts strings), never via a float. */
export function formatMoney(minor: number, code: string, locale = 'en-GB'): string {
  const format = new Intl.NumberFormat(locale, { style: 'currency', currency: code }) as Intl.NumberFormat & {
    format(value: number | bigint | string): string;
  };
  return format.format(minorToDecimal(minor, code) as unknown as number);
}

/** A price typed in major units ("72.5", "72,50") in minor units; null when it is not a price in this currency. */
export function decimalToMinor(text: string, code: string): number | null {
  const digits = currencyMinorDigits(code);
  const t = text.trim().replace(',', '.');
  const re = digits === 0 ? /^(\d{1,9})$/ : new RegExp(`^(\\d{1,9})(?:\\.(\\d{1,${digits}}))?$`);
  const m = re.exec(t);
  if (!m) return null;
  const major = Number(m[1]);
  const frac = (m[2] ?? '').padEnd(digits, '0');
  return major * 10 ** digits + (digits ? Number(frac) : 0);
}
