// Query schemas of the calculation endpoints. Query values arrive as strings (or arrays when a
// name is repeated); each is checked here so that the domain functions only see sound numbers.
import { z } from 'zod';
import { SERIAL_BAUDS, XMODEM_BLOCK_SIZES, XMODEM_CHECK_MODES, XMODEM_MAX_BYTES } from '../../domain/xmodem';
import { AWG_GAUGES, MM2_GAUGES } from '../../domain/dc-lead';

const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** One query value that must be present and a finite decimal number. */
function numberParam() {
  return z
    .string({ error: (issue) => (issue.input === undefined ? 'Required.' : 'Give one value.') })
    .trim()
    .min(1, 'Required.')
    .regex(DECIMAL, 'Must be a number.')
    .transform(Number)
    .pipe(z.number().refine(Number.isFinite, 'Must be a number.'));
}

function optionalNumberParam() {
  return z
    .string({ error: 'Give one value.' })
    .trim()
    .regex(DECIMAL, 'Must be a number.')
    .transform(Number)
    .pipe(z.number().refine(Number.isFinite, 'Must be a number.'))
    .optional();
}

/** One value from a fixed list, written as it is in the query string. */
function choiceParam<T extends string | number>(choices: readonly T[], message: string) {
  const allowed = choices.map(String);
  return z
    .string({ error: (issue) => (issue.input === undefined ? 'Required.' : 'Give one value.') })
    .trim()
    .min(1, 'Required.')
    .refine((v) => allowed.includes(v), message)
    .transform((v) => choices[allowed.indexOf(v)]);
}

export const xmodemQuery = z.object({
  bytes: numberParam()
    .pipe(z.number().int('The image size must be a whole number of bytes.').nonnegative('The image size cannot be negative.')
      .min(1, 'The image is empty: there is nothing to send.')
      .max(XMODEM_MAX_BYTES, 'The image is larger than 1 GiB.')),
  block: choiceParam(XMODEM_BLOCK_SIZES, 'Block size must be 128 (SOH) or 1024 (STX, XMODEM-1K).'),
  check: choiceParam(XMODEM_CHECK_MODES, "Check mode must be 'crc' (CRC-16) or 'sum' (checksum)."),
  baud: choiceParam(SERIAL_BAUDS, `Baud must be one of the usual serial rates: ${SERIAL_BAUDS.join(', ')}.`),
});

export const rfQuery = z
  .object({
    forwardW: numberParam().pipe(z.number().positive('Forward power must be more than 0 W.')),
    reflectedW: numberParam().pipe(z.number().min(0, 'Reflected power cannot be negative.')),
  })
  .superRefine((q, ctx) => {
    // Only compare two sound numbers (a missing or bad field has its own message already).
    if (!Number.isFinite(q.forwardW) || !Number.isFinite(q.reflectedW) || q.forwardW <= 0 || q.reflectedW < 0) return;
    if (q.reflectedW > q.forwardW) {
      ctx.addIssue({ code: 'custom', path: ['reflectedW'], message: 'Reflected power cannot be above forward power: check the meter direction.' });
    } else if (q.reflectedW === q.forwardW) {
      ctx.addIssue({ code: 'custom', path: ['reflectedW'], message: 'Total reflection: check the load (open or shorted line, or no dummy load).' });
    }
  });

const awgMessage = `Gauge must be AWG ${AWG_GAUGES.join(', ')}.`;
const mm2Message = `Cross-section must be ${MM2_GAUGES.join(', ')} mm².`;

export const dcDropQuery = z
  .object({
    currentA: numberParam().pipe(z.number().min(0, 'Current cannot be negative.')),
    lengthM: numberParam().pipe(z.number().min(0, 'Length cannot be negative.').max(100, 'A DC lead longer than 100 m is not a bench lead.')),
    awg: optionalNumberParam().refine((v) => v === undefined || (AWG_GAUGES as readonly number[]).includes(v), awgMessage),
    mm2: optionalNumberParam().refine((v) => v === undefined || (MM2_GAUGES as readonly number[]).includes(v), mm2Message),
    supplyV: numberParam().pipe(z.number().positive('Supply voltage must be more than 0 V.').max(60, 'This calculator is for low-voltage DC leads (60 V at most).')),
    nominalV: optionalNumberParam().refine((v) => v === undefined || (v > 0 && v <= 60), 'Nominal voltage must be more than 0 V and at most 60 V.'),
    tolerancePct: optionalNumberParam().refine((v) => v === undefined || (v >= 0 && v < 100), 'Tolerance must be from 0 to below 100 %.'),
  })
  .superRefine((q, ctx) => {
    if (q.awg !== undefined && q.mm2 !== undefined) {
      const message = 'Give the gauge either in AWG or in mm², not both.';
      ctx.addIssue({ code: 'custom', path: ['awg'], message });
      ctx.addIssue({ code: 'custom', path: ['mm2'], message });
    } else if (q.awg === undefined && q.mm2 === undefined) {
      ctx.addIssue({ code: 'custom', path: ['awg'], message: 'Give the gauge: awg or mm2.' });
    }
  });

export type XmodemQuery = z.infer<typeof xmodemQuery>;
export type RfQuery = z.infer<typeof rfQuery>;
export type DcDropQuery = z.infer<typeof dcDropQuery>;
