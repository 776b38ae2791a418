import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { STATES } from '@domain/workflow';
import { Role } from '../../../core/auth/auth.models';
import { SessionStore } from '../../../core/auth/session-store';
import { Notifier } from '../../../core/notifier';
import { TicketDetail } from '../ticket.models';
import { TicketPage } from './ticket-page';
import { Component, input } from '@angular/core';
import { TicketLedger } from '../../payments/ticket-ledger/ticket-ledger';

@Component({ selector: 'rw-ticket-ledger', template: '' })
class LedgerStandIn {
  readonly ticket = input<TicketDetail>();
}

function detail(extra: Partial<TicketDetail> = {}): TicketDetail {
  return {
    id: 1,
    tag: 'RW-0007',
    equipmentKind: 'transceiver',
    makeModel: 'Fenwick Heron 100',
    ownerName: 'Perrin Sallow',
    state: 'diagnosis',
    stateSince: new Date().toISOString(),
    createdAt: '2026-11-30T18:00:00Z',
    version: 5,
    serialNumber: 'FH-0042',
    units: ['display head', 'main body'],
    faultReported: 'Dark display after a power cut.',
    accessories: ['DC lead'],
    firmwareVersions: null,
    reflashConsent: false,
    notifyByEmail: true,
    ownerEmail: 'perrin@kestrelfen.example',
    ownerPhone: null,
    ownerCallSign: 'Q3PSW',
    technicianName: 'Tobin Marsh',
    awaitingApproval: false,
    partsOnOrder: false,
    events: [
      { id: 1, at: '2026-11-30T18:00:00Z', actorName: 'Perrin Sallow', kind: 'opened', fromState: null, toState: 'intake', note: null },
      { id: 2, at: '2026-11-30T19:00:00Z', actorName: 'Tobin Marsh', kind: 'moved', fromState: 'intake', toState: 'diagnosis', note: 'Taking it.' },
    ],
    // The server lists every state; the page shows only the lanes the workflow allows from here.
    moves: STATES.map((to) =>
      to === 'repair'
        ? { to, allowed: true }
        : to === 'reflash'
          ? { to, allowed: false, reason: 'The owner has not consented to a reflash.' }
          : to === 'return'
            ? { to, allowed: true, noteRequired: true, reason: 'Say why it goes back unrepaired in the note.' }
            : { to, allowed: false, reason: 'Not a lane from here.' },
    ),
    ...extra,
  };
}

describe('TicketPage', () => {
  let fixture: ComponentFixture<TicketPage>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function setup(roles: Role[]) {
    // The fees section has its own spec (features/payments/ticket-ledger); here it is a stand-in.
    TestBed.overrideComponent(TicketPage, { remove: { imports: [TicketLedger] }, add: { imports: [LedgerStandIn] } });
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: Notifier, useValue: { info: vi.fn(), error: vi.fn() } },
      ],
    });
    TestBed.inject(SessionStore).set({ id: 3, email: 't@kestrelfen.example', displayName: 'Tobin Marsh', callSign: null, roles });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TicketPage);
    fixture.componentRef.setInput('tag', 'RW-0007');
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne('/api/tickets/RW-0007').flush(detail());
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  const moveButtons = () =>
    Array.from(root.querySelectorAll<HTMLButtonElement>('.move-list button')).map((b) => ({
      text: b.textContent?.trim(),
      disabled: b.disabled,
    }));

  it('shows details, owner, consent and the timeline with who, when, from and to', async () => {
    await setup(['member']);
    expect(root.querySelector('h1')?.textContent).toContain('RW-0007');
    expect(root.textContent).toContain('display head, main body');
    expect(root.textContent).toContain('Perrin Sallow (Q3PSW)');
    expect(root.textContent).toContain('Not given'); // consent
    const events = Array.from(root.querySelectorAll('.timeline li')).map((li) => li.textContent?.replace(/\s+/g, ' ').trim());
    expect(events[1]).toContain('Tobin Marsh moved it from Intake to Diagnosis');
    expect(events[1]).toContain('Taking it.');
    // Members see no move buttons.
    expect(root.querySelector('.move-list')).toBeNull();
  });

  it('technicians get the allowed lanes only; refused ones are disabled with the reason', async () => {
    await setup(['technician']);
    expect(moveButtons()).toEqual([
      { text: 'Move to Reflash', disabled: true },
      { text: 'Move to Repair', disabled: false },
      { text: 'Move to Return', disabled: true },
    ]);
    expect(root.textContent).toContain('The owner has not consented to a reflash.');
    expect(root.textContent).toContain('Say why it goes back unrepaired in the note.');
    expect(root.textContent).not.toContain('Not a lane from here.');
  });

  it('a note enables the move that only wanted a note, and it is sent with the version', async () => {
    await setup(['technician']);
    const note = root.querySelector<HTMLTextAreaElement>('textarea[formcontrolname="note"]')!;
    note.value = 'No fault found after a full soft reset.';
    note.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    const ret = Array.from(root.querySelectorAll<HTMLButtonElement>('.move-list button')).find((b) =>
      b.textContent?.includes('Return'),
    )!;
    expect(ret.disabled).toBe(false);
    ret.click();
    fixture.detectChanges();
    const req = http.expectOne('/api/tickets/RW-0007/moves');
    expect(req.request.body).toEqual({ to: 'return', version: 5, note: 'No fault found after a full soft reset.' });
    req.flush(detail({ state: 'return', version: 6, moves: [{ to: 'closed', allowed: false, reason: 'Fees are not settled.' }] }));
    await fixture.whenStable();
    expect(root.querySelector('rw-state-chip')?.textContent).toContain('Return');
    expect(moveButtons()).toEqual([{ text: 'Move to Closed', disabled: true }]);
  });

  it('a 409 shows the server message and reloads the ticket', async () => {
    await setup(['technician']);
    Array.from(root.querySelectorAll<HTMLButtonElement>('.move-list button'))
      .find((b) => b.textContent?.includes('Repair'))!
      .click();
    fixture.detectChanges();
    http
      .expectOne('/api/tickets/RW-0007/moves')
      .flush({ error: { code: 'stale_version', message: 'Someone else moved this ticket.' } }, { status: 409, statusText: 'Conflict' });
    fixture.detectChanges();
    http.expectOne('/api/tickets/RW-0007').flush(detail({ version: 6 }));
    await fixture.whenStable();
    expect(root.querySelector('[role="alert"]')?.textContent).toContain('Someone else moved this ticket.');
  });
});
