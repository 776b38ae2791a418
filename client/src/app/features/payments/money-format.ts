import { formatMoney, parseMajorUnits } from '@domain/money';
import type { PaymentMethod } from '@contracts/payments';

export { formatMoney, parseMajorUnits };

export const METHOD_LABELS: Record<PaymentMethod, string> = { card: 'Card', cash: 'Cash', bank_transfer: 'Bank transfer' };

/** A validator-friendly check: the text is an amount in major units with at most the currency's decimals. */
export function amountError(text: string, currency: string, { min = 1 } = {}): string | null {
  const minor = parseMajorUnits(text, currency);
  if (minor === null) return 'Enter an amount like 12.50 (no more decimals than the currency has).';
  if (minor < min) return 'Enter an amount above nothing.';
  return null;
}
