// Voltage drop along a transceiver's DC lead (both conductors: out and back), and whether the
// voltage left at the radio is inside its supply tolerance. Used at diagnosis ("low voltage at
// the radio") and on the Bench calculators page.
//
// Resistance per metre, copper:
// - AWG: NFPA 70 (NEC) Chapter 9 Table 8 "Conductor Properties", DC resistance at 75 °C, uncoated
//   copper, stranded (7-strand) conductors, ohm/kFT, converted to ohm/m by ÷ 304.8 (1 kft = 304.8 m).
//   Values as reproduced by the 2017–2023 editions (looked up in a published reproduction of the
//   table, not in the NFPA original).
// - mm²: IEC 60228 (2004) Table 3, class 5 (flexible) conductors, plain annealed copper, maximum
//   resistance at 20 °C, Ω/km ÷ 1000. Class 5 because DC leads are flexible cords.
// The two tables are at different temperatures (75 °C against 20 °C): copper at 75 °C has about
// 1.2 times the resistance it has at 20 °C, so AWG figures are the more pessimistic of the two.
//
// Tolerance: 13.8 V nominal ± 15 % (11.73–15.87 V) is the supply range printed in the
// specifications of many 100 W HF transceivers. Common practice, no published standard; the
// figure is from memory. Callers can give their own nominal and band.

import { CalcInputError, requireFinite } from './input-error';

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

export const NOMINAL_SUPPLY_V = 13.8;
/** ±15 %: common practice, no published standard (from memory of transceiver specifications). */
export const DEFAULT_TOLERANCE_PCT = 15;

export function isAwgGauge(value: number): value is AwgGauge {
  return (AWG_GAUGES as readonly number[]).includes(value);
}

export function isMm2Gauge(value: number): value is Mm2Gauge {
  return (MM2_GAUGES as readonly number[]).includes(value);
}

export function gaugeLabel(gauge: LeadGauge): string {
  return 'awg' in gauge ? `AWG ${gauge.awg}` : `${gauge.mm2} mm²`;
}

/** Copper resistance of one conductor, ohm per metre, with the table it comes from. */
export function copperOhmPerMetre(gauge: LeadGauge): { ohmPerM: number; source: string } {
  if ('awg' in gauge) {
    if (!isAwgGauge(gauge.awg)) throw new CalcInputError('awg', `Gauge must be AWG ${AWG_GAUGES.join(', ')}.`);
    return {
      ohmPerM: NEC_TABLE8_STRANDED_OHM_PER_KFT[gauge.awg] / METRES_PER_KFT,
      source: 'NEC Chapter 9 Table 8, stranded uncoated copper, 75 °C',
    };
  }
  if (!isMm2Gauge(gauge.mm2)) throw new CalcInputError('mm2', `Cross-section must be ${MM2_GAUGES.join(', ')} mm².`);
  return {
    ohmPerM: IEC60228_CLASS5_OHM_PER_KM[`${gauge.mm2}`] / 1000,
    source: 'IEC 60228 class 5 plain copper, maximum at 20 °C',
  };
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
}

export interface DcLeadDrop {
  gauge: string;
  source: string;
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
}

export function dcLeadDrop(input: DcLeadInput): DcLeadDrop {
  const { currentA, lengthM, gauge, supplyV } = input;
  const nominalV = input.nominalV ?? NOMINAL_SUPPLY_V;
  const tolerancePct = input.tolerancePct ?? DEFAULT_TOLERANCE_PCT;
  requireFinite('currentA', currentA, { min: 0 });
  requireFinite('lengthM', lengthM, { min: 0 });
  requireFinite('supplyV', supplyV, { above: 0 });
  requireFinite('nominalV', nominalV, { above: 0 });
  requireFinite('tolerancePct', tolerancePct, { min: 0 });
  if (tolerancePct >= 100) throw new CalcInputError('tolerancePct', 'The tolerance must be below 100 %.');
  const { ohmPerM, source } = copperOhmPerMetre(gauge);
  const leadResistanceOhm = ohmPerM * 2 * lengthM;
  const dropV = currentA * leadResistanceOhm;
  if (dropV >= supplyV) {
    throw new CalcInputError('currentA', 'At this current the lead would drop the whole supply: check the current, length and gauge.');
  }
  const voltageAtRadioV = supplyV - dropV;
  const minV = nominalV * (1 - tolerancePct / 100);
  const maxV = nominalV * (1 + tolerancePct / 100);
  return {
    gauge: gaugeLabel(gauge),
    source,
    ohmPerM,
    leadResistanceOhm,
    dropV,
    voltageAtRadioV,
    nominalV,
    tolerancePct,
    minV,
    maxV,
    withinTolerance: voltageAtRadioV >= minV && voltageAtRadioV <= maxV,
  };
}
