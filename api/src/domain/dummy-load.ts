// Dummy-load voltages: what a scope across the load should show for a given power, so a technician
// can check a wattmeter against the scope on the test sheet.
//
// Source: Ohm's law and the r.m.s. value of a sine wave (definitions; any circuits text):
//   V_rms = sqrt(P × R)     V_peak = V_rms × √2     V_pp = 2 × V_peak     I_rms = sqrt(P / R)
// Valid for an unmodulated carrier (CW, or FM) into a resistive load; with SSB the scope shows the
// peak envelope and a thermal wattmeter reads the average.

import { requireBound, type InputBound } from './input-error';

/** Power into the load: more than 0 W, at most 10 kW (above any amateur station). */
export const DUMMY_LOAD_W_BOUND: InputBound = { min: 0, max: 10_000, aboveMin: true, unit: 'W', why: '10 kW, above any amateur station' };
/** Load resistance: 1 Ω to 1 kΩ (bench loads are 50 Ω, sometimes 75 Ω). */
export const DUMMY_LOAD_OHMS_BOUND: InputBound = { min: 1, max: 1000, unit: 'Ω' };

export interface DummyLoadFigures {
  vRms: number;
  vPeak: number;
  vPeakToPeak: number;
  amps: number;
}

export function dummyLoadFigures(watts: number, ohms = 50): DummyLoadFigures {
  requireBound('watts', watts, DUMMY_LOAD_W_BOUND);
  requireBound('ohms', ohms, DUMMY_LOAD_OHMS_BOUND);
  const vRms = Math.sqrt(watts * ohms);
  const vPeak = vRms * Math.SQRT2;
  return { vRms, vPeak, vPeakToPeak: 2 * vPeak, amps: Math.sqrt(watts / ohms) };
}
