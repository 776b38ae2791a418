import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { HANDLES_OWN_ERRORS, queryParams } from '../../core/http/api-error';
import { DcDropQuery, DcLeadDrop, RfFigures, RfQuery, XmodemPlan, XmodemQuery } from './calc.models';

/** The calculation routes of the API. Each calculator shows its own errors beside its fields. */
@Injectable({ providedIn: 'root' })
export class CalcApi {
  private readonly http = inject(HttpClient);
  private readonly ownErrors = () => ({ context: new HttpContext().set(HANDLES_OWN_ERRORS, true) });

  xmodem(query: XmodemQuery): Observable<XmodemPlan> {
    return this.http.get<XmodemPlan>('/api/calc/xmodem', { params: queryParams(query), ...this.ownErrors() });
  }

  rf(query: RfQuery): Observable<RfFigures> {
    return this.http.get<RfFigures>('/api/calc/rf', { params: queryParams(query), ...this.ownErrors() });
  }

  dcDrop(query: DcDropQuery): Observable<DcLeadDrop> {
    return this.http.get<DcLeadDrop>('/api/calc/dc-drop', { params: queryParams(query), ...this.ownErrors() });
  }
}
