// Input schemas of the moves routes (zod 4). Bodies are strict: unknown keys are refused with 400.
import { z } from 'zod';
import { idSchema } from '../../schemas';
import { ticketPathParams } from '../tickets/tickets.schemas';

export const undoPathParams = ticketPathParams.extend({ eventId: idSchema });

export const undoSchema = z.strictObject({
  version: z.number('Send the ticket version you saw.').int().min(0),
});
export type UndoInput = z.infer<typeof undoSchema> & { eventId: number };

export const partsOnOrderSchema = z.strictObject({
  partsOnOrder: z.boolean('Say whether parts are on order (true or false).'),
  note: z
    .string()
    .trim()
    .max(500, 'Keep the note to 500 characters.')
    .optional()
    .transform((v) => (v ? v : undefined)),
});
export type PartsOnOrderInput = z.infer<typeof partsOnOrderSchema>;

export const assignSchema = z.strictObject({
  technicianId: z.number('Choose a technician by id, or null for nobody.').int().positive().max(4_294_967_295).nullable(),
});
export type AssignInput = z.infer<typeof assignSchema>;
