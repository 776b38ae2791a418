import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { HANDLES_OWN_ERRORS, queryParams } from '../../core/http/api-error';
import {
  AttenuatorPad,
  AttenuatorQuery,
  CoaxLineLoss,
  DcDropQuery,
  DcLeadDrop,
  Discharge,
  DischargeQuery,
  DummyLoadFigures,
  DummyLoadQuery,
  LevelQuery,
  LineLoss,
  LineLossQuery,
  RfFigures,
  RfQuery,
  SignalLevel,
  XmodemPlan,
  XmodemQuery,
} from './calc.models';

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

  level(query: LevelQuery): Observable<SignalLevel> {
    return this.http.get<SignalLevel>('/api/calc/level', { params: queryParams(query), ...this.ownErrors() });
  }

  dummyLoad(query: DummyLoadQuery): Observable<DummyLoadFigures> {
    return this.http.get<DummyLoadFigures>('/api/calc/dummy-load', { params: queryParams(query), ...this.ownErrors() });
  }

  attenuator(query: AttenuatorQuery): Observable<AttenuatorPad> {
    return this.http.get<AttenuatorPad>('/api/calc/attenuator', { params: queryParams(query), ...this.ownErrors() });
  }

  /** The answer carries `cable` only when a cable type was asked for. */
  lineLoss(query: LineLossQuery): Observable<LineLoss & Partial<Pick<CoaxLineLoss, 'cable'>>> {
    return this.http.get<LineLoss & Partial<Pick<CoaxLineLoss, 'cable'>>>('/api/calc/line-loss', { params: queryParams(query), ...this.ownErrors() });
  }

  discharge(query: DischargeQuery): Observable<Discharge> {
    return this.http.get<Discharge>('/api/calc/discharge', { params: queryParams(query), ...this.ownErrors() });
  }
}
