import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { SessionStore } from '../../../core/auth/session-store';
import { ticketFixture } from '../bench-records.fixtures';
import { HandBackSection } from './hand-back';

describe('HandBackSection', () => {
  let fixture: ComponentFixture<HandBackSection>;
  let http: HttpTestingController;
  let root: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    TestBed.inject(SessionStore).set({ id: 3, email: 'tobin@kestrelfen.example', displayName: 'Tobin Marsh', callSign: null, roles: ['technician'] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(HandBackSection);
    fixture.componentRef.setInput('ticket', ticketFixture({ state: 'return' }));
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne('/api/tickets/RW-0042/hand-back').flush({ tag: 'RW-0042', accessories: ['control cable', 'DC lead'], canRecord: true, reason: null, current: null });
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  });

  afterEach(() => http.verify());

  it('starts from what was handed in, all ticked, with the owner as collector', () => {
    const boxes = Array.from(root.querySelectorAll('mat-checkbox')).map((b) => b.textContent?.trim());
    expect(boxes).toEqual(['control cable', 'DC lead']);
    expect(root.querySelector<HTMLInputElement>('input[formcontrolname="collectedBy"]')!.value).toBe('Perrin Sallow');
  });

  it('wants a note for an unticked item, then sends the checklist', async () => {
    root.querySelectorAll<HTMLInputElement>('mat-checkbox input')[1]!.click();
    await fixture.whenStable();
    root.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await fixture.whenStable();
    expect(root.textContent).toContain('Say why DC lead does not go back.');
    http.expectNone((r) => r.method === 'POST');

    const note = root.querySelector<HTMLInputElement>('input[formcontrolname="note"]')!;
    note.value = 'Owner kept it at intake';
    note.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    root.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    const req = http.expectOne((r) => r.method === 'POST');
    expect(req.request.body).toEqual({
      items: [
        { item: 'control cable', returned: true, note: null },
        { item: 'DC lead', returned: false, note: 'Owner kept it at intake' },
      ],
      extras: [],
      collectedBy: 'Perrin Sallow',
    });
  });
});
