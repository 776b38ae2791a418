import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { SessionStore } from '../../../core/auth/session-store';
import { Notifier } from '../../../core/notifier';
import { DaySlots } from '../booking.models';
import { BookSlotPage } from './book-slot-page';

const SETTINGS = { timeZone: 'Europe/London', slotMinutes: 30, maxOpenBookings: 3, horizonDays: 28, cancelCutoffHours: 2 };
// Tuesday 8 December 2026, 19:00-20:30 GMT (UTC+0 in December: IANA tz 'europe', EU rules).
const DAY: DaySlots = {
  date: '2026-12-08',
  timeZone: 'Europe/London',
  slotMinutes: 30,
  sessions: [{ start: '2026-12-08T19:00:00.000Z', end: '2026-12-08T20:30:00.000Z', note: 'Club evening' }],
  nextSessionDate: '2026-12-10',
  benches: [
    {
      bench: { id: 4, name: 'Heron bench', location: 'Workshop', instruments: [{ kind: 'regulated_supply', name: 'Supply 13.8 V', maxCurrentA: 30 }], outOfService: false, outOfServiceReason: null, outOfServiceUntil: null },
      slots: [
        { start: '2026-12-08T19:00:00.000Z', end: '2026-12-08T19:30:00.000Z', status: 'free' },
        { start: '2026-12-08T19:30:00.000Z', end: '2026-12-08T20:00:00.000Z', status: 'free' },
        { start: '2026-12-08T20:00:00.000Z', end: '2026-12-08T20:30:00.000Z', status: 'taken' },
      ],
    },
  ],
};

describe('BookSlotPage', () => {
  let fixture: ComponentFixture<BookSlotPage>;
  let http: HttpTestingController;
  let root: HTMLElement;
  const notifier = { info: vi.fn(), error: vi.fn() };

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: Notifier, useValue: notifier }],
    });
    TestBed.inject(SessionStore).set({ id: 7, email: 'perrin@kestrelfen.example', displayName: 'Perrin Sallow', callSign: 'Q3PSW', roles: ['member'] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BookSlotPage);
    fixture.componentRef.setInput('date', '2026-12-08');
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne('/api/benches/settings').flush(SETTINGS);
    http.expectOne((r) => r.url === '/api/tickets').flush({ items: [{ id: 42, tag: 'RW-0042', makeModel: 'Heron 100', state: 'diagnosis' }], total: 1, page: 1, pageSize: 100 });
    http.expectOne((r) => r.url === '/api/bookings/slots' && r.params.get('date') === '2026-12-08').flush(DAY);
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  const slotButtons = () => Array.from(root.querySelectorAll<HTMLButtonElement>('button.slot'));

  it('shows each slot in the club\'s time with its status in words, and taken slots cannot be chosen', () => {
    const texts = slotButtons().map((b) => [
      b.querySelector('.slot-time')!.textContent!.trim(),
      b.querySelector('.slot-status')!.textContent!.replace('event_available', '').replace('block', '').trim(),
    ]);
    expect(texts).toEqual([
      ['19:00–19:30', 'Free'],
      ['19:30–20:00', 'Free'],
      ['20:00–20:30', 'Taken'],
    ]);
    expect(slotButtons()[2]!.disabled).toBe(true);
    expect(root.textContent).toContain('Supply 13.8 V');
  });

  it('books two consecutive slots with what they are for; a 409 says "just taken" and reloads the day', async () => {
    slotButtons()[0]!.click();
    slotButtons()[1]!.click();
    fixture.detectChanges();
    expect(root.querySelector('#book-title')!.textContent).toContain('Heron bench, Tue, 8 Dec 2026, 19:00–20:00 (2 slots)');

    const page = fixture.componentInstance as unknown as { form: { patchValue(v: object): void } };
    page.form.patchValue({ purpose: 'drop_off', ticketTag: 'RW-0042' });
    root.querySelector<HTMLButtonElement>('form.book-form button[type="submit"]')!.click();
    const post = http.expectOne((r) => r.method === 'POST' && r.url === '/api/bookings');
    expect(post.request.body).toEqual({ benchId: 4, start: '2026-12-08T19:00:00.000Z', slotCount: 2, purpose: 'drop_off', ticketTag: 'RW-0042', note: null });
    post.flush({ error: { code: 'slot_taken', message: 'Someone has just taken that slot. Pick another free slot.' } }, { status: 409, statusText: 'Conflict' });
    TestBed.tick(); // the resource's reload starts its request
    http.expectOne((r) => r.url === '/api/bookings/slots').flush(DAY);
    await fixture.whenStable();
    expect(root.querySelector('[role="alert"]')!.textContent).toContain('Someone has just taken that slot');
  });

  it('sends nothing until a slot and what it is for are chosen', () => {
    root.querySelector<HTMLButtonElement>('form.book-form button[type="submit"]')!.click();
    fixture.detectChanges();
    expect(root.querySelector('[role="alert"]')!.textContent).toContain('Pick a free slot first');
    slotButtons()[0]!.click();
    root.querySelector<HTMLButtonElement>('form.book-form button[type="submit"]')!.click();
    fixture.detectChanges();
    http.expectNone((r) => r.method === 'POST');
    expect(root.textContent).toContain('Enter what the slot is for.');
  });
});
