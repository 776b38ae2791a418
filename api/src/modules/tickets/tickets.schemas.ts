// Input schemas for the ticket routes (zod 4). Bodies are strict: an unknown key (state, version,
// ownerUserId, ...) is refused with 400 rather than ignored, so nothing can be mass-assigned.
import { z } from 'zod';
import { STATES } from '../../domain/workflow';
import { EQUIPMENT_KINDS } from '../../contracts/tickets';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE, queryInt } from '../../schemas';


const optionalText = (max: number, message: string, singleLine = true) =>
  z
    .string()
    .trim()
    .max(max, message)
    .refine((v) => !singleLine || SINGLE_LINE.test(v), SINGLE_LINE_MESSAGE)
    .optional()
    .transform((v) => (v ? v : undefined));

const listItem = z
  .string()
  .trim()
  .min(1, 'Leave out empty entries.')
  .max(60, 'Keep each entry to 60 characters.')
  .regex(SINGLE_LINE, SINGLE_LINE_MESSAGE);

export const ownerSchema = z.strictObject({
  name: z.string().trim().min(1, 'Give the owner’s name.').max(100, 'Keep the name to 100 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE),
  email: z.email('Give an e-mail address like name@example.org.').max(254),
  phone: optionalText(40, 'Keep the phone number to 40 characters.'),
  callSign: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9/]{3,12}$/, 'A call sign is 3 to 12 letters, digits or /.')
    .optional()
    .or(z.literal('').transform(() => undefined)),
});

export const intakeSchema = z.strictObject({
  equipmentKind: z.enum(EQUIPMENT_KINDS, 'Choose what kind of equipment it is.'),
  makeModel: z
    .string()
    .trim()
    .min(1, 'Give the make and model.')
    .max(120, 'Keep make and model to 120 characters.')
    .regex(SINGLE_LINE, SINGLE_LINE_MESSAGE),
  serialNumber: optionalText(60, 'Keep the serial number to 60 characters.'),
  units: z.array(listItem).max(8, 'List at most 8 units.'),
  faultReported: z
    .string()
    .trim()
    .min(5, 'Describe the fault in a few words (at least 5 characters).')
    .max(4000, 'Keep the fault description to 4000 characters.'),
  accessories: z.array(listItem).max(20, 'List at most 20 accessories.'),
  firmwareVersions: optionalText(500, 'Keep firmware versions to 500 characters.'),
  reflashConsent: z.boolean('Say whether the owner consents to a reflash.'),
  notifyByEmail: z.boolean('Say whether the owner wants e-mail updates.'),
  owner: ownerSchema.optional(),
});
export type IntakeInput = z.infer<typeof intakeSchema>;

export const moveSchema = z.strictObject({
  to: z.enum(STATES, 'Choose a lane to move the ticket to.'),
  version: z.number('Send the ticket version you saw.').int().min(0),
  note: optionalText(2000, 'Keep the note to 2000 characters.', false),
});
export type MoveInput = z.infer<typeof moveSchema>;

export const LIST_SORTS = ['tag', 'createdAt', 'state', 'stateSince'] as const;

// Query strings are not strict: a cache-busting parameter must not break a list.
export const listQuerySchema = z.object({
  page: queryInt(1, 100_000, 1),
  pageSize: queryInt(1, 100, 25),
  sort: z.enum(LIST_SORTS).default('createdAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  q: z.string().trim().max(100).optional(),
  state: z.enum(STATES).optional(),
});
export type ListQuery = z.infer<typeof listQuerySchema>;

/**
 * The tag in /api/tickets/:tag: RW- and plain digits (no sign, hex, exponent or fraction), or 400.
 * A well-formed tag that is not the canonical spelling (RW-00042) or names no ticket you can see
 * is 404, decided by the service.
 */
export const ticketPathParams = z.strictObject({
  tag: z.string().max(24, 'A tag looks like RW-0042.').regex(/^RW-[0-9]{1,10}$/i, 'A tag looks like RW-0042.'),
});
