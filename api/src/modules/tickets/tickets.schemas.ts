// Input schemas for the ticket routes (zod 4). Bodies are strict: an unknown key (state, version,
// ownerUserId, ...) is refused with 400 rather than ignored, so nothing can be mass-assigned.
import { z } from 'zod';
import { STATES } from '../../domain/workflow';
import { EQUIPMENT_KINDS, SYMPTOMS, UPDATE_CHANNELS } from '../../contracts/tickets';
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

const PHONE = /^\+?[0-9 ()./-]{5,40}$/;
export const PHONE_MESSAGE = 'Give a phone number in digits, like 01632 960417 or +44 1632 960417.';
export const CONTACT_MESSAGE = 'Give an e-mail address or a phone number, so the bench can reach the owner.';
const emptyToUndefined = <T extends z.ZodType>(schema: T) => z.union([z.literal('').transform(() => undefined), schema]).optional();

const ownerFields = {
  name: z.string().trim().max(100, 'Keep the name to 100 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE).optional(),
  email: emptyToUndefined(z.string().trim().pipe(z.email('Give an e-mail address like name@example.org.').max(254, 'Keep the e-mail address to 254 characters.'))),
  phone: emptyToUndefined(
    z
      .string()
      .trim()
      .max(40, 'Keep the phone number to 40 characters.')
      .regex(PHONE, PHONE_MESSAGE)
      .refine((v) => v.replace(/[^0-9]/g, '').length >= 5, PHONE_MESSAGE),
  ),
  callSign: emptyToUndefined(
    z
      .string()
      .trim()
      .toUpperCase()
      .regex(/^[A-Z0-9/]{3,12}$/, 'A call sign is 3 to 12 letters, digits or /.'),
  ),
};

/** The walk-in rule: a name, and at least one of e-mail or phone. */
function checkWalkIn(o: { name?: string; email?: string; phone?: string }, ctx: z.RefinementCtx, path: (string | number)[] = []): void {
  if (!o.name) ctx.addIssue({ code: 'custom', path: [...path, 'name'], message: 'Give the owner’s name.' });
  if (!o.email && !o.phone) {
    ctx.addIssue({ code: 'custom', path: [...path, 'email'], message: CONTACT_MESSAGE });
    ctx.addIssue({ code: 'custom', path: [...path, 'phone'], message: CONTACT_MESSAGE });
  }
}

/**
 * The owner of a ticket handed in at the bench: a member chosen from the accounts (`accountId`), or
 * someone handed in at the bench (name and at least one of e-mail or phone). One or the other.
 */
export const ownerSchema = z
  .strictObject({
    accountId: z.number('Choose the member from the list.').int('Choose the member from the list.').positive('Choose the member from the list.').optional(),
    ...ownerFields,
  })
  .superRefine((o, ctx) => {
    if (o.accountId !== undefined) {
      if (o.name || o.email || o.phone || o.callSign) {
        ctx.addIssue({ code: 'custom', path: ['accountId'], message: 'Choose a member, or enter someone handed in at the bench: not both.' });
      }
      return;
    }
    checkWalkIn(o, ctx);
  });
export type OwnerInput = z.infer<typeof ownerSchema>;

const symptomsSchema = z
  .array(z.enum(SYMPTOMS, 'Choose symptoms from the list.'))
  .max(SYMPTOMS.length, 'Tick each symptom once.')
  .refine((list) => new Set(list).size === list.length, 'Tick each symptom once.');

const makeModelSchema = z
  .string()
  .trim()
  .min(1, 'Give the make and model.')
  .max(120, 'Keep make and model to 120 characters.')
  .regex(SINGLE_LINE, SINGLE_LINE_MESSAGE);
const faultSchema = z
  .string()
  .trim()
  .min(5, 'Describe the fault in a few words (at least 5 characters).')
  .max(4000, 'Keep the fault description to 4000 characters.');
const unitsSchema = z.array(listItem).max(8, 'List at most 8 units.');
const accessoriesSchema = z.array(listItem).max(20, 'List at most 20 accessories.');
const accessoriesNoteSchema = optionalText(500, 'Keep the note on accessories to 500 characters.');
const updatesBySchema = z.enum(UPDATE_CHANNELS, 'Choose how the owner wants updates: e-mail, phone or none.');

export const intakeSchema = z
  .strictObject({
    equipmentKind: z.enum(EQUIPMENT_KINDS, 'Choose what kind of equipment it is.'),
    makeModel: makeModelSchema,
    serialNumber: optionalText(60, 'Keep the serial number to 60 characters.'),
    units: unitsSchema,
    // Optional on the API (scripts that predate the checklist send none); the form asks for at least one.
    symptoms: symptomsSchema.optional().transform((v) => v ?? []),
    faultReported: faultSchema,
    accessories: accessoriesSchema,
    accessoriesNote: accessoriesNoteSchema,
    firmwareVersions: optionalText(500, 'Keep firmware versions to 500 characters.'),
    reflashConsent: z.boolean('Say whether the owner consents to a reflash.'),
    updatesBy: updatesBySchema.optional(),
    /** Older form of `updatesBy`: true is 'email', false is 'none'. */
    notifyByEmail: z.boolean('Say whether the owner wants e-mail updates.').optional(),
    owner: ownerSchema.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.updatesBy === undefined && v.notifyByEmail === undefined) {
      ctx.addIssue({ code: 'custom', path: ['updatesBy'], message: 'Choose how the owner wants updates: e-mail, phone or none.' });
    }
    const channel = v.updatesBy ?? (v.notifyByEmail ? 'email' : 'none');
    const walkIn = v.owner && v.owner.accountId === undefined ? v.owner : null;
    if (walkIn && channel === 'email' && !walkIn.email && walkIn.phone) {
      ctx.addIssue({ code: 'custom', path: ['updatesBy'], message: 'Updates by e-mail need the owner’s e-mail address: give one, or choose phone or none.' });
    }
    if (walkIn && channel === 'phone' && !walkIn.phone && walkIn.email) {
      ctx.addIssue({ code: 'custom', path: ['updatesBy'], message: 'Updates by phone need the owner’s phone number: give one, or choose e-mail or none.' });
    }
  })
  .transform(({ notifyByEmail, ...v }) => ({ ...v, updatesBy: v.updatesBy ?? (notifyByEmail ? 'email' : 'none') }) as const);
export type IntakeInput = z.infer<typeof intakeSchema>;

/**
 * PATCH /api/tickets/:tag/intake: the intake details a technician corrects later. Every field is
 * optional (send what changed) except the version the editor saw. Reflash consent is recorded with
 * who and how (diagnosis), not here; the owner's account link does not change.
 */
export const intakeEditSchema = z
  .strictObject({
    version: z.number('Send the ticket version you saw.').int().min(0),
    equipmentKind: z.enum(EQUIPMENT_KINDS, 'Choose what kind of equipment it is.').optional(),
    makeModel: makeModelSchema.optional(),
    serialNumber: z.union([z.null(), optionalText(60, 'Keep the serial number to 60 characters.')]).optional(),
    units: unitsSchema.optional(),
    symptoms: symptomsSchema.optional(),
    faultReported: faultSchema.optional(),
    accessories: accessoriesSchema.optional(),
    accessoriesNote: z.union([z.null(), accessoriesNoteSchema]).optional(),
    firmwareVersions: z.union([z.null(), optionalText(500, 'Keep firmware versions to 500 characters.')]).optional(),
    updatesBy: updatesBySchema.optional(),
    owner: z
      .strictObject(ownerFields)
      .superRefine((o, ctx) => checkWalkIn(o, ctx))
      .optional(),
  })
  .refine((v) => Object.keys(v).some((k) => k !== 'version'), { message: 'Change at least one detail before saving.', path: [] });
export type IntakeEditInput = z.infer<typeof intakeEditSchema>;

/** GET /api/tickets/owners?q=: members a technician may hand in for. */
export const ownerSearchSchema = z.object({
  q: z.string().trim().max(100, 'Keep the search to 100 characters.').optional(),
});

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
