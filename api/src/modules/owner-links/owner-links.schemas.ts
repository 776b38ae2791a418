// Input of the owner's public routes.
import { z } from 'zod';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';

/** Path of every owner route. Shape errors answer like an unknown link (the service checks the token's form too). */
export const ownerLinkParams = z.object({ tag: z.string().max(20), token: z.string().max(100) });

export const decisionSchema = z
  .object({
    decision: z.enum(['approve', 'decline'], 'Choose Approve or Decline.'),
    reason: z.string().trim().max(500, 'Keep the reason to 500 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE).optional().transform((v) => v || null),
  })
  .strict();
export type DecisionInput = z.infer<typeof decisionSchema>;
