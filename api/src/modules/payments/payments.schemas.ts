// Input schemas of the fee, charge, payment and reconciliation routes (zod 4). Bodies are strict,
// amounts are whole minor units (an integer from 0 or 1 up to 10,000,000): a negative or
// fractional amount is a 400 naming the field, and nothing is stored.
import { z } from 'zod';
import { FEE_UNITS } from '../../contracts/payments';
import { MAX_AMOUNT } from '../../domain/money';
import { idSchema, SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';

const AMOUNT_MESSAGE = `Enter a whole number of minor units (pence), like 1250 for 12.50, up to ${MAX_AMOUNT}.`;
const minor = (min: number) =>
  z
    .number(AMOUNT_MESSAGE)
    .int('Amounts are whole minor units (pence): no fractions.')
    .min(min, min > 0 ? 'Must be more than nothing.' : 'Must not be negative.')
    .max(MAX_AMOUNT, AMOUNT_MESSAGE);

const line = (max: number, what: string) =>
  z.string().trim().min(1, `Give ${what}.`).max(max, `Keep ${what} to ${max} characters.`).regex(SINGLE_LINE, SINGLE_LINE_MESSAGE);

const localDate = z
  .string()
  .regex(/^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/, 'Use a date like 2026-04-01.')
  .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d), 'That date does not exist.');

const prices = {
  memberPrice: minor(0),
  nonMemberPrice: minor(0),
  effectiveFrom: localDate,
};

export const createFeeSchema = z.strictObject({
  code: z.string().trim().regex(/^[a-z][a-z0-9_]{1,39}$/, 'A code is 2 to 40 lower-case letters, digits or _, starting with a letter.'),
  name: line(100, 'a name'),
  unit: z.enum(FEE_UNITS, 'Choose each or hour.'),
  ...prices,
});
export const feePriceSchema = z.strictObject(prices);
export const feePathParams = z.object({ feeId: idSchema });

export const chargeSchema = z.union([
  z.strictObject({ feeItemId: z.number('Choose an item of the fee schedule.').int().min(1), quantity: z.number('Enter a quantity.').int('Use a whole number.').min(1, 'At least 1.').max(1000, 'At most 1000.') }),
  z.strictObject({ description: line(200, 'what the part is'), amount: minor(1) }),
], 'Send either a fee item and quantity, or a part with its description and cost.');

export const waiverSchema = z.strictObject({ amount: minor(1), reason: line(500, 'the reason') });
export const refundSchema = z.strictObject({ amount: minor(1), reason: line(500, 'the reason') });
export const offlinePaymentSchema = z.strictObject({
  method: z.enum(['cash', 'bank_transfer'], 'Choose cash or bank transfer.'),
  amount: minor(1),
  reference: line(100, 'a reference (receipt book number or bank reference)'),
});
export const checkoutSchema = z.strictObject({});

export const chargePathParams = z.object({ chargeId: idSchema });
export const paymentPathParams = z.object({ paymentId: idSchema });
export const bookingPathParams = z.object({ bookingId: idSchema });
export const monthPathParams = z.object({ month: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'Use a month like 2026-04.') });
