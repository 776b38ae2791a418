// Discharging a capacitor through a bleeder resistor: how long to a safe voltage, how much energy
// is stored, and the power the resistor takes at the first instant. For the filter capacitors of
// linear supplies and valve amplifiers, beside the mains / high-voltage caution.
//
// Source: the RC discharge law (any circuits text; definitions):
//   V(t) = V0 e^(−t / RC)   →   t = RC ln (V0 / V_safe)
//   stored energy E = ½ C V0²          power at the start P0 = V0² / R
// Safe voltage: 60 V by default. From memory: IEC 60204-1 (2016), clause 6.2.4, asks that residual
// voltage above 60 V be discharged to 60 V or less within 5 s of switching off, and 60 V d.c. is
// the upper limit of extra-low voltage in dry conditions. It is a default, not a promise of
// safety: measure before touching, and discharge to well below it.
// A capacitor already at or below the safe voltage needs no time: `seconds` is 0.

import { CalcInputError, requireBound, type InputBound } from './input-error';

export const DEFAULT_SAFE_VOLTS = 60;

/** Starting voltage: more than 0 V, at most 50 kV (above any amateur amplifier's plate supply). */
export const DISCHARGE_VOLTS_BOUND: InputBound = { min: 0, max: 50_000, aboveMin: true, unit: 'V', why: 'above any amplifier supply' };
/** Capacitance: more than 0 F, at most 10 F (a supercapacitor bank). */
export const DISCHARGE_FARADS_BOUND: InputBound = { min: 0, max: 10, aboveMin: true, unit: 'F' };
/** Bleeder: 1 Ω to 1 GΩ. */
export const DISCHARGE_OHMS_BOUND: InputBound = { min: 1, max: 1e9, unit: 'Ω' };
/** Safe voltage: more than 0 V, at most 1000 V. */
export const SAFE_VOLTS_BOUND: InputBound = { min: 0, max: 1000, aboveMin: true, unit: 'V' };

export interface Discharge {
  /** Time from V0 to the safe voltage through the resistor; 0 when V0 is already safe. */
  seconds: number;
  /** RC, seconds. */
  timeConstantS: number;
  /** ½ C V0², joules. */
  joules: number;
  /** V0² / R, watts, at the first instant. */
  initialWatts: number;
  safeVolts: number;
}

export function capacitorDischarge(volts: number, farads: number, ohms: number, safeVolts = DEFAULT_SAFE_VOLTS): Discharge {
  requireBound('volts', volts, DISCHARGE_VOLTS_BOUND);
  requireBound('farads', farads, DISCHARGE_FARADS_BOUND);
  requireBound('ohms', ohms, DISCHARGE_OHMS_BOUND);
  requireBound('safeVolts', safeVolts, SAFE_VOLTS_BOUND);
  const timeConstantS = ohms * farads;
  if (!Number.isFinite(timeConstantS)) throw new CalcInputError('ohms', 'This resistor and capacitor give no usable time: check both values.');
  return {
    seconds: volts > safeVolts ? timeConstantS * Math.log(volts / safeVolts) : 0,
    timeConstantS,
    joules: 0.5 * farads * volts * volts,
    initialWatts: (volts * volts) / ohms,
    safeVolts,
  };
}
