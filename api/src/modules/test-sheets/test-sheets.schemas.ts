// Input schemas for test sheets and the club's test limits (zod 4). Bodies are strict: the verdict,
// the number, the limits used and who saved it are the server's.
import { z } from 'zod';
import { MAX_BANDS, TEST_LIMIT_DEFINITIONS, TEST_LIMIT_KEYS, type TestLimitKey } from '../../domain/test-sheet';
import { boundMessage, withinBound } from '../../domain/input-error';
import { idSchema, queryInt, SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';

const number = (what: string) => z.number(`Give the ${what} as a number.`).finite(`Give the ${what} as a number.`);
const optionalText = (max: number) =>
  z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? null : v), z.string().trim().max(max, `Keep it to ${max} characters.`).nullable().optional());

const bandSchema = z.strictObject({
  band: z.string('Name the band (e.g. 20 m).').trim().min(1, 'Name the band (e.g. 20 m).').max(20, 'Keep the band name to 20 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE),
  ratedW: number('rated power in watts').positive('The rated power is more than 0 W.'),
  forwardW: number('forward power in watts').positive('Forward power is more than 0 W: key the transmitter into the dummy load.'),
  reflectedW: number('reflected power in watts').min(0, 'Reflected power cannot be negative: check the meter.'),
  nominalHz: number('dialled frequency in Hz').positive('The dialled frequency is more than 0 Hz.').nullable().optional(),
  measuredHz: number('measured frequency in Hz').positive('The measured frequency is more than 0 Hz.').nullable().optional(),
});

export const testSheetSchema = z.strictObject({
  supplyVoltageV: number('supply voltage in volts').positive('The supply voltage at the radio is more than 0 V.'),
  receiveCurrentA: number('receive current in amperes').min(0, 'The receive current cannot be negative.'),
  bands: z.array(bandSchema, 'Send the bands tested as a list.').min(1, 'Test at least one band.').max(MAX_BANDS, `Test at most ${MAX_BANDS} bands on one sheet.`),
  reference: optionalText(200).refine((v) => v == null || SINGLE_LINE.test(v), SINGLE_LINE_MESSAGE),
  notes: optionalText(2000),
});
export type TestSheetBody = z.infer<typeof testSheetSchema>;

export const testSheetListSchema = z.strictObject({
  page: queryInt(1, 100_000, 1),
  pageSize: queryInt(1, 50, 5),
  dir: z.enum(['asc', 'desc'], 'dir is asc or desc.').default('desc'),
});
export type TestSheetListQuery = z.infer<typeof testSheetListSchema>;

export const sheetPathParams = z.object({ sheetId: idSchema });

const limitSchema = (key: TestLimitKey) =>
  z.strictObject({
    value: number(TEST_LIMIT_DEFINITIONS[key].label.toLowerCase()).refine((v) => withinBound(v, TEST_LIMIT_DEFINITIONS[key].bound), boundMessage(TEST_LIMIT_DEFINITIONS[key].bound)),
    source: z
      .string('Say where the limit comes from (a document, or “common practice”).')
      .trim()
      .min(3, 'Say where the limit comes from (a document, or “common practice”).')
      .max(300, 'Keep the source to 300 characters.')
      .regex(SINGLE_LINE, SINGLE_LINE_MESSAGE),
  });

export const testLimitsPatchSchema = z
  .strictObject(Object.fromEntries(TEST_LIMIT_KEYS.map((k) => [k, limitSchema(k).optional()])) as Record<TestLimitKey, z.ZodOptional<ReturnType<typeof limitSchema>>>)
  .refine((o) => Object.values(o).some((v) => v !== undefined), 'Change at least one limit.');
export type TestLimitsPatch = z.infer<typeof testLimitsPatchSchema>;
