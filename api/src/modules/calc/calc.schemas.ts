// Query schemas of the calculation endpoints. Query values arrive as strings (or arrays when a
// name is repeated); each is checked here so that the domain functions only see sound numbers.
import { z } from 'zod';
import { SERIAL_BAUDS, XMODEM_BLOCK_SIZES, XMODEM_CHECK_MODES, XMODEM_MAX_BYTES } from '../../domain/xmodem';
import {
  AWG_GAUGES,
  CONDUCTOR_C_BOUND,
  CURRENT_A_BOUND,
  LENGTH_M_BOUND,
  MM2_GAUGES,
  NOMINAL_V_BOUND,
  SUPPLY_V_BOUND,
  TOLERANCE_PCT_BOUND,
} from '../../domain/dc-lead';
import { boundMessage, withinBound, type InputBound } from '../../domain/input-error';
import { FORWARD_W_BOUND, REFLECTED_W_BOUND } from '../../domain/rf';
import { LEVEL_OHMS_BOUND, LEVEL_UNITS, S_METER_BANDS } from '../../domain/levels';
import { DUMMY_LOAD_OHMS_BOUND, DUMMY_LOAD_W_BOUND } from '../../domain/dummy-load';
import { PAD_DB_BOUND, PAD_INPUT_W_BOUND, PAD_OHMS_BOUND, PAD_SHAPES } from '../../domain/attenuator';
import { LOAD_SWR_BOUND, MATCHED_LOSS_DB_BOUND } from '../../domain/line-loss';
import { COAX_LENGTH_M_BOUND, COAX_MHZ_BOUND, COAX_TYPES } from '../../domain/coax';
import { DISCHARGE_FARADS_BOUND, DISCHARGE_OHMS_BOUND, DISCHARGE_VOLTS_BOUND, SAFE_VOLTS_BOUND } from '../../domain/discharge';

const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
/** "2,5" or ",5": a decimal comma, which would otherwise be read wrongly or not at all. */
const DECIMAL_COMMA = /^[+-]?\d*,\d+$/;
const COMMA_MESSAGE = 'Use a point for decimals (2.5, not 2,5).';

/** The value as a string, with a plain message for a comma or anything else that is not a number. */
function decimalText() {
  return z
    .string({ error: (issue) => (issue.input === undefined ? 'Required.' : 'Give one value.') })
    .trim()
    .min(1, 'Required.')
    .superRefine((v, ctx) => {
      if (DECIMAL.test(v)) return;
      ctx.addIssue({ code: 'custom', message: DECIMAL_COMMA.test(v) ? COMMA_MESSAGE : 'Must be a number.' });
    });
}

/** One query value that must be present and a finite decimal number (inside `bound` when given). */
function numberParam(bound?: InputBound) {
  const number = z.number().refine(Number.isFinite, 'Must be a number.');
  return decimalText()
    .transform(Number)
    .pipe(bound ? number.refine((v) => withinBound(v, bound), boundMessage(bound)) : number);
}

/** The same, optional: absent means the default the domain function applies. */
function optionalNumberParam(bound?: InputBound) {
  return numberParam(bound).optional();
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

function optionalChoiceParam<T extends string | number>(choices: readonly T[], message: string) {
  return choiceParam(choices, message).optional();
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
    forwardW: numberParam(FORWARD_W_BOUND),
    reflectedW: numberParam(REFLECTED_W_BOUND),
  })
  .superRefine((q, ctx) => {
    // Only compare two sound numbers (a missing or bad field has its own message already).
    if (!withinBound(q.forwardW, FORWARD_W_BOUND) || !withinBound(q.reflectedW, REFLECTED_W_BOUND)) return;
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
    currentA: numberParam(CURRENT_A_BOUND),
    lengthM: numberParam(LENGTH_M_BOUND),
    awg: optionalNumberParam().refine((v) => v === undefined || (AWG_GAUGES as readonly number[]).includes(v), awgMessage),
    mm2: optionalNumberParam().refine((v) => v === undefined || (MM2_GAUGES as readonly number[]).includes(v), mm2Message),
    supplyV: numberParam(SUPPLY_V_BOUND),
    nominalV: optionalNumberParam(NOMINAL_V_BOUND),
    tolerancePct: optionalNumberParam(TOLERANCE_PCT_BOUND),
    conductorC: optionalNumberParam(CONDUCTOR_C_BOUND),
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

export const levelQuery = z.object({
  value: numberParam(),
  unit: choiceParam(LEVEL_UNITS, `Unit must be one of ${LEVEL_UNITS.join(', ')}.`),
  ohms: optionalNumberParam(LEVEL_OHMS_BOUND),
  band: optionalChoiceParam(S_METER_BANDS, "Band must be 'hf' (below 30 MHz) or 'vhf' (30 MHz and above)."),
});

export const dummyLoadQuery = z.object({
  watts: numberParam(DUMMY_LOAD_W_BOUND),
  ohms: optionalNumberParam(DUMMY_LOAD_OHMS_BOUND),
});

export const attenuatorQuery = z.object({
  db: numberParam(PAD_DB_BOUND),
  ohms: optionalNumberParam(PAD_OHMS_BOUND),
  shape: choiceParam(PAD_SHAPES, "Shape must be 'pi' or 'tee'."),
  inputW: optionalNumberParam(PAD_INPUT_W_BOUND),
});

export const lineLossQuery = z
  .object({
    swr: numberParam(LOAD_SWR_BOUND),
    matchedLossDb: optionalNumberParam(MATCHED_LOSS_DB_BOUND),
    cable: optionalChoiceParam(COAX_TYPES, `Cable must be one of ${COAX_TYPES.join(', ')}.`),
    lengthM: optionalNumberParam(COAX_LENGTH_M_BOUND),
    mhz: optionalNumberParam(COAX_MHZ_BOUND),
  })
  .superRefine((q, ctx) => {
    if (q.matchedLossDb !== undefined && q.cable !== undefined) {
      const message = 'Give either the matched loss or a cable with its length and frequency, not both.';
      ctx.addIssue({ code: 'custom', path: ['matchedLossDb'], message });
      ctx.addIssue({ code: 'custom', path: ['cable'], message });
    } else if (q.matchedLossDb === undefined && q.cable === undefined) {
      ctx.addIssue({ code: 'custom', path: ['matchedLossDb'], message: 'Give the matched loss, or a cable with its length and frequency.' });
    } else if (q.cable !== undefined) {
      if (q.lengthM === undefined) ctx.addIssue({ code: 'custom', path: ['lengthM'], message: 'Give the length of the cable.' });
      if (q.mhz === undefined) ctx.addIssue({ code: 'custom', path: ['mhz'], message: 'Give the frequency.' });
    }
  });

export const dischargeQuery = z.object({
  volts: numberParam(DISCHARGE_VOLTS_BOUND),
  farads: numberParam(DISCHARGE_FARADS_BOUND),
  ohms: numberParam(DISCHARGE_OHMS_BOUND),
  safeVolts: optionalNumberParam(SAFE_VOLTS_BOUND),
});

export type XmodemQuery = z.infer<typeof xmodemQuery>;
export type RfQuery = z.infer<typeof rfQuery>;
export type DcDropQuery = z.infer<typeof dcDropQuery>;
export type LevelQuery = z.infer<typeof levelQuery>;
export type LineLossQuery = z.infer<typeof lineLossQuery>;
