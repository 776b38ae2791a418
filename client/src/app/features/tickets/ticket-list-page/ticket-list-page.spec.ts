import { BreakpointObserver, BreakpointState } from '@angular/cdk/layout';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import { BehaviorSubject } from 'rxjs';
import { Role } from '../../../core/auth/auth.models';
import { SessionStore } from '../../../core/auth/session-store';
import { TicketRow } from '../ticket.models';
import { TicketListPage } from './ticket-list-page';

const ROW: TicketRow = {
  id: 21,
  tag: 'RW-0021',
  equipmentKind: 'transceiver',
  makeModel: 'Fenwick Heron 100',
  ownerName: 'Perrin Sallow',
  state: 'reflash',
  stateSince: new Date().toISOString(),
  createdAt: '2026-11-30T18:00:00Z',
};

describe('TicketListPage', { timeout: 30_000 }, () => {
  const narrow = new BehaviorSubject<BreakpointState>({ matches: false, breakpoints: {} });

  async function setup(roles: Role[], phone = false) {
    narrow.next({ matches: phone, breakpoints: {} });
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: BreakpointObserver, useValue: { observe: () => narrow } },
      ],
    });
    TestBed.inject(SessionStore).set({ id: 3, email: 'x@kestrelfen.example', displayName: 'Perrin Sallow', callSign: null, roles });
    const http = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(TicketListPage);
    fixture.detectChanges();
    const req = http.expectOne((r) => r.url === '/api/tickets');
    expect(req.request.params.get('sort')).toBe('createdAt');
    expect(req.request.params.get('dir')).toBe('desc');
    expect(req.request.params.get('page')).toBe('1');
    req.flush({ items: [ROW], total: 1, page: 1, pageSize: 25 });
    await fixture.whenStable();
    const table = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatTableHarness);
    return { fixture, table, http };
  }

  it("a member's own list has no Owner column (every row would be their own name)", async () => {
    const { fixture, table } = await setup(['member']);
    expect(await (await table.getHeaderRows())[0].getCellTextByIndex()).toEqual(['Tag', 'Equipment', 'Lane', 'In lane for', 'Handed in']);
    expect(fixture.nativeElement.querySelector('h1').textContent).toBe('My tickets');
  });

  it('staff see whose equipment it is', async () => {
    const { table } = await setup(['technician', 'member']);
    const cells = await table.getCellTextByColumnName();
    expect(cells['owner'].text).toEqual(['Perrin Sallow']);
  });

  it("on a phone each row keeps the tag, the lane chip and the equipment; a member's has no owner", async () => {
    const { fixture, table } = await setup(['member'], true);
    expect(await (await table.getHeaderRows())[0].getCellTextByIndex()).toEqual(['Ticket']);
    const cell: HTMLElement = fixture.nativeElement.querySelector('td.mat-column-summary');
    expect(cell.querySelector('a.tag')?.textContent).toBe('RW-0021');
    expect(cell.querySelector('rw-state-chip')?.textContent).toContain('Reflash');
    expect(cell.textContent).toContain('Fenwick Heron 100');
    expect(cell.textContent).not.toContain('Perrin Sallow');
  });
});
