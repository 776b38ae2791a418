import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type { CheckoutDto, FeeScheduleDto, FeeUnit, LedgerDto, ReconciliationDto } from '@contracts/payments';
import { HANDLES_OWN_ERRORS } from '../../core/http/api-error';

export type ChargeBody = { feeItemId: number; quantity: number } | { description: string; amount: number };

/** Fees, charges, payments and reconciliation routes of the API. Forms show their own errors. */
@Injectable({ providedIn: 'root' })
export class PaymentsApi {
  private readonly http = inject(HttpClient);
  private readonly own = () => ({ context: new HttpContext().set(HANDLES_OWN_ERRORS, true) });
  private readonly ticket = (tag: string) => `/api/tickets/${encodeURIComponent(tag)}/ledger`;

  ledger(tag: string): Observable<LedgerDto> {
    return this.http.get<LedgerDto>(this.ticket(tag));
  }
  addCharge(tag: string, body: ChargeBody): Observable<LedgerDto> {
    return this.http.post<LedgerDto>(`${this.ticket(tag)}/charges`, body, this.own());
  }
  recordPayment(tag: string, body: { method: 'cash' | 'bank_transfer'; amount: number; reference: string }): Observable<LedgerDto> {
    return this.http.post<LedgerDto>(`${this.ticket(tag)}/payments`, body, this.own());
  }
  checkout(tag: string): Observable<CheckoutDto> {
    return this.http.post<CheckoutDto>(`${this.ticket(tag)}/checkout`, {}, this.own());
  }
  waive(chargeId: number, body: { amount: number; reason: string }): Observable<LedgerDto> {
    return this.http.post<LedgerDto>(`/api/charges/${chargeId}/waivers`, body, this.own());
  }
  refund(paymentId: number, body: { amount: number; reason: string }): Observable<LedgerDto> {
    return this.http.post<LedgerDto>(`/api/payments/${paymentId}/refunds`, body, this.own());
  }
  receiptUrl(paymentId: number): string {
    return `/api/payments/${paymentId}/receipt.pdf`;
  }

  fees(): Observable<FeeScheduleDto> {
    return this.http.get<FeeScheduleDto>('/api/fees');
  }
  createFee(body: { code: string; name: string; unit: FeeUnit; memberPrice: number; nonMemberPrice: number; effectiveFrom: string }): Observable<FeeScheduleDto> {
    return this.http.post<FeeScheduleDto>('/api/fees', body, this.own());
  }
  addPrice(feeId: number, body: { memberPrice: number; nonMemberPrice: number; effectiveFrom: string }): Observable<FeeScheduleDto> {
    return this.http.post<FeeScheduleDto>(`/api/fees/${feeId}/prices`, body, this.own());
  }

  month(month: string): Observable<ReconciliationDto> {
    return this.http.get<ReconciliationDto>(`/api/reconciliation/${encodeURIComponent(month)}`);
  }
  csvUrl(month: string): string {
    return `/api/reconciliation/${encodeURIComponent(month)}/csv`;
  }
  closeMonth(month: string): Observable<ReconciliationDto> {
    return this.http.post<ReconciliationDto>(`/api/reconciliation/${encodeURIComponent(month)}/close`, {}, this.own());
  }
}
