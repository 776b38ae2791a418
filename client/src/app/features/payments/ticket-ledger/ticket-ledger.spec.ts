import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { LedgerDto } from '@contracts/payments';
import { Role } from '../../../core/auth/auth.models';
import { SessionStore } from '../../../core/auth/session-store';
import { TicketDetail } from '../../tickets/ticket.models';
import { TicketLedger } from './ticket-ledger';

const ticket = { tag: 'RW-0007', state: 'repair', ownerEmail: 'perrin@kestrelfen.example' } as TicketDetail;

// Worked by hand: diagnosis 500 + labour 1200 − 200 waived = 1500 owed (£15.00).
const ledger: LedgerDto = {
  currency: 'GBP',
  charges: [
    { id: 1, description: 'Diagnosis', feeItemId: 2, quantity: 1, unitAmount: 500, amount: 500, memberRate: true, at: '2026-12-01T18:00:00Z', waived: 0, paid: 0, open: 500, waivers: [] },
    { id: 2, description: 'Labour', feeItemId: 3, quantity: 1, unitAmount: 1200, amount: 1200, memberRate: true, at: '2026-12-01T18:00:00Z', waived: 200, paid: 0, open: 1000, waivers: [{ id: 1, amount: 200, reason: 'Goodwill', at: '2026-12-01T19:00:00Z', byName: 'Gwilym Orchard', adjustment: false }] },
  ],
  payments: [],
  totals: { charges: 1700, waivers: 200, payments: 0, refunds: 0 },
  balance: 1500,
  settled: false,
};

describe('TicketLedger', () => {
  let fixture: ComponentFixture<TicketLedger>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function setup(roles: Role[], email: string) {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])] });
    TestBed.inject(SessionStore).set({ id: 3, email, displayName: 'Someone', callSign: null, roles });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TicketLedger);
    fixture.componentRef.setInput('ticket', ticket);
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne('/api/tickets/RW-0007/ledger').flush(ledger);
    for (const req of http.match('/api/fees')) req.flush({ currency: 'GBP', today: '2026-12-02', items: [] });
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  it('the owner sees the balance in pounds and a button to pay it online, which asks for a checkout', async () => {
    await setup(['member'], 'perrin@kestrelfen.example');
    expect(root.querySelector('[data-testid="balance"]')?.textContent).toContain('Balance due: £15.00');
    expect(root.textContent).toContain('Waived £2.00: Goodwill');
    const pay = Array.from(root.querySelectorAll('button')).find((b) => b.textContent?.includes('Pay £15.00 online'))!;
    expect(pay).toBeTruthy();
    // No waive or record-payment controls for a member.
    expect(root.textContent).not.toContain('Record cash or a bank transfer');
    expect(Array.from(root.querySelectorAll('button')).some((b) => b.textContent?.trim() === 'Waive')).toBe(false);
    pay.click();
    fixture.detectChanges();
    const req = http.expectOne('/api/tickets/RW-0007/ledger/checkout');
    expect(req.request.method).toBe('POST');
    req.flush({ error: { code: 'payment_provider_unavailable', message: 'The payment service did not answer.' } }, { status: 502, statusText: 'Bad Gateway' });
    await fixture.whenStable();
    expect(root.querySelector('[role="alert"]')?.textContent).toContain('The payment service did not answer.');
  });

  it('another member sees no pay button; the treasurer waives and records payments', async () => {
    await setup(['member'], 'someone.else@kestrelfen.example');
    expect(Array.from(root.querySelectorAll('button')).some((b) => b.textContent?.includes('online'))).toBe(false);
    TestBed.resetTestingModule();
    await setup(['treasurer'], 'treasurer@kestrelfen.example');
    expect(Array.from(root.querySelectorAll('button')).filter((b) => b.textContent?.trim() === 'Waive').length).toBe(2);
    expect(root.textContent).toContain('Record cash or a bank transfer');
  });
});
