// Matched, symmetric resistive attenuator pads (pi and tee) for a line of impedance Z, the nearest
// E24 resistors and what they really give, and the power each resistor takes.
//
// Design equations, with K = 10^(A / 20) the voltage ratio of an A dB pad (from memory: the
// attenuator section of the "Test Equipment and Measurements" chapter of The ARRL Handbook, and
// Reference Data for Engineers, chapter "Attenuators"; editions not checked here. The tests
// check them by analysing the circuit, which needs no source):
//   pi:   shunt  R1 = Z (K + 1) / (K − 1)     series R2 = Z (K² − 1) / (2K)
//   tee:  series R1 = Z (K − 1) / (K + 1)     shunt  R2 = Z 2K / (K² − 1)
// (a pi pad has two shunt resistors and one series resistor; a tee pad two series arms and one
// shunt resistor; `shuntOhms` and `seriesOhms` are one of each.)
//
// With E24 values the pad is no longer exact. It is analysed as built, between a source and a load
// of Z: `attenuationDb` is the insertion loss (load voltage without the pad over load voltage with
// it, in dB) and `inputOhms` the resistance the source sees with the load connected.
//
// Power: with `inputW` into a matched pad, each resistor's dissipation by Ohm's law. The first
// resistor (the input shunt of a pi, the input series arm of a tee) is named because it takes the
// full input voltage or current; in a pi pad of low attenuation the series resistor takes more,
// so every resistor's figure is given. Choosing a rating with margin (commonly twice the
// dissipation) is common practice, no published source.

import { CalcInputError, requireBound, type InputBound } from './input-error';
import { nearestE24 } from './e-series';

export const PAD_SHAPES = ['pi', 'tee'] as const;
export type PadShape = (typeof PAD_SHAPES)[number];

/**
 * Attenuation: 0.1 dB (below that the shunt resistors run into megohms and a pad makes no sense;
 * at 0 dB there is no pad at all) to 60 dB (one section; build more in a chain).
 */
export const PAD_DB_BOUND: InputBound = { min: 0.1, max: 60, unit: 'dB', why: 'one pad section; chain pads for more' };
export const PAD_OHMS_BOUND: InputBound = { min: 1, max: 1000, unit: 'Ω' };
/** Input power: more than 0 W, at most 10 kW. */
export const PAD_INPUT_W_BOUND: InputBound = { min: 0, max: 10_000, aboveMin: true, unit: 'W', why: '10 kW, above any amateur station' };

export interface PadAsBuilt {
  shuntOhms: number;
  seriesOhms: number;
  /** (E24 − exact) / exact × 100. */
  shuntErrorPct: number;
  seriesErrorPct: number;
  /** Insertion loss between source and load of Z, dB. */
  attenuationDb: number;
  /** What the source sees with the load connected, Ω. */
  inputOhms: number;
}

export interface PadPower {
  inputW: number;
  /** The resistor at the input: the shunt of a pi, the series arm of a tee. */
  firstResistorW: number;
  /** Pi: the series resistor. Tee: the shunt resistor. */
  middleResistorW: number;
  /** Pi: the output shunt. Tee: the output series arm. */
  lastResistorW: number;
}

export interface AttenuatorPad {
  shape: PadShape;
  db: number;
  ohms: number;
  shuntOhms: number;
  seriesOhms: number;
  e24: PadAsBuilt;
  power: PadPower;
}

/** Exact resistor values of a matched symmetric pad. */
export function padResistors(db: number, ohms: number, shape: PadShape): { shuntOhms: number; seriesOhms: number } {
  requireBound('db', db, PAD_DB_BOUND);
  requireBound('ohms', ohms, PAD_OHMS_BOUND);
  const k = 10 ** (db / 20);
  if (shape === 'pi') return { shuntOhms: (ohms * (k + 1)) / (k - 1), seriesOhms: (ohms * (k * k - 1)) / (2 * k) };
  if (shape === 'tee') return { seriesOhms: (ohms * (k - 1)) / (k + 1), shuntOhms: (ohms * 2 * k) / (k * k - 1) };
  throw new CalcInputError('shape', "Shape must be 'pi' or 'tee'.");
}

const parallel = (a: number, b: number) => (a * b) / (a + b);

/**
 * A pad of any two resistor values between a source and a load of `ohms`, by circuit analysis:
 * input resistance, and the fraction of the input voltage that reaches the load.
 */
export function analysePad(shape: PadShape, shuntOhms: number, seriesOhms: number, ohms: number): { inputOhms: number; voltageRatio: number } {
  if (shape === 'pi') {
    const tail = parallel(shuntOhms, ohms); // output shunt ∥ load
    const inputOhms = parallel(shuntOhms, seriesOhms + tail);
    return { inputOhms, voltageRatio: tail / (seriesOhms + tail) };
  }
  const tail = seriesOhms + ohms; // output arm + load
  const middle = parallel(shuntOhms, tail);
  const inputOhms = seriesOhms + middle;
  return { inputOhms, voltageRatio: (middle / inputOhms) * (ohms / tail) };
}

/** Insertion loss of a pad between a source and a load of `ohms`, dB. */
export function insertionLossDb(shape: PadShape, shuntOhms: number, seriesOhms: number, ohms: number): number {
  const { inputOhms, voltageRatio } = analysePad(shape, shuntOhms, seriesOhms, ohms);
  // Source EMF 1 V behind `ohms`. Without the pad the load sees 1/2 V; with it, the input sees
  // Zin / (Z + Zin) and the load that times the pad's voltage ratio.
  const withPad = (inputOhms / (ohms + inputOhms)) * voltageRatio;
  return 20 * Math.log10(0.5 / withPad);
}

export function attenuatorPad(db: number, ohms = 50, shape: PadShape = 'pi', inputW = 1): AttenuatorPad {
  const exact = padResistors(db, ohms, shape);
  requireBound('inputW', inputW, PAD_INPUT_W_BOUND);
  const shuntE24 = nearestE24(exact.shuntOhms);
  const seriesE24 = nearestE24(exact.seriesOhms);
  const built = analysePad(shape, shuntE24, seriesE24, ohms);

  // Matched pad: the input sees `ohms`, so Vin = sqrt(P Z) and Iin = sqrt(P / Z).
  const vIn = Math.sqrt(inputW * ohms);
  const vOut = vIn * 10 ** (-db / 20);
  let power: PadPower;
  if (shape === 'pi') {
    power = {
      inputW,
      firstResistorW: (vIn * vIn) / exact.shuntOhms,
      middleResistorW: ((vIn - vOut) * (vIn - vOut)) / exact.seriesOhms,
      lastResistorW: (vOut * vOut) / exact.shuntOhms,
    };
  } else {
    const iIn = vIn / ohms;
    const iOut = vOut / ohms;
    const vMiddle = vOut + iOut * exact.seriesOhms;
    power = {
      inputW,
      firstResistorW: iIn * iIn * exact.seriesOhms,
      middleResistorW: (vMiddle * vMiddle) / exact.shuntOhms,
      lastResistorW: iOut * iOut * exact.seriesOhms,
    };
  }

  return {
    shape,
    db,
    ohms,
    shuntOhms: exact.shuntOhms,
    seriesOhms: exact.seriesOhms,
    e24: {
      shuntOhms: shuntE24,
      seriesOhms: seriesE24,
      shuntErrorPct: ((shuntE24 - exact.shuntOhms) / exact.shuntOhms) * 100,
      seriesErrorPct: ((seriesE24 - exact.seriesOhms) / exact.seriesOhms) * 100,
      attenuationDb: insertionLossDb(shape, shuntE24, seriesE24, ohms),
      inputOhms: built.inputOhms,
    },
    power,
  };
}
