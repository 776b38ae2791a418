import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { Page } from '@contracts/lists';
import { HANDLES_OWN_ERRORS, queryParams } from '../../core/http/api-error';
import {
  BookingBody,
  BookingQuery,
  BookingRow,
  BookingSettings,
  CalendarFeedLink,
  DaySchedule,
  DaySlots,
  ScheduleEntry,
} from './booking.models';

const OWN_ERRORS = { context: new HttpContext().set(HANDLES_OWN_ERRORS, true) };

/** The bench slot routes of the API. */
@Injectable({ providedIn: 'root' })
export class BookingApi {
  private readonly http = inject(HttpClient);

  settings(): Observable<BookingSettings> {
    return this.http.get<BookingSettings>('/api/benches/settings');
  }

  slots(date: string): Observable<DaySlots> {
    return this.http.get<DaySlots>('/api/bookings/slots', { params: { date } });
  }

  /** The booking form shows refusals (409 just taken, 422 limits) itself. */
  book(body: BookingBody): Observable<BookingRow> {
    return this.http.post<BookingRow>('/api/bookings', body, OWN_ERRORS);
  }

  mine(query: BookingQuery): Observable<Page<BookingRow>> {
    return this.http.get<Page<BookingRow>>('/api/bookings', { params: queryParams(query) });
  }

  cancel(id: number): Observable<BookingRow> {
    return this.http.post<BookingRow>(`/api/bookings/${id}/cancel`, {});
  }

  schedule(date: string): Observable<DaySchedule> {
    return this.http.get<DaySchedule>('/api/bookings/schedule', { params: { date } });
  }

  noShow(id: number, noShow: boolean): Observable<ScheduleEntry> {
    return this.http.post<ScheduleEntry>(`/api/bookings/${id}/no-show`, { noShow });
  }

  feed(): Observable<CalendarFeedLink> {
    return this.http.get<CalendarFeedLink>('/api/bookings/calendar');
  }

  resetFeed(): Observable<CalendarFeedLink> {
    return this.http.post<CalendarFeedLink>('/api/bookings/calendar/reset', {});
  }
}
