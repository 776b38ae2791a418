// RF figures for the test sheet, from forward and reflected power measured into a dummy load.
//
// Sources: the definitions as given in The ARRL Handbook for Radio Communications (chapter
// "Transmission Lines"; the same formulas appear in every edition we know of, edition not
// checked here) and in IEEE Std 100 (dictionary) for return loss and mismatch loss:
//   |Γ| = sqrt(Pr / Pf)                       reflection coefficient (magnitude)
//   SWR = (1 + |Γ|) / (1 − |Γ|)
//   return loss   RL = −20 log10 |Γ|   dB    (positive for a passive load)
//   mismatch loss ML = −10 log10 (1 − |Γ|²) dB
//   P(dBm) = 10 log10 (P / 1 mW)
//
// Decisions (documented in api/API.md, calc section):
// - No reflected power (Pr = 0): Γ = 0, SWR 1:1, mismatch loss 0 dB, and return loss is unbounded:
//   `returnLossDb` is null.
// - Pr > Pf cannot happen into a passive load: refused (the meter is reversed or misread).
// - Pr = Pf is total reflection (SWR infinite): refused with "total reflection: check the load".

import { CalcInputError, requireFinite } from './input-error';

export interface RfFigures {
  reflectionCoefficient: number;
  swr: number;
  /** null when no power is reflected (return loss is unbounded). */
  returnLossDb: number | null;
  mismatchLossDb: number;
  forwardDbm: number;
}

export function reflectionCoefficient(forwardW: number, reflectedW: number): number {
  requireFinite('forwardW', forwardW, { above: 0 });
  requireFinite('reflectedW', reflectedW, { min: 0 });
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

export function wattsToDbm(watts: number): number {
  requireFinite('watts', watts, { above: 0 });
  return 10 * Math.log10(watts * 1000);
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
    returnLossDb: returnLossDbFromGamma(gamma),
    mismatchLossDb: mismatchLossDbFromGamma(gamma),
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
