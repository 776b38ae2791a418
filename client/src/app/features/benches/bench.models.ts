import { Instrument, OpeningRuleKind } from '@contracts/bookings';

export { INSTRUMENT_KINDS, RULE_KINDS } from '@contracts/bookings';
export type { Bench, BookingSettings, Instrument, InstrumentKind, OpeningRule, OpeningRuleKind } from '@contracts/bookings';

/** Body of `POST /api/benches` (and, partly, `PATCH /api/benches/:benchId`). */
export interface BenchBody {
  name: string;
  location: string | null;
  instruments: Instrument[];
  outOfService: boolean;
  outOfServiceReason: string | null;
  outOfServiceUntil: string | null;
}

/** Body of `POST /api/benches/opening-rules`. */
export interface RuleBody {
  kind: OpeningRuleKind;
  weekday?: number | null;
  startTime?: string | null;
  endTime?: string | null;
  validFrom?: string | null;
  validUntil?: string | null;
  note?: string | null;
}

export const INSTRUMENT_LABELS: Record<Instrument['kind'], string> = {
  regulated_supply: 'Regulated supply',
  dummy_load: 'Dummy load',
  wattmeter: 'Wattmeter',
  swr_meter: 'SWR meter',
  oscilloscope: 'Oscilloscope',
  spectrum_analyser: 'Spectrum analyser',
  signal_generator: 'Signal generator',
  multimeter: 'Multimeter',
  soldering_station: 'Soldering station',
  hot_air_station: 'Hot-air station',
  other: 'Other',
};

export const WEEKDAYS = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'];

export const RULE_KIND_LABELS: Record<OpeningRuleKind, string> = {
  weekly: 'Weekly session',
  one_off: 'One-off session',
  closure: 'Closure',
};
