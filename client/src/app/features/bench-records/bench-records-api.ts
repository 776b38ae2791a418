import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type {
  HandBackView,
  RepairLogKind,
  RepairLogView,
  RepairPartEntry,
  RepairWorkEntry,
  TestLimitsView,
  TestSheetSaved,
  TestSheetsView,
} from '@contracts/bench-records';
import type { TestLimitKey, TestLimit } from '@domain/test-sheet';
import { HANDLES_OWN_ERRORS, queryParams } from '../../core/http/api-error';
import type { HandBackBody, PartBody, TestSheetBody, WorkBody } from './bench-records.models';

const OWN_ERRORS = () => ({ context: new HttpContext().set(HANDLES_OWN_ERRORS, true) });
const at = (tag: string) => `/api/tickets/${encodeURIComponent(tag)}`;

/** The repair log, test sheets, hand-back and test-limit routes of the API. Forms show their own errors. */
@Injectable({ providedIn: 'root' })
export class BenchRecordsApi {
  private readonly http = inject(HttpClient);

  repairLog(tag: string, query: { kind: RepairLogKind; page: number; pageSize: number; dir?: 'asc' | 'desc' }): Observable<RepairLogView> {
    return this.http.get<RepairLogView>(`${at(tag)}/repair-log`, { params: queryParams(query) });
  }

  addWork(tag: string, body: WorkBody): Observable<RepairWorkEntry> {
    return this.http.post<RepairWorkEntry>(`${at(tag)}/repair-log/work`, body, OWN_ERRORS());
  }

  addPart(tag: string, body: PartBody): Observable<RepairPartEntry> {
    return this.http.post<RepairPartEntry>(`${at(tag)}/repair-log/parts`, body, OWN_ERRORS());
  }

  testSheets(tag: string, query: { page: number; pageSize: number; dir?: 'asc' | 'desc' }): Observable<TestSheetsView> {
    return this.http.get<TestSheetsView>(`${at(tag)}/test-sheets`, { params: queryParams(query) });
  }

  saveTestSheet(tag: string, body: TestSheetBody): Observable<TestSheetSaved> {
    return this.http.post<TestSheetSaved>(`${at(tag)}/test-sheets`, body, OWN_ERRORS());
  }

  handBack(tag: string): Observable<HandBackView> {
    return this.http.get<HandBackView>(`${at(tag)}/hand-back`);
  }

  recordHandBack(tag: string, body: HandBackBody): Observable<HandBackView> {
    return this.http.post<HandBackView>(`${at(tag)}/hand-back`, body, OWN_ERRORS());
  }

  limits(): Observable<TestLimitsView> {
    return this.http.get<TestLimitsView>('/api/test-limits');
  }

  updateLimits(body: Partial<Record<TestLimitKey, TestLimit>>): Observable<TestLimitsView> {
    return this.http.patch<TestLimitsView>('/api/test-limits', body, OWN_ERRORS());
  }
}
