import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { SessionStore } from '../../../core/auth/session-store';
import { ticketFixture } from '../bench-records.fixtures';
import { RepairLog, minutesText } from './repair-log';

const VIEW = { tag: 'RW-0042', canRecord: true, reason: null, totals: { minutes: 0, workEntries: 0, parts: 0, partsCostMinor: 0 } };

describe('RepairLog', () => {
  let fixture: ComponentFixture<RepairLog>;
  let http: HttpTestingController;
  let root: HTMLElement;

  function answerLists() {
    for (const req of http.match((r) => r.method === 'GET' && r.url === '/api/tickets/RW-0042/repair-log')) {
      const kind = req.request.params.get('kind');
      req.flush({ ...VIEW, work: kind === 'work' ? { items: [], total: 0, page: 1, pageSize: 10 } : null, parts: kind === 'parts' ? { items: [], total: 0, page: 1, pageSize: 10 } : null });
    }
    // The repair photos (features/tickets/ticket-photos, its own spec) load their own list.
    for (const req of http.match((r) => r.method === 'GET' && /\/api\/tickets\/RW-0042\/photos(\?|$)/.test(r.urlWithParams))) req.flush({ items: [] });
  }

  afterEach(() => http.verify());

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    TestBed.inject(SessionStore).set({ id: 3, email: 'tobin@kestrelfen.example', displayName: 'Tobin Marsh', callSign: null, roles: ['technician'] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(RepairLog);
    fixture.componentRef.setInput('ticket', ticketFixture({ state: 'repair' }));
    root = fixture.nativeElement;
    // The totals and both paged lists load (the lists once their sort is known).
    for (let i = 0; i < 4; i++) {
      fixture.detectChanges();
      answerLists();
      await new Promise((r) => setTimeout(r, 0));
    }
    fixture.detectChanges();
    await fixture.whenStable();
  });

  function type(selector: string, value: string) {
    const el = root.querySelector<HTMLInputElement>(selector)!;
    el.value = value;
    el.dispatchEvent(new Event('input'));
    el.dispatchEvent(new Event('blur'));
  }

  it('shows the cautions of the work beside the form', () => {
    const text = root.textContent ?? '';
    expect(text).toContain('Static discharge');
    expect(text).toContain('discharge the capacitors and measure before touching');
    expect(text).toContain('lithium pack');
    expect(text).toContain('Lead-acid batteries vent hydrogen');
    expect(text).toContain('beryllium oxide');
    expect(text).toContain('Follow local codes and licensed practice.');
  });

  it('refuses a cost it cannot read, then sends it in minor units', async () => {
    const partForm = root.querySelector<HTMLFormElement>('form[aria-label="Record a part used"]')!;
    type('form[aria-label="Record a part used"] input[formcontrolname="description"]', 'Fuse 10 A');
    type('input[formcontrolname="unitCost"]', 'twelve');
    await fixture.whenStable();
    partForm.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await fixture.whenStable();
    expect(partForm.textContent).toContain('Give the cost per item as an amount such as 12.50.');
    http.expectNone((r) => r.method === 'POST');

    type('input[formcontrolname="unitCost"]', '12.50');
    await fixture.whenStable();
    partForm.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    const req = http.expectOne((r) => r.method === 'POST' && r.url === '/api/tickets/RW-0042/repair-log/parts');
    expect(req.request.body).toEqual({ description: 'Fuse 10 A', quantity: 1, unitCostMinor: 1250 });
  });

  it('needs the minutes spent as a whole number', async () => {
    const workForm = root.querySelector<HTMLFormElement>('form[aria-label="Log work done"]')!;
    type('textarea[formcontrolname="description"]', 'Replaced the driver transistor');
    workForm.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await fixture.whenStable();
    expect(workForm.textContent).toContain('Enter the minutes spent');
    http.expectNone((r) => r.method === 'POST');
  });

  it('writes time in hours and minutes', () => {
    expect(minutesText(95)).toBe('1 h 35 min');
    expect(minutesText(60)).toBe('1 h');
    expect(minutesText(5)).toBe('5 min');
  });
});
