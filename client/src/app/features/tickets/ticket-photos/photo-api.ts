import { HttpClient, HttpContext, HttpEventType } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, filter, map } from 'rxjs';
import { PhotoStage, TicketPhoto } from '@contracts/photos';
import { HANDLES_OWN_ERRORS } from '../../../core/http/api-error';

/** Upload progress: 0-100 while sending, then the stored photo. */
export type PhotoUpload = { kind: 'progress'; percent: number } | { kind: 'done'; photo: TicketPhoto };

/** The photo routes of a ticket (`/api/tickets/:tag/photos`). */
@Injectable({ providedIn: 'root' })
export class PhotoApi {
  private readonly http = inject(HttpClient);

  list(tag: string, stage: PhotoStage): Observable<{ items: TicketPhoto[] }> {
    return this.http.get<{ items: TicketPhoto[] }>(`/api/tickets/${encodeURIComponent(tag)}/photos`, { params: { stage } });
  }

  /** Sends one photo with progress events; the component shows the error itself. */
  upload(tag: string, stage: PhotoStage, file: File): Observable<PhotoUpload> {
    const form = new FormData();
    form.append('stage', stage);
    form.append('photo', file, file.name);
    return this.http
      .post<TicketPhoto>(`/api/tickets/${encodeURIComponent(tag)}/photos`, form, {
        reportProgress: true,
        observe: 'events',
        context: new HttpContext().set(HANDLES_OWN_ERRORS, true),
      })
      .pipe(
        filter((e) => e.type === HttpEventType.UploadProgress || e.type === HttpEventType.Response),
        map((e): PhotoUpload =>
          e.type === HttpEventType.Response
            ? { kind: 'done', photo: e.body as TicketPhoto }
            : { kind: 'progress', percent: e.total ? Math.round((100 * e.loaded) / e.total) : 0 },
        ),
      );
  }
}
