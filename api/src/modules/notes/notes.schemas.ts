// Input of the notes routes.
import { z } from 'zod';
import { NOTE_AUDIENCES } from '../../contracts/owner-records';
import { queryInt } from '../../schemas';

export const noteSchema = z
  .object({
    text: z.string('Write the note.').trim().min(2, 'Write the note (at least 2 characters).').max(2000, 'Keep a note to 2000 characters.'),
    audience: z.enum(NOTE_AUDIENCES, "Choose who reads it: 'internal' (bench only) or 'owner'.").default('internal'),
  })
  .strict();
export type NoteInput = z.infer<typeof noteSchema>;

export const noteListSchema = z.object({
  page: queryInt(1, 100000, 1),
  pageSize: queryInt(1, 100, 20),
});
export type NoteListQuery = z.infer<typeof noteListSchema>;
