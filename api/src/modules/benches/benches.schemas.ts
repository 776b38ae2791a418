// Request bodies of the admin bench, opening-rule and booking-settings routes. Strict objects.
import { z } from 'zod';
import { INSTRUMENT_KINDS, RULE_KINDS } from '../../contracts/bookings';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';
import { isLocalDate, isValidTimeZone, isWallClockTime, minutesOf, UNIT_MINUTES } from '../../domain/bench-slots';

const line = (max: number) => z.string().trim().max(max, `Use at most ${max} characters.`).regex(SINGLE_LINE, SINGLE_LINE_MESSAGE);
const optionalLine = (max: number) =>
  line(max)
    .nullable()
    .optional()
    .transform((v) => (v === undefined ? undefined : v || null));

const instrument = z
  .strictObject({
    kind: z.enum(INSTRUMENT_KINDS, { error: 'Pick the kind of instrument from the list.' }),
    name: line(80).min(1, 'Name the instrument.'),
    maxCurrentA: z.number().positive('Give the maximum current in amperes.').max(1000).nullable().optional(),
    powerRatingW: z.number().positive('Give the power rating in watts.').max(100_000).nullable().optional(),
    note: optionalLine(200),
  })
  .superRefine((i, ctx) => {
    if (i.kind === 'regulated_supply' && !i.maxCurrentA) ctx.addIssue({ code: 'custom', path: ['maxCurrentA'], message: 'A regulated supply needs its maximum current (A).' });
    if (i.kind === 'dummy_load' && !i.powerRatingW) ctx.addIssue({ code: 'custom', path: ['powerRatingW'], message: 'A dummy load needs its power rating (W).' });
  });

const benchFields = {
  name: line(60).min(1, 'Give the bench a name.'),
  location: optionalLine(120),
  instruments: z.array(instrument).max(30, 'At most 30 instruments on one bench.'),
  outOfService: z.boolean(),
  outOfServiceReason: optionalLine(200),
  outOfServiceUntil: z.iso.datetime({ offset: true, error: 'Give a date and time, or leave it empty for "until further notice".' }).nullable().optional(),
};

function outOfServiceNeedsReason(b: { outOfService?: boolean; outOfServiceReason?: string | null }, ctx: z.RefinementCtx) {
  if (b.outOfService && !b.outOfServiceReason) ctx.addIssue({ code: 'custom', path: ['outOfServiceReason'], message: 'Say why the bench is out of service.' });
}

export const createBenchBody = z
  .strictObject({ ...benchFields, outOfService: benchFields.outOfService.default(false), instruments: benchFields.instruments.default([]) })
  .superRefine(outOfServiceNeedsReason);

export const patchBenchBody = z
  .strictObject({
    name: benchFields.name.optional(),
    location: benchFields.location,
    instruments: benchFields.instruments.optional(),
    outOfService: benchFields.outOfService.optional(),
    outOfServiceReason: benchFields.outOfServiceReason,
    outOfServiceUntil: benchFields.outOfServiceUntil,
  })
  .refine((b) => Object.values(b).some((v) => v !== undefined), 'Nothing to change.');

const localDate = z.string().refine(isLocalDate, 'Give a date as YYYY-MM-DD.');
const wallClock = z.string().refine((t) => isWallClockTime(t), `Give a time as HH:mm, on a ${UNIT_MINUTES}-minute mark.`);

export const createRuleBody = z
  .strictObject({
    kind: z.enum(RULE_KINDS, { error: 'Choose weekly session, one-off session or closure.' }),
    weekday: z.number().int().min(1, 'Pick a weekday.').max(7, 'Pick a weekday.').nullable().optional(),
    startTime: wallClock.nullable().optional(),
    endTime: wallClock.nullable().optional(),
    validFrom: localDate.nullable().optional(),
    validUntil: localDate.nullable().optional(),
    note: optionalLine(200),
  })
  .superRefine((r, ctx) => {
    const need = (path: string, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
    if (r.kind !== 'closure') {
      if (!r.startTime) need('startTime', 'Give the start time.');
      if (!r.endTime) need('endTime', 'Give the end time.');
      if (r.startTime && r.endTime && minutesOf(r.endTime) <= minutesOf(r.startTime)) need('endTime', 'The session must end after it starts, on the same day.');
    }
    if (r.kind === 'weekly' && !r.weekday) need('weekday', 'Pick a weekday.');
    if (r.kind === 'one_off' && !r.validFrom) need('validFrom', 'Give the date of the session.');
    if (r.kind === 'closure' && (!r.validFrom || !r.validUntil)) need(r.validFrom ? 'validUntil' : 'validFrom', 'Give the first and last day closed.');
    if (r.validFrom && r.validUntil && r.validUntil < r.validFrom) need('validUntil', 'The last date must not be before the first.');
  })
  .transform((r) => ({
    kind: r.kind,
    weekday: r.kind === 'weekly' ? (r.weekday ?? null) : null,
    startTime: r.kind === 'closure' ? null : (r.startTime ?? null),
    endTime: r.kind === 'closure' ? null : (r.endTime ?? null),
    validFrom: r.validFrom ?? null,
    validUntil: r.kind === 'one_off' ? (r.validFrom ?? null) : (r.validUntil ?? null),
    note: r.note ?? null,
  }));

export const patchSettingsBody = z
  .strictObject({
    timeZone: z.string().refine(isValidTimeZone, 'Give an IANA time-zone name, e.g. Europe/London.').optional(),
    slotMinutes: z
      .number()
      .int()
      .min(15, 'Slots are 15 to 240 minutes.')
      .max(240, 'Slots are 15 to 240 minutes.')
      .refine((m) => m % UNIT_MINUTES === 0, `Use a multiple of ${UNIT_MINUTES} minutes.`)
      .optional(),
    maxOpenBookings: z.number().int().min(1, 'Allow at least one open booking.').max(50).optional(),
    horizonDays: z.number().int().min(1, 'Allow booking at least one day ahead.').max(365).optional(),
    cancelCutoffHours: z.number().int().min(0).max(168, 'At most a week (168 hours).').optional(),
  })
  .refine((b) => Object.keys(b).length > 0, 'Nothing to change.');

export const idParam = (name: string) => z.strictObject({ [name]: z.coerce.number().int().min(1).max(4_294_967_295) });

export type CreateBenchBody = z.infer<typeof createBenchBody>;
export type PatchBenchBody = z.infer<typeof patchBenchBody>;
export type CreateRuleBody = z.infer<typeof createRuleBody>;
export type PatchSettingsBody = z.infer<typeof patchSettingsBody>;
