// Signal levels: one level given in any of the bench's units, in all of them at an impedance, and
// the S-meter reading it should give. Used on the Bench calculators page, and meant for the test
// sheet's receive checks and diagnosis ("S-meter reads low").
//
// Conversions (definitions, no published table needed):
//   P(dBm) = 10 log10 (P / 1 W) + 30           P(dBW) = 10 log10 (P / 1 W) = dBm − 30
//   V_rms  = sqrt(P × R)                        (a sine wave's r.m.s. voltage across R)
//   dBµV   = 20 log10 (V_rms / 1 µV)            (at 50 Ω: dBµV = dBm + 106.99)
//
// S-meter: IARU Region 1 Technical Recommendation R.1 (adopted 1981; from memory, the text itself
// not checked here): S9 is −73 dBm (50 µV into 50 Ω) below 30 MHz and −93 dBm (5 µV into 50 Ω)
// above 30 MHz; one S-unit is 6 dB. Below S9 the reading is 9 + (dBm − S9 level) / 6 S-units
// (fractional, never below 0); above S9 it is "S9 plus dB": units 9 and overS9Db = dBm − S9 level.
// The recommendation gives the levels in dBm for a 50 Ω input, so the S-meter figures depend on
// the power, whatever impedance is given for the voltage figures.

import { CalcInputError, requireBound, requireFinite, type InputBound } from './input-error';

export const LEVEL_UNITS = ['dBm', 'dBW', 'dBuV', 'uV', 'mW', 'W'] as const;
export type LevelUnit = (typeof LEVEL_UNITS)[number];

export const S_METER_BANDS = ['hf', 'vhf'] as const;
/** 'hf': below 30 MHz; 'vhf': 30 MHz and above. */
export type SMeterBand = (typeof S_METER_BANDS)[number];

/** S9 in dBm for each band (IARU Region 1 Technical Recommendation R.1; from memory). */
export const S9_DBM: Record<SMeterBand, number> = { hf: -73, vhf: -93 };
/** dB per S-unit (same recommendation). */
export const DB_PER_S_UNIT = 6;

/** Impedance: 1 Ω to 10 kΩ (50 Ω and 75 Ω lines, 600 Ω audio; nothing on the bench is outside). */
export const LEVEL_OHMS_BOUND: InputBound = { min: 1, max: 10_000, unit: 'Ω' };
/**
 * Any level, once in dBm: −200 dBm (far below any receiver's noise floor) to +90 dBm (1 MW).
 * Keeps every figure an ordinary number in every unit.
 */
export const LEVEL_DBM_BOUND: InputBound = { min: -200, max: 90, unit: 'dBm', why: 'from far below any noise floor to 1 MW' };

export interface SMeterReading {
  /** S-units, fractional below S9; 9 at and above S9; never below 0. */
  units: number;
  /** dB above S9; 0 at or below S9. */
  overS9Db: number;
}

export interface SignalLevel {
  dBm: number;
  dBW: number;
  dBuV: number;
  uV: number;
  watts: number;
  ohms: number;
  band: SMeterBand;
  sMeter: SMeterReading;
}

/** The level in dBm of a value in `unit` at `ohms`. */
export function levelToDbm(value: number, unit: LevelUnit, ohms: number): number {
  requireFinite('value', value);
  requireBound('ohms', ohms, LEVEL_OHMS_BOUND);
  const positive = () => {
    if (value <= 0) throw new CalcInputError('value', `A level in ${unit === 'uV' ? 'µV' : unit} must be more than 0: there is no decibel figure for nothing.`);
  };
  switch (unit) {
    case 'dBm':
      return value;
    case 'dBW':
      return value + 30;
    case 'W':
      positive();
      return 10 * Math.log10(value) + 30;
    case 'mW':
      positive();
      return 10 * Math.log10(value);
    case 'uV':
      positive();
      // P = V² / R with V in volts: 10 log10 (V² / R) + 30 = 20 log10 V − 10 log10 R + 30.
      return 20 * Math.log10(value * 1e-6) - 10 * Math.log10(ohms) + 30;
    case 'dBuV':
      // V = 10^(dBµV / 20) µV, so dBm = dBµV − 120 − 10 log10 R + 30.
      return value - 120 - 10 * Math.log10(ohms) + 30;
    default:
      throw new CalcInputError('unit', `Unit must be one of ${LEVEL_UNITS.join(', ')}.`);
  }
}

/** The S-meter reading of a level in dBm (IARU Region 1 R.1 convention). */
export function sMeterReading(dBm: number, band: SMeterBand = 'hf'): SMeterReading {
  requireFinite('value', dBm);
  const s9 = S9_DBM[band];
  if (s9 === undefined) throw new CalcInputError('band', "Band must be 'hf' (below 30 MHz) or 'vhf' (30 MHz and above).");
  if (dBm >= s9) return { units: 9, overS9Db: dBm - s9 };
  return { units: Math.max(0, 9 + (dBm - s9) / DB_PER_S_UNIT), overS9Db: 0 };
}

/** One level in every unit at `ohms` (default 50 Ω), with its S-meter reading. */
export function signalLevel(value: number, unit: LevelUnit, ohms = 50, band: SMeterBand = 'hf'): SignalLevel {
  const dBm = levelToDbm(value, unit, ohms);
  if (!Number.isFinite(dBm) || dBm < LEVEL_DBM_BOUND.min || dBm > LEVEL_DBM_BOUND.max) {
    throw new CalcInputError('value', 'This level is outside what a bench meets: −200 dBm (far below any noise floor) to +90 dBm (1 MW).');
  }
  const watts = 10 ** ((dBm - 30) / 10);
  const volts = Math.sqrt(watts * ohms);
  return {
    dBm,
    dBW: dBm - 30,
    dBuV: 20 * Math.log10(volts) + 120,
    uV: volts * 1e6,
    watts,
    ohms,
    band,
    sMeter: sMeterReading(dBm, band),
  };
}
