// Request bodies and queries of the booking routes. Strict objects: no mass assignment of the
// member, status or no-show flag.
import { z } from 'zod';
import { BOOKING_PURPOSES } from '../../contracts/bookings';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';
import { isLocalDate } from '../../domain/bench-slots';

export const MAX_SLOTS_PER_BOOKING = 8;

const note = z
  .string()
  .trim()
  .max(500, 'Use at most 500 characters.')
  .nullable()
  .optional()
  .transform((v) => (v === undefined ? undefined : v || null));
const ticketTag = z
  .string()
  .trim()
  .max(12, 'A tag looks like RW-0042.')
  .regex(SINGLE_LINE, SINGLE_LINE_MESSAGE)
  .nullable()
  .optional()
  .transform((v) => (v === undefined ? undefined : v || null));
const purpose = z.enum(BOOKING_PURPOSES, { error: 'Say what the slot is for: self-service work, drop-off or collection.' });

export const createBookingBody = z.strictObject({
  benchId: z.number().int().min(1, 'Pick a bench.'),
  start: z.iso.datetime({ offset: true, error: 'Give the start of the first slot as an ISO date and time.' }),
  slotCount: z
    .number()
    .int('Book whole slots.')
    .min(1, 'Book at least one slot.')
    .max(MAX_SLOTS_PER_BOOKING, `Book at most ${MAX_SLOTS_PER_BOOKING} consecutive slots at once.`)
    .default(1),
  purpose,
  ticketTag,
  note,
});

export const patchBookingBody = z
  .strictObject({ purpose: purpose.optional(), ticketTag, note })
  .refine((b) => Object.values(b).some((v) => v !== undefined), 'Nothing to change.');

export const noShowBody = z.strictObject({ noShow: z.boolean() });

export const dateQuery = z.strictObject({ date: z.string().refine(isLocalDate, 'Give a date as YYYY-MM-DD.') });
export const optionalDateQuery = z.strictObject({ date: z.string().refine(isLocalDate, 'Give a date as YYYY-MM-DD.').optional() });

export const BOOKING_SORTS = ['startsAt', 'createdAt', 'bench'] as const;
export const listBookingsQuery = z.strictObject({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(BOOKING_SORTS).default('startsAt'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  when: z.enum(['upcoming', 'past', 'all']).default('upcoming'),
});

export const bookingIdParam = z.strictObject({ bookingId: z.coerce.number().int().min(1).max(4_294_967_295) });

/** 32 random bytes, base64url: 43 characters. */
export const feedTokenQuery = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{43}$/, 'This calendar link is not complete.') });

export type CreateBookingBody = z.infer<typeof createBookingBody>;
export type PatchBookingBody = z.infer<typeof patchBookingBody>;
export type ListBookingsQuery = z.infer<typeof listBookingsQuery>;
