import { HttpClient, HttpContext, HttpEventType } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, filter, map } from 'rxjs';
import { Page } from '@contracts/lists';
import { HANDLES_OWN_ERRORS, queryParams } from '../../core/http/api-error';
import {
  AttemptFields,
  FirmwareImage,
  FirmwareQuery,
  FirmwareUnit,
  FirmwareUploaded,
  FlashAttemptsView,
  TrackRecord,
  UploadFields,
  UploadState,
} from './firmware.models';

/** The Firmware library and flash-attempt routes of the API (technicians and admins). */
@Injectable({ providedIn: 'root' })
export class FirmwareApi {
  private readonly http = inject(HttpClient);
  private readonly ownErrors = () => new HttpContext().set(HANDLES_OWN_ERRORS, true);

  list(query: FirmwareQuery): Observable<Page<FirmwareImage>> {
    return this.http.get<Page<FirmwareImage>>('/api/firmware', { params: queryParams(query) });
  }

  get(id: number): Observable<FirmwareImage> {
    return this.http.get<FirmwareImage>(`/api/firmware/${encodeURIComponent(String(id))}`);
  }

  models(): Observable<string[]> {
    return this.http.get<{ models: string[] }>('/api/firmware/models').pipe(map((r) => r.models));
  }

  trackRecord(model: string, unit: FirmwareUnit): Observable<TrackRecord> {
    return this.http.get<TrackRecord>('/api/firmware/track-record', { params: { model, unit } });
  }

  downloadUrl(id: number): string {
    return `/api/firmware/${encodeURIComponent(String(id))}/download`;
  }

  /** Streams the file up with progress events; the form shows field errors itself. */
  upload(fields: UploadFields, file: File): Observable<UploadState<FirmwareUploaded>> {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) if (v !== undefined && v !== '') form.append(k, String(v));
    form.append('image', file, file.name);
    return this.http
      .post<FirmwareUploaded>('/api/firmware', form, { reportProgress: true, observe: 'events', context: this.ownErrors() })
      .pipe(
        filter((e) => e.type === HttpEventType.UploadProgress || e.type === HttpEventType.Response),
        map((e): UploadState<FirmwareUploaded> =>
          e.type === HttpEventType.Response
            ? { kind: 'done', value: e.body! }
            : { kind: 'progress', percent: e.total ? Math.round((100 * e.loaded) / e.total) : 0 },
        ),
      );
  }

  markKnownGood(id: number, knownGood: boolean): Observable<FirmwareImage> {
    return this.http.post<FirmwareImage>(`/api/firmware/${id}/known-good`, { knownGood });
  }

  withdraw(id: number, reason: string): Observable<FirmwareImage> {
    return this.http.post<FirmwareImage>(`/api/firmware/${id}/withdraw`, { reason }, { context: this.ownErrors() });
  }

  attempts(tag: string, q = ''): Observable<FlashAttemptsView> {
    return this.http.get<FlashAttemptsView>(`/api/tickets/${encodeURIComponent(tag)}/flash-attempts`, { params: queryParams({ q }) });
  }

  serialLogUrl(tag: string, number: number): string {
    return `/api/tickets/${encodeURIComponent(tag)}/flash-attempts/${number}/log`;
  }

  recordAttempt(tag: string, fields: AttemptFields, serialLog: File | null): Observable<FlashAttemptsView> {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) if (v !== undefined && v !== '' && v !== null) form.append(k, String(v));
    if (serialLog) form.append('serialLog', serialLog, serialLog.name);
    return this.http.post<FlashAttemptsView>(`/api/tickets/${encodeURIComponent(tag)}/flash-attempts`, form, { context: this.ownErrors() });
  }
}
