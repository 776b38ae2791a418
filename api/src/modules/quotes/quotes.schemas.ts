// Input of the quote routes, parsed at the edge.
import { z } from 'zod';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';
import { MAX_QUANTITY_HUNDREDTHS, MAX_QUOTE_LINES, MAX_UNIT_PRICE_MINOR } from '../../domain/quote';

const quantity = z
  .number('Enter the quantity as a number, e.g. 1.5.')
  .positive('Give a quantity above zero.')
  .max(MAX_QUANTITY_HUNDREDTHS / 100, 'Give a quantity up to 1000.')
  .refine((q) => Math.abs(q * 100 - Math.round(q * 100)) < 1e-6, 'Give the quantity with at most two decimals, e.g. 1.5.');

export const quoteLineSchema = z.object({
  description: z.string().trim().min(2, 'Say what the line is for.').max(200, 'Keep it to 200 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE),
  quantity,
  unitPriceMinor: z
    .number('Enter the unit price in whole minor units, e.g. 1250 for 12.50.')
    .int('Give the unit price in whole minor units, e.g. 1250 for 12.50.')
    .min(0, 'A price cannot be below zero.')
    .max(MAX_UNIT_PRICE_MINOR, `Give a unit price up to ${MAX_UNIT_PRICE_MINOR} minor units.`),
});

export const writeQuoteSchema = z.object({
  lines: z.array(quoteLineSchema, 'Send the quote lines.').min(1, 'A quote needs at least one line.').max(MAX_QUOTE_LINES, `Keep a quote to ${MAX_QUOTE_LINES} lines.`),
  note: z.string().trim().max(500, 'Keep the note to 500 characters.').optional().transform((v) => v || null),
});
export type WriteQuoteInput = z.infer<typeof writeQuoteSchema>;

export const quoteSettingsSchema = z
  .object({
    currency: z
      .string()
      .regex(/^[A-Z]{3}$/, 'Use the three-letter ISO 4217 code, e.g. GBP or EUR.')
      .refine((c) => {
        try {
          return Intl.supportedValuesOf('currency').includes(c);
        } catch {
          return false;
        }
      }, 'That is not a currency code this server knows (ISO 4217), e.g. GBP or EUR.')
      .optional(),
    approvalThresholdMinor: z
      .number('Enter the threshold in whole minor units, e.g. 5000 for 50.00.')
      .int('Enter the threshold in whole minor units, e.g. 5000 for 50.00.')
      .min(0, 'The threshold cannot be below zero.')
      .max(100_000_000, 'Give a threshold up to 100000000 minor units.')
      .optional(),
  })
  .strict()
  .refine((v) => v.currency !== undefined || v.approvalThresholdMinor !== undefined, 'Send the currency, the threshold, or both.');
