// Input of the diagnosis and reflash-consent routes, parsed at the edge.
import { z } from 'zod';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';
import { DIAGNOSIS_CHECKS, DIAGNOSIS_DECISIONS } from '../../contracts/owner-records';
import { AWG_GAUGES, MM2_GAUGES } from '../../domain/dc-lead';

/** A measurement in its unit: a finite number in a range that makes sense on a 13.8 V bench. */
const measure = (unit: string, max: number) =>
  z
    .number(`Enter a number in ${unit}.`)
    .finite(`Enter a number in ${unit}.`)
    .min(0, `Give a value of 0 ${unit} or more.`)
    .max(max, `Give a value up to ${max} ${unit}.`)
    .nullable()
    .optional()
    .transform((v) => v ?? null);

export const GAUGE_VALUES = [...AWG_GAUGES.map((g) => `awg:${g}`), ...MM2_GAUGES.map((g) => `mm2:${g}`)] as [string, ...string[]];

const check = z.object({
  done: z.boolean(),
  result: z.string().trim().max(200, 'Keep a result to 200 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE).nullable().optional().transform((v) => v || null),
});

export const diagnosisSchema = z
  .object({
    /** The version the technician saw (0 before the first save); a stale one gets 409. */
    version: z.number().int().min(0),
    checks: z.object(Object.fromEntries(DIAGNOSIS_CHECKS.map((k) => [k, check.optional()])) as Record<(typeof DIAGNOSIS_CHECKS)[number], z.ZodOptional<typeof check>>).strict(),
    supplyAtRadioV: measure('V', 60),
    idleCurrentA: measure('A', 100),
    transmitCurrentA: measure('A', 100),
    lead: z
      .object({
        lengthM: z.number('Enter the lead length in metres.').finite().positive('Give a length above 0 m.').max(100, 'Give a length up to 100 m.'),
        gauge: z.enum(GAUGE_VALUES, 'Choose a gauge from the list.'),
        sourceV: z.number('Enter the supply voltage in volts.').finite().positive('Give a voltage above 0 V.').max(60, 'Give a voltage up to 60 V.'),
      })
      .nullable()
      .optional()
      .transform((v) => v ?? null),
    findings: z.string().trim().max(4000, 'Keep the findings to 4000 characters.').nullable().optional().transform((v) => v || null),
    decision: z.enum(DIAGNOSIS_DECISIONS, 'Choose reflash, repair or return unrepaired.').nullable().optional().transform((v) => v ?? null),
    returnReason: z.string().trim().max(500, 'Keep the reason to 500 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE).nullable().optional().transform((v) => v || null),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.decision === 'return_unrepaired' && (!v.returnReason || v.returnReason.length < 3)) {
      ctx.addIssue({ code: 'custom', path: ['returnReason'], message: 'Say why it goes back unrepaired (no fault found, unrepairable, owner declined).' });
    }
  });
export type DiagnosisInput = z.infer<typeof diagnosisSchema>;

export const consentSchema = z
  .object({
    method: z.enum(['phone', 'in_person'], 'Say how the owner consented: by phone call or in person.'),
    note: z.string().trim().max(500, 'Keep the note to 500 characters.').regex(SINGLE_LINE, SINGLE_LINE_MESSAGE).optional().transform((v) => v || null),
  })
  .strict();
export type ConsentInput = z.infer<typeof consentSchema>;
