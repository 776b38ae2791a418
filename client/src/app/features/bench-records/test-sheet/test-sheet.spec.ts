import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { SessionStore } from '../../../core/auth/session-store';
import { LIMITS_FIXTURE, ticketFixture } from '../bench-records.fixtures';
import { TestSheetSection } from './test-sheet';

describe('TestSheetSection', () => {
  let fixture: ComponentFixture<TestSheetSection>;
  let http: HttpTestingController;
  let root: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    TestBed.inject(SessionStore).set({ id: 3, email: 'tobin@kestrelfen.example', displayName: 'Tobin Marsh', callSign: null, roles: ['technician'] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TestSheetSection);
    fixture.componentRef.setInput('ticket', ticketFixture());
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne('/api/test-limits').flush(LIMITS_FIXTURE);
    http
      .expectOne((r) => r.url === '/api/tickets/RW-0042/test-sheets')
      .flush({ tag: 'RW-0042', canRecord: true, reason: null, latestPassed: null, sheets: { items: [], total: 0, page: 1, pageSize: 5 } });
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  });

  afterEach(() => http.verify());

  function type(selector: string, value: string) {
    const el = root.querySelector<HTMLInputElement>(selector)!;
    el.value = value;
    el.dispatchEvent(new Event('input'));
    el.dispatchEvent(new Event('blur'));
  }

  async function fill(reflected: string) {
    type('input[formcontrolname="supplyVoltageV"]', '13.8');
    type('input[formcontrolname="receiveCurrentA"]', '1.4');
    type('input[formcontrolname="ratedW"]', '100');
    type('input[formcontrolname="forwardW"]', '100');
    type('input[formcontrolname="reflectedW"]', reflected);
    type('input[formcontrolname="nominalMHz"]', '14.2');
    type('input[formcontrolname="measuredMHz"]', '14.200008');
    await fixture.whenStable();
  }

  it('shows the RF caution and the empty state', () => {
    expect(root.textContent).toContain('RF power on the bench');
    expect(root.textContent).toContain('into a dummy load');
    expect(root.textContent).toContain('No test sheet yet');
  });

  it('refuses reflected power above forward before sending anything', async () => {
    await fill('120');
    root.querySelector<HTMLButtonElement>('form button[type="submit"]')!.click();
    await fixture.whenStable();
    expect(root.textContent).toContain('Reflected power must be below forward power');
    http.expectNone((r) => r.method === 'POST');
  });

  it('previews the verdict with the server’s own function and sends the readings in Hz', async () => {
    // worked by hand: Pf 100 W, Pr 4 W → SWR 1.50:1, at the 1.5:1 limit (common practice): passes.
    await fill('4');
    expect(root.querySelector('.preview')?.textContent).toContain('this sheet will pass');
    expect(root.querySelector('.preview')?.textContent).toContain('20 m: SWR: 1.50:1');
    root.querySelector<HTMLButtonElement>('form button[type="submit"]')!.click();
    const req = http.expectOne((r) => r.method === 'POST' && r.url === '/api/tickets/RW-0042/test-sheets');
    expect(req.request.body.bands[0]).toEqual({ band: '20 m', ratedW: 100, forwardW: 100, reflectedW: 4, nominalHz: 14_200_000, measuredHz: 14_200_008 });
    expect(req.request.body.supplyVoltageV).toBe(13.8);
  });

  it('says a failing preview will fail', async () => {
    await fill('9');
    expect(root.querySelector('.preview')?.textContent).toContain('This sheet will fail');
  });
});
