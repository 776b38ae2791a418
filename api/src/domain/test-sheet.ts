// The bench test sheet: its figures and its pass or fail against the club's limits.
// Plain TypeScript with no framework imports: the API decides with it when a sheet is saved, the
// client shows the same figures while the technician types. Every RF figure comes from rf.ts
// (formulas and their sources named there); this file only adds the limits and the verdict.
//
// Decisions (our own; documented in api/API.md, "Repair log, test sheets and hand-back"):
// - The radio's output is the wattmeter's forward reading into the dummy load (a rating is stated
//   into a 50 Ω load); output in dBm and the power error against the rating use that reading.
// - A line at its limit passes (SWR 1.5:1 against a limit of 1.5:1); a tolerance of 1e-9 keeps a
//   figure that is the limit up to floating-point rounding on the passing side.
// - Frequency is optional per band; when given, the dialled (nominal) and the counted frequency
//   are both needed. An error beyond 10 000 ppm (1 %) is refused as a typing slip (kHz for Hz).
// - The sheet passes only when every line passes.

import { CalcInputError, requireBound, type InputBound } from './input-error';
import { frequencyError, powerErrorDb, rfFigures, FORWARD_W_BOUND, REFLECTED_W_BOUND, type RfFigures } from './rf';

export const TEST_LIMIT_KEYS = [
  'swrMax',
  'powerErrorMinDb',
  'powerErrorMaxDb',
  'frequencyErrorMaxPpm',
  'supplyMinV',
  'supplyMaxV',
  'receiveCurrentMaxA',
] as const;
export type TestLimitKey = (typeof TEST_LIMIT_KEYS)[number];

export interface TestLimit {
  value: number;
  /** Where the figure comes from: a document, or "common practice". */
  source: string;
}
export type TestLimits = Record<TestLimitKey, TestLimit>;

export interface TestLimitDefinition {
  label: string;
  unit: string;
  /** The range an admin may set (a limit outside it is a typing slip). */
  bound: InputBound;
}

export const TEST_LIMIT_DEFINITIONS: Record<TestLimitKey, TestLimitDefinition> = {
  swrMax: { label: 'Highest SWR into the dummy load', unit: ':1', bound: { min: 1, max: 5, aboveMin: true, unit: '' } },
  powerErrorMinDb: { label: 'Lowest output against the rating', unit: 'dB', bound: { min: -10, max: 0, unit: 'dB' } },
  powerErrorMaxDb: { label: 'Highest output against the rating', unit: 'dB', bound: { min: 0, max: 10, unit: 'dB' } },
  frequencyErrorMaxPpm: { label: 'Largest frequency error (either way)', unit: 'ppm', bound: { min: 0, max: 1000, aboveMin: true, unit: 'ppm' } },
  supplyMinV: { label: 'Lowest supply voltage at the radio', unit: 'V', bound: { min: 0, max: 60, unit: 'V' } },
  supplyMaxV: { label: 'Highest supply voltage at the radio', unit: 'V', bound: { min: 0, max: 60, aboveMin: true, unit: 'V' } },
  receiveCurrentMaxA: { label: 'Highest receive current', unit: 'A', bound: { min: 0, max: 100, aboveMin: true, unit: 'A' } },
};

const POWER_SOURCE = 'Common practice: output from −1 dB (about 79 %) to +1 dB of the rating into a dummy load (no published source).';
const SUPPLY_SOURCE = 'Common practice: 13.8 V ± 15 %, the usual supply tolerance of 12 V mobile transceivers (no published source; check the radio’s manual).';

/** The limits a club starts with, until an admin sets its own. */
export const DEFAULT_TEST_LIMITS: TestLimits = {
  swrMax: { value: 1.5, source: 'Common practice: SWR at most 1.5:1 into a dummy load (no published source).' },
  powerErrorMinDb: { value: -1, source: POWER_SOURCE },
  powerErrorMaxDb: { value: 1, source: POWER_SOURCE },
  frequencyErrorMaxPpm: {
    value: 1,
    source: 'Common practice: ±1 ppm, what a transceiver with a temperature-compensated reference usually holds (no published source; check the radio’s manual).',
  },
  supplyMinV: { value: 11.7, source: SUPPLY_SOURCE },
  supplyMaxV: { value: 15.9, source: SUPPLY_SOURCE },
  receiveCurrentMaxA: { value: 2.5, source: 'Common practice: a 100 W HF transceiver draws about 1 to 2.5 A on receive (no published source; check the radio’s manual).' },
};

export const SUPPLY_V_BOUND: InputBound = { min: 0, max: 60, aboveMin: true, unit: 'V', why: 'a bench supply for radio equipment' };
export const RECEIVE_A_BOUND: InputBound = { min: 0, max: 100, unit: 'A' };
export const RATED_W_BOUND: InputBound = { min: 0, max: 10_000, aboveMin: true, unit: 'W', why: '10 kW, above any amateur station' };
export const FREQUENCY_HZ_BOUND: InputBound = { min: 1_000, max: 300e9, unit: 'Hz', why: '1 kHz to 300 GHz' };
/** Beyond this the reading is a slip of units, not a frequency error. */
export const FREQUENCY_ERROR_PPM_SANE = 10_000;
export const MAX_BANDS = 20;

export interface BandInput {
  /** As the technician names it, e.g. "20 m". */
  band: string;
  ratedW: number;
  forwardW: number;
  reflectedW: number;
  nominalHz?: number | null;
  measuredHz?: number | null;
}

export interface TestSheetInput {
  supplyVoltageV: number;
  receiveCurrentA: number;
  bands: BandInput[];
}

export interface BandFigures extends RfFigures {
  powerErrorDb: number;
  frequencyErrorHz: number | null;
  frequencyErrorPpm: number | null;
}

/** One line of the sheet, checked against one limit. */
export interface SheetCheck {
  /** What is checked, e.g. "20 m: SWR". */
  line: string;
  /** The input it is decided from (a form control's path, e.g. "bands.0.reflectedW"). */
  field: string;
  /** The figure as shown, with its unit ("1.50:1"). */
  shown: string;
  /** The limit as shown ("at most 1.50:1"). */
  limit: string;
  source: string;
  passed: boolean;
}

export interface TestSheetResult {
  bands: BandFigures[];
  checks: SheetCheck[];
  passed: boolean;
}

const EPS = 1e-9;
const fixed = (v: number, digits: number) => (Object.is(Math.round(v * 10 ** digits), -0) ? 0 : v).toFixed(digits);
const signed = (v: number, digits: number) => {
  const text = fixed(v, digits);
  return Number(text) > 0 ? `+${text}` : Number(text) === 0 ? fixed(0, digits) : text.replace('-', '−');
};

/** Figures of one band line (throws CalcInputError naming the band's field). */
export function bandFigures(band: BandInput, index = 0): BandFigures {
  const at = (field: string) => `bands.${index}.${field}`;
  try {
    requireBound('ratedW', band.ratedW, RATED_W_BOUND);
    requireBound('forwardW', band.forwardW, FORWARD_W_BOUND);
    requireBound('reflectedW', band.reflectedW, REFLECTED_W_BOUND);
  } catch (err) {
    if (err instanceof CalcInputError) throw new CalcInputError(at(err.field), err.message);
    throw err;
  }
  let rf: RfFigures;
  try {
    rf = rfFigures(band.forwardW, band.reflectedW);
  } catch (err) {
    if (err instanceof CalcInputError) throw new CalcInputError(at(err.field), err.message);
    throw err;
  }
  let frequencyErrorHz: number | null = null;
  let frequencyErrorPpm: number | null = null;
  const hasNominal = band.nominalHz !== undefined && band.nominalHz !== null;
  const hasMeasured = band.measuredHz !== undefined && band.measuredHz !== null;
  if (hasNominal !== hasMeasured) {
    throw new CalcInputError(at(hasNominal ? 'measuredHz' : 'nominalHz'), 'Give both the dialled and the measured frequency, or neither.');
  }
  if (hasNominal && hasMeasured) {
    try {
      requireBound('nominalHz', band.nominalHz!, FREQUENCY_HZ_BOUND);
      requireBound('measuredHz', band.measuredHz!, FREQUENCY_HZ_BOUND);
    } catch (err) {
      if (err instanceof CalcInputError) throw new CalcInputError(at(err.field), err.message);
      throw err;
    }
    const f = frequencyError(band.measuredHz!, band.nominalHz!);
    if (Math.abs(f.errorPpm) > FREQUENCY_ERROR_PPM_SANE) {
      throw new CalcInputError(at('measuredHz'), 'The measured frequency is more than 1 % from the dialled one: check that both are in the same unit.');
    }
    frequencyErrorHz = f.errorHz;
    frequencyErrorPpm = f.errorPpm;
  }
  return { ...rf, powerErrorDb: powerErrorDb(band.forwardW, band.ratedW), frequencyErrorHz, frequencyErrorPpm };
}

/**
 * Every figure of the sheet and every line checked against `limits`; the sheet passes only when
 * every line passes. Throws CalcInputError (with the field's path) for input that cannot be a
 * measurement: negative or zero power, reflected at or above forward, no bands.
 */
export function evaluateTestSheet(input: TestSheetInput, limits: TestLimits): TestSheetResult {
  requireBound('supplyVoltageV', input.supplyVoltageV, SUPPLY_V_BOUND);
  requireBound('receiveCurrentA', input.receiveCurrentA, RECEIVE_A_BOUND);
  if (!Array.isArray(input.bands) || input.bands.length === 0) throw new CalcInputError('bands', 'Test at least one band.');
  if (input.bands.length > MAX_BANDS) throw new CalcInputError('bands', `Test at most ${MAX_BANDS} bands on one sheet.`);

  const checks: SheetCheck[] = [];
  const { supplyMinV, supplyMaxV, receiveCurrentMaxA, swrMax, powerErrorMinDb, powerErrorMaxDb, frequencyErrorMaxPpm } = limits;
  const v = input.supplyVoltageV;
  checks.push({
    line: 'Supply voltage at the radio',
    field: 'supplyVoltageV',
    shown: `${fixed(v, 2)} V`,
    limit: `${fixed(supplyMinV.value, 2)} V to ${fixed(supplyMaxV.value, 2)} V`,
    source: supplyMinV.source === supplyMaxV.source ? supplyMinV.source : `${supplyMinV.source} ${supplyMaxV.source}`,
    passed: v >= supplyMinV.value - EPS && v <= supplyMaxV.value + EPS,
  });
  checks.push({
    line: 'Receive current',
    field: 'receiveCurrentA',
    shown: `${fixed(input.receiveCurrentA, 2)} A`,
    limit: `at most ${fixed(receiveCurrentMaxA.value, 2)} A`,
    source: receiveCurrentMaxA.source,
    passed: input.receiveCurrentA <= receiveCurrentMaxA.value + EPS,
  });

  const bands = input.bands.map((band, i) => {
    const fig = bandFigures(band, i);
    const name = band.band;
    checks.push({
      line: `${name}: SWR`,
      field: `bands.${i}.reflectedW`,
      shown: `${fixed(fig.swr, 2)}:1`,
      limit: `at most ${fixed(swrMax.value, 2)}:1`,
      source: swrMax.source,
      passed: fig.swr <= swrMax.value + EPS,
    });
    checks.push({
      line: `${name}: output against rating`,
      field: `bands.${i}.forwardW`,
      shown: `${signed(fig.powerErrorDb, 2)} dB`,
      limit: `${signed(powerErrorMinDb.value, 2)} dB to ${signed(powerErrorMaxDb.value, 2)} dB`,
      source: powerErrorMinDb.source === powerErrorMaxDb.source ? powerErrorMinDb.source : `${powerErrorMinDb.source} ${powerErrorMaxDb.source}`,
      passed: fig.powerErrorDb >= powerErrorMinDb.value - EPS && fig.powerErrorDb <= powerErrorMaxDb.value + EPS,
    });
    if (fig.frequencyErrorPpm !== null) {
      checks.push({
        line: `${name}: frequency error`,
        field: `bands.${i}.measuredHz`,
        shown: `${signed(fig.frequencyErrorHz!, 0)} Hz (${signed(fig.frequencyErrorPpm, 2)} ppm)`,
        limit: `within ±${fixed(frequencyErrorMaxPpm.value, 2)} ppm`,
        source: frequencyErrorMaxPpm.source,
        passed: Math.abs(fig.frequencyErrorPpm) <= frequencyErrorMaxPpm.value + EPS,
      });
    }
    return fig;
  });
  return { bands, checks, passed: checks.every((c) => c.passed) };
}

/** Why a set of limits cannot stand together (null when it can): e.g. a lowest supply above the highest. */
export function limitsConflict(limits: TestLimits): { key: TestLimitKey; message: string } | null {
  if (limits.supplyMinV.value >= limits.supplyMaxV.value) {
    return { key: 'supplyMinV', message: 'The lowest supply voltage must be below the highest.' };
  }
  return null;
}
