import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { Page } from '@contracts/lists';
import type { CheckoutDto } from '@contracts/payments';
import type {
  DiagnosisRecord,
  NoteAudience,
  OwnerApprovalView,
  OwnerStatusView,
  Quote,
  QuotesView,
  ReflashConsentView,
  TicketNote,
} from '@contracts/owner-records';
import { HANDLES_OWN_ERRORS } from '../../core/http/api-error';

export type DiagnosisBody = Omit<DiagnosisRecord, 'tag' | 'editable' | 'savedAt' | 'savedBy'>;
export interface QuoteBody {
  lines: { description: string; quantity: number; unitPriceMinor: number }[];
  note?: string;
}

const own = () => ({ context: new HttpContext().set(HANDLES_OWN_ERRORS, true) });
const t = (tag: string) => `/api/tickets/${encodeURIComponent(tag)}`;
const link = (kind: 'status' | 'approval', tag: string, token: string) => `/api/owner/${kind}/${encodeURIComponent(tag)}/${encodeURIComponent(token)}`;

/** The diagnosis, consent, notes and quote routes, and the owner's public link routes. */
@Injectable({ providedIn: 'root' })
export class OwnerRecordsApi {
  private readonly http = inject(HttpClient);

  diagnosis(tag: string): Observable<DiagnosisRecord> {
    return this.http.get<DiagnosisRecord>(`${t(tag)}/diagnosis`);
  }
  saveDiagnosis(tag: string, body: DiagnosisBody): Observable<DiagnosisRecord> {
    return this.http.put<DiagnosisRecord>(`${t(tag)}/diagnosis`, body, own());
  }
  consent(tag: string): Observable<ReflashConsentView> {
    return this.http.get<ReflashConsentView>(`${t(tag)}/reflash-consent`);
  }
  recordConsent(tag: string, body: { method: 'phone' | 'in_person'; note?: string }): Observable<ReflashConsentView> {
    return this.http.post<ReflashConsentView>(`${t(tag)}/reflash-consent`, body, own());
  }
  notes(tag: string, page: number, pageSize: number): Observable<Page<TicketNote>> {
    return this.http.get<Page<TicketNote>>(`${t(tag)}/notes`, { params: { page, pageSize } });
  }
  addNote(tag: string, body: { text: string; audience: NoteAudience }): Observable<TicketNote> {
    return this.http.post<TicketNote>(`${t(tag)}/notes`, body, own());
  }
  quotes(tag: string): Observable<QuotesView> {
    return this.http.get<QuotesView>(`${t(tag)}/quotes`);
  }
  writeQuote(tag: string, body: QuoteBody): Observable<Quote> {
    return this.http.post<Quote>(`${t(tag)}/quotes`, body, own());
  }
  ownerStatus(tag: string, token: string): Observable<OwnerStatusView> {
    return this.http.get<OwnerStatusView>(link('status', tag, token), own());
  }
  ownerConsent(tag: string, token: string): Observable<OwnerStatusView> {
    return this.http.post<OwnerStatusView>(`${link('status', tag, token)}/consent`, {}, own());
  }
  /** Starts paying the balance on the provider's checkout page; the answer's `url` is where to go. */
  ownerCheckout(tag: string, token: string): Observable<CheckoutDto> {
    return this.http.post<CheckoutDto>(`${link('status', tag, token)}/checkout`, {}, own());
  }
  ownerApproval(tag: string, token: string): Observable<OwnerApprovalView> {
    return this.http.get<OwnerApprovalView>(link('approval', tag, token), own());
  }
  ownerDecides(tag: string, token: string, body: { decision: 'approve' | 'decline'; reason?: string }): Observable<OwnerApprovalView> {
    return this.http.post<OwnerApprovalView>(link('approval', tag, token), body, own());
  }
}
