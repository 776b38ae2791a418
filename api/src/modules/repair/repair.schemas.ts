// Input schemas for the repair log (zod 4). Bodies are strict: who and when are the server's.
import { z } from 'zod';
import { REPAIR_LOG_KINDS } from '../../contracts/bench-records';
import { queryInt, SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';

export const workSchema = z.strictObject({
  description: z
    .string('Say what was done.')
    .trim()
    .min(3, 'Say what was done (at least 3 characters).')
    .max(1000, 'Keep it to 1000 characters.'),
  minutes: z
    .number('Give the time spent in whole minutes.')
    .int('Give the time spent in whole minutes.')
    .min(1, 'Give the time spent: at least 1 minute.')
    .max(24 * 60, 'One entry is at most 24 hours (1440 minutes); log longer work as several entries.'),
});
export type WorkInput = z.infer<typeof workSchema>;

export const partSchema = z.strictObject({
  description: z
    .string('Name the part.')
    .trim()
    .min(2, 'Name the part (at least 2 characters).')
    .max(200, 'Keep it to 200 characters.')
    .regex(SINGLE_LINE, SINGLE_LINE_MESSAGE),
  quantity: z.number('Give the quantity.').int('The quantity is a whole number.').min(1, 'The quantity is at least 1.').max(1000, 'The quantity is at most 1000.'),
  unitCostMinor: z
    .number('Give the cost per item in minor units (e.g. pence or cents).')
    .int('The cost is a whole number of minor units (e.g. 1250 for 12.50).')
    .min(0, 'The cost cannot be negative.')
    .max(10_000_000, 'The cost per item is at most 100000.00.'),
});
export type PartInput = z.infer<typeof partSchema>;

export const repairLogQuerySchema = z.strictObject({
  kind: z.enum(REPAIR_LOG_KINDS, 'kind is work or parts.').optional(),
  page: queryInt(1, 100_000, 1),
  pageSize: queryInt(1, 100, 10),
  dir: z.enum(['asc', 'desc'], 'dir is asc or desc.').default('desc'),
});
export type RepairLogQuery = z.infer<typeof repairLogQuerySchema>;
