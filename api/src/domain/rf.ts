// RF figures for the test sheet, from forward and reflected power measured into a dummy load.
//
// Sources (from memory; edition and page not checked here): the definitions in the chapter
// "Transmission Lines" of The ARRL Handbook for Radio Communications, and the entries "return
// loss" and "mismatch loss" of IEEE Std 100, The Authoritative Dictionary of IEEE Standards Terms
// (7th edition, 2000):
//   |Γ| = sqrt(Pr / Pf)                       reflection coefficient (magnitude)
//   SWR = (1 + |Γ|) / (1 − |Γ|)
//   return loss   RL = 10 log10 (Pf / Pr) = −20 log10 |Γ|   dB    (positive for a passive load)
//   mismatch loss ML = −10 log10 (1 − |Γ|²) = −10 log10 (1 − Pr/Pf)  dB
//   P(dBm) = 10 log10 (P / 1 W) + 30          (decibels relative to 1 mW, by definition)
// Return loss is computed from the two powers, not from |Γ|: for a very small reflected power
// |Γ|² can underflow to 0 while Pf / Pr is still an ordinary number, and a reflected power above
// zero must always give a finite return loss.
//
// Decisions (documented in api/API.md, calc section):
// - No reflected power (Pr exactly 0): Γ = 0, SWR 1:1, mismatch loss 0 dB, and return loss is
//   unbounded: `returnLossDb` is null. That is the only case where it is null.
// - Pr > Pf cannot happen into a passive load: refused (the meter is reversed or misread).
// - Pr = Pf is total reflection (SWR infinite): refused with "total reflection: check the load".
// - Powers above 10 kW are refused: no amateur bench measures more (the highest licence limits
//   are a few kW), and the bound keeps every figure an ordinary number.

import { CalcInputError, requireBound, requireFinite, type InputBound } from './input-error';

/** Forward power: more than 0 W, at most 10 kW. */
export const FORWARD_W_BOUND: InputBound = { min: 0, max: 10_000, aboveMin: true, unit: 'W', why: '10 kW, above any amateur station' };
/** Reflected power: 0 W to 10 kW (and never above the forward power). */
export const REFLECTED_W_BOUND: InputBound = { min: 0, max: 10_000, unit: 'W', why: '10 kW, above any amateur station' };

export interface RfFigures {
  reflectionCoefficient: number;
  swr: number;
  /** null only when the reflected power is exactly 0 (return loss is unbounded); finite otherwise. */
  returnLossDb: number | null;
  mismatchLossDb: number;
  forwardDbm: number;
}

export function reflectionCoefficient(forwardW: number, reflectedW: number): number {
  requireBound('forwardW', forwardW, FORWARD_W_BOUND);
  requireBound('reflectedW', reflectedW, REFLECTED_W_BOUND);
  if (reflectedW > forwardW) {
    throw new CalcInputError('reflectedW', 'Reflected power cannot be above forward power: check the meter direction.');
  }
  if (reflectedW === forwardW) {
    throw new CalcInputError('reflectedW', 'Total reflection: check the load (open or shorted line, or no dummy load).');
  }
  return Math.sqrt(reflectedW / forwardW);
}

export function swrFromGamma(gamma: number): number {
  return (1 + gamma) / (1 - gamma);
}

/** Return loss in dB; null for Γ = 0 (unbounded). */
export function returnLossDbFromGamma(gamma: number): number | null {
  return gamma === 0 ? null : -20 * Math.log10(gamma);
}

export function mismatchLossDbFromGamma(gamma: number): number {
  // 0 − 0 would give −0: normalise so that a perfect match reads 0 dB.
  return gamma === 0 ? 0 : -10 * Math.log10(1 - gamma * gamma);
}

/** SWR back to |Γ| = (SWR − 1) / (SWR + 1), for handbook tables that start from SWR. */
export function gammaFromSwr(swr: number): number {
  requireFinite('swr', swr, { min: 1 });
  return (swr - 1) / (swr + 1);
}

/** P(dBm) = 10 log10 (P / 1 W) + 30: no multiplication first, so no overflow near the top of the range. */
export function wattsToDbm(watts: number): number {
  requireFinite('watts', watts, { above: 0 });
  return 10 * Math.log10(watts) + 30;
}

/** Return loss from the two powers, 10 log10 Pf − 10 log10 Pr: finite for every Pr > 0; null for Pr = 0. */
export function returnLossDbFromPowers(forwardW: number, reflectedW: number): number | null {
  requireFinite('forwardW', forwardW, { above: 0 });
  requireFinite('reflectedW', reflectedW, { min: 0 });
  return reflectedW === 0 ? null : 10 * Math.log10(forwardW) - 10 * Math.log10(reflectedW);
}

/** Mismatch loss from the two powers, −10 log10 (1 − Pr/Pf), through log1p so a tiny ratio stays exact. */
export function mismatchLossDbFromPowers(forwardW: number, reflectedW: number): number {
  const ratio = reflectedW / forwardW;
  return ratio === 0 ? 0 : (-10 / Math.LN10) * Math.log1p(-ratio);
}

export function dbmToWatts(dbm: number): number {
  requireFinite('dbm', dbm);
  return 10 ** (dbm / 10) / 1000;
}

/** All figures of the test sheet's RF line. */
export function rfFigures(forwardW: number, reflectedW: number): RfFigures {
  const gamma = reflectionCoefficient(forwardW, reflectedW);
  return {
    reflectionCoefficient: gamma,
    swr: swrFromGamma(gamma),
    returnLossDb: returnLossDbFromPowers(forwardW, reflectedW),
    mismatchLossDb: mismatchLossDbFromPowers(forwardW, reflectedW),
    forwardDbm: wattsToDbm(forwardW),
  };
}

/**
 * Power measured against the radio's rating, in dB: 10 log10 (measured / rated).
 * Negative when the radio makes less than its rating (e.g. 90 W from a 100 W radio: −0.46 dB).
 */
export function powerErrorDb(measuredW: number, ratedW: number): number {
  requireFinite('measuredW', measuredW, { above: 0 });
  requireFinite('ratedW', ratedW, { above: 0 });
  return 10 * Math.log10(measuredW / ratedW);
}

export interface FrequencyError {
  /** measured − nominal, in Hz (positive: the radio is high). */
  errorHz: number;
  /** errorHz / nominal × 10⁶. */
  errorPpm: number;
}

/** Frequency error against the nominal (dialled) frequency, in Hz and parts per million. */
export function frequencyError(measuredHz: number, nominalHz: number): FrequencyError {
  requireFinite('measuredHz', measuredHz, { above: 0 });
  requireFinite('nominalHz', nominalHz, { above: 0 });
  const errorHz = measuredHz - nominalHz;
  return { errorHz, errorPpm: (errorHz / nominalHz) * 1e6 };
}
