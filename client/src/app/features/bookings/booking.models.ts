import { BookingPurpose } from '@contracts/bookings';
import { ListQuery } from '../../core/http/api-error';

// What the server sends is the API's own (api/src/contracts/bookings.ts); bodies and queries are the client's.
export { BOOKING_PURPOSES, BOOKING_PURPOSE_LABELS } from '@contracts/bookings';
export type {
  Bench,
  BookingPurpose,
  BookingRow,
  BookingSettings,
  CalendarFeedLink,
  DaySchedule,
  DaySlots,
  ScheduleEntry,
  SlotStatus,
} from '@contracts/bookings';

/** Body of `POST /api/bookings`. */
export interface BookingBody {
  benchId: number;
  start: string;
  slotCount: number;
  purpose: BookingPurpose;
  ticketTag?: string | null;
  note?: string | null;
}

export type BookingSort = 'startsAt' | 'createdAt' | 'bench';
export type BookingWhen = 'upcoming' | 'past' | 'all';

export interface BookingQuery extends ListQuery {
  sort?: BookingSort;
  when: BookingWhen;
}
