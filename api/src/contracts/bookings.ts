// The API's bench and booking shapes shared with the client (imported there as `@contracts/bookings`).
// Plain TypeScript: types and `as const` lists only, no framework or node imports.

export const INSTRUMENT_KINDS = [
  'regulated_supply',
  'dummy_load',
  'wattmeter',
  'swr_meter',
  'oscilloscope',
  'spectrum_analyser',
  'signal_generator',
  'multimeter',
  'soldering_station',
  'hot_air_station',
  'other',
] as const;
export type InstrumentKind = (typeof INSTRUMENT_KINDS)[number];

/** One instrument on a bench. A regulated supply carries its maximum current, a dummy load its power rating. */
export interface Instrument {
  kind: InstrumentKind;
  name: string;
  maxCurrentA?: number | null;
  powerRatingW?: number | null;
  note?: string | null;
}

/** `GET /api/benches` (a list, in name order). */
export interface Bench {
  id: number;
  name: string;
  location: string | null;
  instruments: Instrument[];
  outOfService: boolean;
  outOfServiceReason: string | null;
  /** ISO UTC; null while out of service means until further notice. */
  outOfServiceUntil: string | null;
}

export const RULE_KINDS = ['weekly', 'one_off', 'closure'] as const;
export type OpeningRuleKind = (typeof RULE_KINDS)[number];

/** `GET /api/benches/opening-rules`. Dates 'YYYY-MM-DD' and times 'HH:mm' are local to the club's time zone. */
export interface OpeningRule {
  id: number;
  kind: OpeningRuleKind;
  /** ISO weekday, 1 Monday .. 7 Sunday (weekly only). */
  weekday: number | null;
  startTime: string | null;
  endTime: string | null;
  /** weekly: first and last date (either may be null: open-ended); one_off: the day; closure: first and last day closed. */
  validFrom: string | null;
  validUntil: string | null;
  note: string | null;
}

/** `GET /api/benches/settings`: the club's booking settings. */
export interface BookingSettings {
  /** IANA time-zone name, e.g. 'Europe/London'. */
  timeZone: string;
  slotMinutes: number;
  maxOpenBookings: number;
  horizonDays: number;
  cancelCutoffHours: number;
}

export const BOOKING_PURPOSES = ['self_service', 'drop_off', 'collection'] as const;
export type BookingPurpose = (typeof BOOKING_PURPOSES)[number];
export const BOOKING_PURPOSE_LABELS: Record<BookingPurpose, string> = {
  self_service: 'Self-service work',
  drop_off: 'Drop-off',
  collection: 'Collection',
};

export const SLOT_STATUSES = ['free', 'taken', 'yours', 'past', 'out_of_service'] as const;
export type SlotStatus = (typeof SLOT_STATUSES)[number];

/** `GET /api/bookings/slots?date=`: each bench's slots on one local date. */
export interface DaySlots {
  date: string;
  timeZone: string;
  slotMinutes: number;
  sessions: { start: string; end: string; note: string | null }[];
  /** The next date after `date` with an opening session (within the booking horizon), or null. */
  nextSessionDate: string | null;
  benches: {
    bench: Bench;
    slots: { start: string; end: string; status: SlotStatus; bookingId?: number }[];
  }[];
}

export const BOOKING_STATUSES = ['booked', 'cancelled'] as const;
export type BookingStatus = (typeof BOOKING_STATUSES)[number];

/** A row of `GET /api/bookings` ("My bench slots") and the answer of the booking routes. */
export interface BookingRow {
  id: number;
  benchId: number;
  benchName: string;
  startsAt: string;
  endsAt: string;
  slotCount: number;
  purpose: BookingPurpose;
  ticketTag: string | null;
  note: string | null;
  status: BookingStatus;
  noShow: boolean;
  /** True while the member may still cancel (booked, before the cut-off). */
  cancellable: boolean;
  createdAt: string;
}

/** One line of "Tonight at the bench" (`GET /api/bookings/schedule?date=`). */
export interface ScheduleEntry extends BookingRow {
  memberName: string;
  memberCallSign: string | null;
}

export interface DaySchedule {
  date: string;
  timeZone: string;
  sessions: { start: string; end: string; note: string | null }[];
  entries: ScheduleEntry[];
}

/** `GET /api/bookings/calendar`: the member's private feed address, if one was made. */
export interface CalendarFeedLink {
  url: string | null;
  publicUrl: string;
}
