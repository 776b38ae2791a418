// Feed-line loss with SWR: a line that loses L dB when matched loses more when the load is not
// matched, because the reflected wave crosses the line again and is attenuated on the way back.
//
// The relation (The ARRL Antenna Book, chapter "Transmission Lines", total loss of a line with
// SWR at the load; the same equation is in The ARRL Handbook; from memory, edition not checked):
//   a = 10^(L / 10)                         matched-loss power ratio
//   |Γ| = (SWR − 1) / (SWR + 1)              at the load
//   total loss (dB) = 10 log10 [ (a² − |Γ|²) / (a (1 − |Γ|²)) ]
//   extra loss      = total − L
// and the SWR a meter at the transmitter end reads, from |Γ_in| = |Γ| / a:
//   SWR_in = (1 + |Γ_in|) / (1 − |Γ_in|)
//
// The matched loss of a length of coax at a frequency comes from the maker's own attenuation
// formula (coax.ts).

import { CalcInputError, requireBound, type InputBound } from './input-error';
import { coaxMatchedLossDb, type CoaxType } from './coax';

/** Matched loss: 0 dB (lossless) to 30 dB (a line losing more than 99.9 % of the power is no feed line). */
export const MATCHED_LOSS_DB_BOUND: InputBound = { min: 0, max: 30, unit: 'dB', why: 'a line losing more is no feed line' };
/** SWR at the load: 1 to 100 (beyond 100:1 the meter reading is noise). */
export const LOAD_SWR_BOUND: InputBound = { min: 1, max: 100, unit: '', why: 'beyond 100:1 no meter reads it' };

export interface LineLoss {
  matchedLossDb: number;
  swr: number;
  totalLossDb: number;
  extraLossDb: number;
  /** SWR at the transmitter end (lower than at the load on a lossy line). */
  swrAtInput: number;
  /** Share of the input power that reaches the load, 0–1. */
  efficiency: number;
}

export function lineLossWithSwr(matchedLossDb: number, swr: number): LineLoss {
  requireBound('matchedLossDb', matchedLossDb, MATCHED_LOSS_DB_BOUND);
  requireBound('swr', swr, LOAD_SWR_BOUND);
  const a = 10 ** (matchedLossDb / 10);
  const gamma = (swr - 1) / (swr + 1);
  const g2 = gamma * gamma;
  const totalLossDb = 10 * Math.log10((a * a - g2) / (a * (1 - g2)));
  const gammaIn = gamma / a;
  return {
    matchedLossDb,
    swr,
    totalLossDb,
    // Never a −0 or a −1e−16 from rounding when the load is matched.
    extraLossDb: Math.max(0, totalLossDb - matchedLossDb),
    swrAtInput: (1 + gammaIn) / (1 - gammaIn),
    efficiency: 10 ** (-totalLossDb / 10),
  };
}

export interface CoaxLineLoss extends LineLoss {
  cable: { type: CoaxType; name: string; source: string; lengthM: number; mhz: number; dbPer100m: number };
}

/** The same, with the matched loss taken from a coax type, a length and a frequency. */
export function coaxLineLoss(type: CoaxType, lengthM: number, mhz: number, swr: number): CoaxLineLoss {
  const coax = coaxMatchedLossDb(type, lengthM, mhz);
  if (coax.matchedLossDb > MATCHED_LOSS_DB_BOUND.max) {
    throw new CalcInputError('lengthM', `${coax.name} this long loses more than ${MATCHED_LOSS_DB_BOUND.max} dB at ${mhz} MHz: no feed line is that lossy. Check the length and frequency.`);
  }
  return { ...lineLossWithSwr(coax.matchedLossDb, swr), cable: { type, name: coax.name, source: coax.source, lengthM, mhz, dbPer100m: coax.dbPer100m } };
}
