import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { Bench, BookingSettings, OpeningRule } from '@contracts/bookings';
import { HANDLES_OWN_ERRORS } from '../../core/http/api-error';
import { BenchBody, RuleBody } from './bench.models';

const OWN_ERRORS = { context: new HttpContext().set(HANDLES_OWN_ERRORS, true) };

/** The admin routes for benches, opening rules and booking settings. */
@Injectable({ providedIn: 'root' })
export class BenchApi {
  private readonly http = inject(HttpClient);

  benches(): Observable<Bench[]> {
    return this.http.get<Bench[]>('/api/benches');
  }

  createBench(body: BenchBody): Observable<Bench> {
    return this.http.post<Bench>('/api/benches', body, OWN_ERRORS);
  }

  updateBench(id: number, body: Partial<BenchBody>): Observable<Bench> {
    return this.http.patch<Bench>(`/api/benches/${id}`, body, OWN_ERRORS);
  }

  rules(): Observable<OpeningRule[]> {
    return this.http.get<OpeningRule[]>('/api/benches/opening-rules');
  }

  createRule(body: RuleBody): Observable<OpeningRule> {
    return this.http.post<OpeningRule>('/api/benches/opening-rules', body, OWN_ERRORS);
  }

  deleteRule(id: number): Observable<void> {
    return this.http.delete<void>(`/api/benches/opening-rules/${id}`);
  }

  settings(): Observable<BookingSettings> {
    return this.http.get<BookingSettings>('/api/benches/settings');
  }

  saveSettings(body: Partial<BookingSettings>): Observable<BookingSettings> {
    return this.http.patch<BookingSettings>('/api/benches/settings', body, OWN_ERRORS);
  }
}
