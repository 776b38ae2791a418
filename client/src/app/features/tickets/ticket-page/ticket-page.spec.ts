import { DIAGNOSIS_CHECKS } from '@contracts/owner-records';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { STATES } from '@domain/workflow';
import { Role } from '../../../core/auth/auth.models';
import { SessionStore } from '../../../core/auth/session-store';
import { Notifier } from '../../../core/notifier';
import { TicketDetail } from '../ticket.models';
import { of } from 'rxjs';
import { MovesApi } from '../../moves/moves-api';
import { Component, input, output } from '@angular/core';
import { BenchRecords } from '../../bench-records/bench-records/bench-records';
import { TicketPage } from './ticket-page';
import { TicketLedger } from '../../payments/ticket-ledger/ticket-ledger';

@Component({ selector: 'rw-ticket-ledger', template: '' })
class LedgerStandIn {
  readonly ticket = input<TicketDetail>();
}

/** The bench records (repair log, test sheets, hand-back) load their own data; their own specs test them. */
@Component({ selector: 'rw-bench-records', template: '' })
class BenchRecordsStub {
  readonly ticket = input<TicketDetail>();
  readonly changed = output<void>();
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
    symptoms: ['relay_clicks_no_display'],
    accessories: ['DC lead'],
    accessoriesNote: null,
    updatesBy: 'email',
    firmwareVersions: null,
    reflashConsent: false,
    notifyByEmail: true,
    ownerEmail: 'perrin@kestrelfen.example',
    ownerPhone: null,
    ownerCallSign: 'Q3PSW',
    technicianName: 'Tobin Marsh',
    awaitingApproval: false,
    partsOnOrder: false,
    technicianId: 3,
    previousState: null,
    undo: null,
    events: [
      { id: 1, at: '2026-11-30T18:00:00Z', actorName: 'Perrin Sallow', kind: 'opened', fromState: null, toState: 'intake', note: null, ownerVisible: true },
      { id: 2, at: '2026-11-30T19:00:00Z', actorName: 'Tobin Marsh', kind: 'moved', fromState: 'intake', toState: 'diagnosis', note: 'Taking it.', ownerVisible: true },
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

  let movesApi: { technicians: () => unknown; undo: ReturnType<typeof vi.fn> };
  let notifier: { info: ReturnType<typeof vi.fn>; error: ReturnType<typeof vi.fn>; offer: ReturnType<typeof vi.fn> };

  async function setup(roles: Role[], ticket = detail()) {
    notifier = { info: vi.fn(), error: vi.fn(), offer: vi.fn().mockResolvedValue(false) };
    movesApi = {
      technicians: () => of([{ id: 3, displayName: 'Tobin Marsh', callSign: null }]),
      undo: vi.fn(() => of(detail({ version: 7 }))),
    };
    // The fees section has its own spec (features/payments/ticket-ledger); here it is a stand-in.
    TestBed.overrideComponent(TicketPage, { remove: { imports: [TicketLedger] }, add: { imports: [LedgerStandIn] } });
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: Notifier, useValue: notifier },
        // The "On the bench" section's list of technicians, and the undo (checked through this stand-in).
        { provide: MovesApi, useValue: movesApi },
      ],
    });
    TestBed.overrideComponent(TicketPage, { remove: { imports: [BenchRecords] }, add: { imports: [BenchRecordsStub] } });
    TestBed.inject(SessionStore).set({ id: 3, email: 't@kestrelfen.example', displayName: 'Tobin Marsh', callSign: null, roles });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TicketPage);
    fixture.componentRef.setInput('tag', 'RW-0007');
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne('/api/tickets/RW-0007').flush(ticket);
    await flushSections();
    await fixture.whenStable();
  }

  /** The bench-record sections on the page (diagnosis, quote, notes) load their own data; answer them empty. */
  async function flushSections() {
    for (let i = 0; i < 3; i++) {
      fixture.detectChanges();
      TestBed.tick();
      await new Promise((resolve) => setTimeout(resolve, 0));
    }
    for (const r of http.match((req) => /\/photos\?stage=intake$/.test(req.urlWithParams))) if (!r.cancelled) r.flush({ items: [] });
    for (const r of http.match((req) => /\/(quotes|notes|diagnosis)$/.test(req.url))) {
      if (r.cancelled) continue;
      if (r.request.url.endsWith('/quotes')) r.flush({ quotes: [], settings: { currency: 'GBP', approvalThresholdMinor: 5000 }, canWrite: false, reason: null });
      else if (r.request.url.endsWith('/notes')) r.flush({ items: [], total: 0, page: 1, pageSize: 10 });
      else {
        const checks = Object.fromEntries(DIAGNOSIS_CHECKS.map((k) => [k, { done: false, result: null }]));
        r.flush({ tag: 'RW-0007', editable: true, checks, supplyAtRadioV: null, idleCurrentA: null, transmitCurrentA: null, lead: null, findings: null, decision: null, returnReason: null, version: 0, savedAt: null, savedBy: null });
      }
    }
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
  }, 20_000); // the first technician render loads the bench section's Material modules: slow on a busy machine

  it('a note enables the move that only wanted a note, and it is sent with the version', async () => {
    await setup(['technician']);
    const note = root.querySelector<HTMLTextAreaElement>('textarea[formcontrolname="note"]')!;
    note.value = 'No fault found after a full soft reset.';
    note.dispatchEvent(new Event('input'));
    await flushSections();
    const ret = Array.from(root.querySelectorAll<HTMLButtonElement>('.move-list button')).find((b) =>
      b.textContent?.includes('Return'),
    )!;
    expect(ret.disabled).toBe(false);
    ret.click();
    fixture.detectChanges();
    const req = http.expectOne('/api/tickets/RW-0007/moves');
    expect(req.request.body).toEqual({ to: 'return', version: 5, note: 'No fault found after a full soft reset.' });
    req.flush(detail({ state: 'return', version: 6, moves: [{ to: 'closed', allowed: false, reason: 'Fees are not settled.' }] }));
    await flushSections();
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
    await flushSections();
    await fixture.whenStable();
    expect(root.querySelector('[role="alert"]')?.textContent).toContain('Someone else moved this ticket.');
  });

  it('offers Send back to the lane it came from, live once a note is written, sent like a move', async () => {
    const sendBack = { to: 'intake' as const, allowed: true, noteRequired: true as const, reason: 'Say why it goes back to Intake in the note.' };
    await setup(['technician'], detail({ previousState: 'intake', moves: detail().moves.map((m) => (m.to === 'intake' ? sendBack : m)) }));
    expect(moveButtons()).toContainEqual({ text: 'Send back to Intake', disabled: true });
    expect(root.textContent).toContain('Say why it goes back to Intake in the note.');
    const note = root.querySelector<HTMLTextAreaElement>('textarea[formcontrolname="note"]')!;
    note.value = 'Serial number missing from the intake.';
    note.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    const back = Array.from(root.querySelectorAll<HTMLButtonElement>('.move-list button')).find((b) => b.textContent?.includes('Send back'))!;
    expect(back.disabled).toBe(false);
    back.click();
    const req = http.expectOne('/api/tickets/RW-0007/moves');
    expect(req.request.body).toEqual({ to: 'intake', version: 5, note: 'Serial number missing from the intake.' });
  });

  it('after a move the snack bar offers Undo; choosing it posts the undo and shows the ticket back', async () => {
    await setup(['technician']);
    notifier.offer.mockResolvedValue(true);
    Array.from(root.querySelectorAll<HTMLButtonElement>('.move-list button')).find((b) => b.textContent?.includes('Repair'))!.click();
    const until = new Date(Date.now() + 10_000).toISOString();
    http.expectOne('/api/tickets/RW-0007/moves').flush(detail({ state: 'repair', version: 6, undo: { eventId: 31, fromState: 'diagnosis', toState: 'repair', until } }));
    await flushSections();
    await fixture.whenStable();
    expect(notifier.offer).toHaveBeenCalledWith('RW-0007 moved to Repair.', 'Undo', expect.any(Number));
    const window = notifier.offer.mock.calls[0][2] as number;
    expect(window).toBeGreaterThan(7_000);
    expect(window).toBeLessThanOrEqual(9_000);
    expect(movesApi.undo).toHaveBeenCalledWith('RW-0007', 31, 6);
    await flushSections();
    await fixture.whenStable();
    expect(root.querySelector('rw-state-chip')?.textContent).toContain('Diagnosis');
    expect(notifier.info).toHaveBeenCalledWith('Move undone: RW-0007 is back in Diagnosis.');
  });
});
