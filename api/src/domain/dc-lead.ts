// Voltage drop along a transceiver's DC lead (both conductors: out and back), whether the voltage
// left at the radio is inside its supply tolerance, whether the lead can carry the current without
// overheating, and a fuse for it. Used at diagnosis ("low voltage at the radio") and on the Bench
// calculators page. A lead can pass the voltage check and still overheat (25 A through AWG 18 over
// 0.5 m drops little but is far past that cord's ampacity), so both answers are given.
//
// Resistance per metre, copper, as published:
// - AWG: NFPA 70 (NEC) Chapter 9 Table 8 "Conductor Properties", DC resistance at 75 °C, uncoated
//   copper, stranded (7-strand) conductors, ohm/kFT, converted to ohm/m by ÷ 304.8 (1 kft = 304.8 m).
//   Values as reproduced by the 2017–2023 editions (looked up in a published reproduction of the
//   table, not in the NFPA original).
// - mm²: IEC 60228 (2004) Table 3, class 5 (flexible) conductors, plain annealed copper, maximum
//   resistance at 20 °C, Ω/km ÷ 1000. Class 5 because DC leads are flexible cords.
// The two tables are at different temperatures, so both are brought to one conductor temperature
// (20 °C unless the caller gives another) with copper's published temperature coefficient:
//   R(T) = R(20 °C) × (1 + α20 (T − 20)),  α20 = 0.00393 per K
// (IEC 60028 (1925), International Standard of Resistance for Copper: α20 = 0.00393 /K for annealed
// copper of 100 % IACS; from memory). The NEC table's own note gives the same line as
// R2 = R1 [1 + α (T2 − 75)] with α = 0.00323 at 75 °C (= 0.00393 / (1 + 0.00393 × 55) to 0.01 %).
//
// Ampacity (what the cord may carry continuously, 30 °C ambient, not corrected for temperature):
// - AWG: NEC Table 400.5(A)(1), flexible cords, column B (two current-carrying conductors, as in a
//   DC lead): AWG 18 10 A, 16 13 A, 14 18 A, 12 25 A (checked against a published reproduction of
//   the table in an appliance standard's abbreviated copy), AWG 10 30 A (from memory).
// - mm²: IEC 60335-1 (edition 5, 2010) Table 11, the rated current up to which a supply cord of
//   that cross-section is allowed: 1.5 mm² 16 A, 2.5 mm² 25 A, 4 mm² 32 A, 6 mm² 40 A (from memory).
//
// Fuse: the smallest standard rating at or above 125 % of the current (the 125 % margin for
// continuous loads follows NEC 210.20(A); from memory; for DC leads it is common practice, no
// published source), from the blade fuse ratings of SAE J1284 (1–40 A) and the larger MAXI (SAE
// J1888) and ANL ratings (50–150 A); ratings from memory. The fuse protects the lead only if it is
// at or below the lead's ampacity: `fuseProtectsLead` says whether it is.
//
// Tolerance: 13.8 V nominal ± 15 % (11.73–15.87 V) is the supply range printed in the
// specifications of many 100 W HF transceivers. Common practice, no published standard; the
// figure is from memory. Callers can give their own nominal and band.

import { CalcInputError, requireBound, type InputBound } from './input-error';

export const AWG_GAUGES = [10, 12, 14, 16, 18] as const;
export type AwgGauge = (typeof AWG_GAUGES)[number];

export const MM2_GAUGES = [1.5, 2.5, 4, 6] as const;
export type Mm2Gauge = (typeof MM2_GAUGES)[number];

export type LeadGauge = { awg: AwgGauge } | { mm2: Mm2Gauge };

/** NEC Chapter 9 Table 8: uncoated copper, stranded, DC at 75 °C, ohm per 1000 ft. */
export const NEC_TABLE8_STRANDED_OHM_PER_KFT: Record<AwgGauge, number> = {
  18: 7.95,
  16: 4.99,
  14: 3.14,
  12: 1.98,
  10: 1.24,
};

/** IEC 60228 Table 3, class 5, plain copper, maximum at 20 °C, ohm per km. */
export const IEC60228_CLASS5_OHM_PER_KM: Record<`${Mm2Gauge}`, number> = {
  '1.5': 13.3,
  '2.5': 7.98,
  '4': 4.95,
  '6': 3.3,
};

export const METRES_PER_KFT = 304.8;

/** Temperature of each published table, °C. */
export const NEC_TABLE8_C = 75;
export const IEC60228_C = 20;
/** Copper's temperature coefficient of resistance at 20 °C, per K (IEC 60028; from memory). */
export const COPPER_ALPHA_20 = 0.00393;
/** Conductor temperature the answer uses unless told otherwise, °C. */
export const DEFAULT_CONDUCTOR_C = 20;

/** NEC Table 400.5(A)(1), column B (two current-carrying conductors), amperes. */
export const NEC_TABLE400_5_COLUMN_B_A: Record<AwgGauge, number> = { 18: 10, 16: 13, 14: 18, 12: 25, 10: 30 };
/** IEC 60335-1 Table 11: highest rated current for a supply cord of this cross-section, amperes. */
export const IEC60335_TABLE11_A: Record<`${Mm2Gauge}`, number> = { '1.5': 16, '2.5': 25, '4': 32, '6': 40 };

/** Blade (SAE J1284), MAXI (SAE J1888) and ANL fuse ratings, amperes (from memory). */
export const FUSE_RATINGS_A = [1, 2, 3, 4, 5, 7.5, 10, 15, 20, 25, 30, 35, 40, 50, 60, 70, 80, 100, 120, 150] as const;
/** A fuse carries at least this multiple of the continuous current (NEC 210.20(A); common practice for DC leads). */
export const FUSE_MARGIN = 1.25;

export const NOMINAL_SUPPLY_V = 13.8;
/** ±15 %: common practice, no published standard (from memory of transceiver specifications). */
export const DEFAULT_TOLERANCE_PCT = 15;

export const CURRENT_A_BOUND: InputBound = { min: 0, max: 100, unit: 'A', why: 'above any station on a 12 V lead' };
export const LENGTH_M_BOUND: InputBound = { min: 0, max: 100, unit: 'm', why: 'a DC lead longer than 100 m is not a bench lead' };
export const SUPPLY_V_BOUND: InputBound = { min: 0, max: 60, aboveMin: true, unit: 'V', why: 'this calculator is for low-voltage DC leads' };
export const NOMINAL_V_BOUND: InputBound = { min: 0, max: 60, aboveMin: true, unit: 'V', why: 'this calculator is for low-voltage DC leads' };
export const TOLERANCE_PCT_BOUND: InputBound = { min: 0, max: 50, unit: '%' };
export const CONDUCTOR_C_BOUND: InputBound = { min: -20, max: 90, unit: '°C', why: 'flexible cords are rated 60–90 °C' };

export function isAwgGauge(value: number): value is AwgGauge {
  return (AWG_GAUGES as readonly number[]).includes(value);
}

export function isMm2Gauge(value: number): value is Mm2Gauge {
  return (MM2_GAUGES as readonly number[]).includes(value);
}

export function gaugeLabel(gauge: LeadGauge): string {
  return 'awg' in gauge ? `AWG ${gauge.awg}` : `${gauge.mm2} mm²`;
}

/** Copper resistance at `toC` from a published value at `fromC`, through 20 °C with α20. */
export function copperResistanceAt(ohms: number, fromC: number, toC: number): number {
  return (ohms * (1 + COPPER_ALPHA_20 * (toC - 20))) / (1 + COPPER_ALPHA_20 * (fromC - 20));
}

/** Copper resistance of one conductor, ohm per metre at `conductorC`, with the table it comes from. */
export function copperOhmPerMetre(gauge: LeadGauge, conductorC = DEFAULT_CONDUCTOR_C): { ohmPerM: number; source: string } {
  requireBound('conductorC', conductorC, CONDUCTOR_C_BOUND);
  const at = `corrected to ${conductorC} °C with copper's α20 = ${COPPER_ALPHA_20}/K (IEC 60028)`;
  if ('awg' in gauge) {
    if (!isAwgGauge(gauge.awg)) throw new CalcInputError('awg', `Gauge must be AWG ${AWG_GAUGES.join(', ')}.`);
    return {
      ohmPerM: copperResistanceAt(NEC_TABLE8_STRANDED_OHM_PER_KFT[gauge.awg] / METRES_PER_KFT, NEC_TABLE8_C, conductorC),
      source: `NEC Chapter 9 Table 8, stranded uncoated copper, published at 75 °C, ${at}`,
    };
  }
  if (!isMm2Gauge(gauge.mm2)) throw new CalcInputError('mm2', `Cross-section must be ${MM2_GAUGES.join(', ')} mm².`);
  return {
    ohmPerM: copperResistanceAt(IEC60228_CLASS5_OHM_PER_KM[`${gauge.mm2}`] / 1000, IEC60228_C, conductorC),
    source: `IEC 60228 Table 3 class 5 plain copper, maximum, published at 20 °C, ${at}`,
  };
}

/** What the lead may carry continuously, with the table it comes from. */
export function leadAmpacity(gauge: LeadGauge): { ampacityA: number; ampacitySource: string } {
  if ('awg' in gauge) {
    if (!isAwgGauge(gauge.awg)) throw new CalcInputError('awg', `Gauge must be AWG ${AWG_GAUGES.join(', ')}.`);
    return { ampacityA: NEC_TABLE400_5_COLUMN_B_A[gauge.awg], ampacitySource: 'NEC Table 400.5(A)(1), flexible cord, two current-carrying conductors, 30 °C ambient' };
  }
  if (!isMm2Gauge(gauge.mm2)) throw new CalcInputError('mm2', `Cross-section must be ${MM2_GAUGES.join(', ')} mm².`);
  return { ampacityA: IEC60335_TABLE11_A[`${gauge.mm2}`], ampacitySource: 'IEC 60335-1 Table 11, supply cord cross-section for a rated current' };
}

/** The smallest standard fuse rating at or above 125 % of the current. */
export function suggestedFuseA(currentA: number): number {
  requireBound('currentA', currentA, CURRENT_A_BOUND);
  const needed = currentA * FUSE_MARGIN;
  const rating = FUSE_RATINGS_A.find((r) => r >= needed);
  if (rating === undefined) throw new CalcInputError('currentA', `No standard fuse up to ${FUSE_RATINGS_A[FUSE_RATINGS_A.length - 1]} A carries this current with margin.`);
  return rating;
}

export interface DcLeadInput {
  currentA: number;
  /** One-way length of the lead, metres (the drop counts both conductors). */
  lengthM: number;
  gauge: LeadGauge;
  supplyV: number;
  nominalV?: number;
  /** Half-width of the tolerance band, percent of nominal. */
  tolerancePct?: number;
  /** Conductor temperature for the resistance, °C (default 20 °C). */
  conductorC?: number;
}

export interface DcLeadDrop {
  gauge: string;
  source: string;
  /** The conductor temperature the resistance is given at, °C. */
  conductorC: number;
  ohmPerM: number;
  /** Both conductors: R/m × 2 × length. */
  leadResistanceOhm: number;
  dropV: number;
  voltageAtRadioV: number;
  nominalV: number;
  tolerancePct: number;
  minV: number;
  maxV: number;
  withinTolerance: boolean;
  ampacityA: number;
  ampacitySource: string;
  /** currentA ≤ ampacityA. */
  withinAmpacity: boolean;
  /** Smallest standard rating at or above 125 % of the current. */
  fuseA: number;
  /** fuseA ≤ ampacityA: the fuse blows before the lead overheats. */
  fuseProtectsLead: boolean;
}

export function dcLeadDrop(input: DcLeadInput): DcLeadDrop {
  const { currentA, lengthM, gauge, supplyV } = input;
  const nominalV = input.nominalV ?? NOMINAL_SUPPLY_V;
  const tolerancePct = input.tolerancePct ?? DEFAULT_TOLERANCE_PCT;
  const conductorC = input.conductorC ?? DEFAULT_CONDUCTOR_C;
  requireBound('currentA', currentA, CURRENT_A_BOUND);
  requireBound('lengthM', lengthM, LENGTH_M_BOUND);
  requireBound('supplyV', supplyV, SUPPLY_V_BOUND);
  requireBound('nominalV', nominalV, NOMINAL_V_BOUND);
  requireBound('tolerancePct', tolerancePct, TOLERANCE_PCT_BOUND);
  const { ohmPerM, source } = copperOhmPerMetre(gauge, conductorC);
  const { ampacityA, ampacitySource } = leadAmpacity(gauge);
  const leadResistanceOhm = ohmPerM * 2 * lengthM;
  const dropV = currentA * leadResistanceOhm;
  if (dropV >= supplyV) {
    throw new CalcInputError('currentA', 'At this current the lead would drop the whole supply: check the current, length and gauge.');
  }
  const voltageAtRadioV = supplyV - dropV;
  const minV = nominalV * (1 - tolerancePct / 100);
  const maxV = nominalV * (1 + tolerancePct / 100);
  const fuseA = suggestedFuseA(currentA);
  return {
    gauge: gaugeLabel(gauge),
    source,
    conductorC,
    ohmPerM,
    leadResistanceOhm,
    dropV,
    voltageAtRadioV,
    nominalV,
    tolerancePct,
    minV,
    maxV,
    withinTolerance: voltageAtRadioV >= minV && voltageAtRadioV <= maxV,
    ampacityA,
    ampacitySource,
    withinAmpacity: currentA <= ampacityA,
    fuseA,
    fuseProtectsLead: fuseA <= ampacityA,
  };
}
