// Input schema for the hand-back record (zod 4). Strict: who recorded it and when are the server's.
import { z } from 'zod';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';

const itemName = z.string('Name the item.').trim().min(1, 'Name the item.').max(100, 'Keep the item to 100 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE);
const note = z.string().trim().max(300, 'Keep the note to 300 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE);

export const handBackSchema = z.strictObject({
  items: z
    .array(
      z.strictObject({
        item: itemName,
        returned: z.boolean('Tick whether the item went back (true or false).'),
        note: z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? null : v), note.nullable().optional()),
      }),
      'Send the checklist as a list.',
    )
    .max(30, 'The checklist has at most 30 items.'),
  extras: z
    .array(
      z.strictObject({
        item: itemName,
        note: note.min(3, 'Say why this item goes back although it was not handed in (at least 3 characters).'),
      }),
      'Send the extra items as a list.',
    )
    .max(30, 'At most 30 extra items.')
    .default([]),
  collectedBy: z
    .string('Say who collected the equipment.')
    .trim()
    .min(2, 'Say who collected the equipment (their name).')
    .max(100, 'Keep the name to 100 characters.')
    .regex(SINGLE_LINE, SINGLE_LINE_MESSAGE),
  collectedAt: z.iso.datetime({ offset: true, message: 'Give when it was collected as a date and time (ISO 8601).' }).optional(),
});
export type HandBackInput = z.infer<typeof handBackSchema>;
