import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { Role } from '../../../core/auth/auth.models';
import { SessionStore } from '../../../core/auth/session-store';
import { IntakePage } from './intake-page';

describe('IntakePage (Hand in equipment)', () => {
  let fixture: ComponentFixture<IntakePage>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function setup(roles: Role[]) {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])],
    });
    TestBed.inject(SessionStore).set({
      id: 7,
      email: 'orla@kestrelfen.example',
      displayName: 'Orla Fenwick',
      callSign: 'Q2KFA',
      roles,
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(IntakePage);
    root = fixture.nativeElement;
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  const errors = () => Array.from(root.querySelectorAll('mat-error')).map((e) => e.textContent?.trim());
  const submit = () => root.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();

  function type(selector: string, value: string) {
    const el = root.querySelector<HTMLInputElement | HTMLTextAreaElement>(selector)!;
    el.value = value;
    el.dispatchEvent(new Event('input'));
    el.dispatchEvent(new Event('blur'));
  }

  async function chooseKind(label: string) {
    root.querySelector<HTMLElement>('mat-select[formcontrolname="equipmentKind"] .mat-mdc-select-trigger')!.click();
    fixture.detectChanges();
    await fixture.whenStable();
    const option = Array.from(document.querySelectorAll<HTMLElement>('mat-option')).find(
      (o) => o.textContent?.trim() === label,
    );
    option!.click();
    await fixture.whenStable();
  }

  async function fillRequired() {
    await chooseKind('Transceiver');
    type('input[formcontrolname="makeModel"]', 'Kestrel QX-7');
    type('textarea[formcontrolname="faultReported"]', 'Relay clicks at power-on, display stays dark.');
    await fixture.whenStable();
  }

  it('refuses to send an empty form and says what each required field needs', async () => {
    await setup(['member']);
    submit();
    await fixture.whenStable();
    http.expectNone('/api/tickets');
    expect(errors()).toEqual(
      expect.arrayContaining(['Choose the kind of equipment.', 'Enter the make and model.', 'Enter the fault as reported.']),
    );
    expect(root.querySelector('[role="alert"]')?.textContent).toContain('Some fields need attention');
  });

  it('a fault shorter than 5 characters is refused with its length rule', async () => {
    await setup(['member']);
    await fillRequired();
    type('textarea[formcontrolname="faultReported"]', 'dead');
    submit();
    await fixture.whenStable();
    http.expectNone('/api/tickets');
    expect(errors()).toContain('Fault as reported needs at least 5 characters.');
  });

  it('sends the intake body, and server field errors land on the matching controls', async () => {
    await setup(['member']);
    await fillRequired();
    type('input[formcontrolname="serialNumber"]', 'KF-000123');
    const accessory = Array.from(root.querySelectorAll<HTMLElement>('mat-checkbox')).find((c) =>
      c.textContent?.includes('DC lead'),
    )!;
    accessory.querySelector('input')!.click();
    submit();
    fixture.detectChanges();

    const req = http.expectOne('/api/tickets');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({
      equipmentKind: 'transceiver',
      makeModel: 'Kestrel QX-7',
      serialNumber: 'KF-000123',
      units: [],
      faultReported: 'Relay clicks at power-on, display stays dark.',
      accessories: ['DC lead'],
      reflashConsent: false,
      notifyByEmail: true,
    });
    // A member never sends an owner: their ticket is their own.
    expect(req.request.body.owner).toBeUndefined();

    req.flush(
      {
        error: {
          code: 'validation_failed',
          message: 'Some fields need attention.',
          fields: { makeModel: 'That make and model is not one the bench can take.', serialNumber: 'Serial numbers are letters, digits and dashes.' },
        },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(errors()).toEqual([
      'That make and model is not one the bench can take.',
      'Serial numbers are letters, digits and dashes.',
    ]);
    // Each message sits in the form field of its own control.
    const makeField = root.querySelector('input[formcontrolname="makeModel"]')!.closest('mat-form-field')!;
    expect(makeField.querySelector('mat-error')?.textContent?.trim()).toBe('That make and model is not one the bench can take.');
  });

  it('on success shows the tag number with a link to the ticket', async () => {
    await setup(['member']);
    await fillRequired();
    submit();
    fixture.detectChanges();
    http.expectOne('/api/tickets').flush({ tag: 'RW-0042', state: 'intake' }, { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(root.querySelector('[data-testid="opened-tag"]')?.textContent?.trim()).toBe('RW-0042');
    expect(root.textContent).toContain('Quote it when you ask about your equipment.');
    expect(root.querySelector<HTMLAnchorElement>('a[href="/tickets/RW-0042"]')?.textContent).toContain('Open ticket RW-0042');
  });

  it('shows the reflash caution beside the consent box', async () => {
    await setup(['member']);
    const caution = root.querySelector('rw-caution')!;
    expect(caution.textContent).toContain('Settings and memories may be lost.');
    expect(caution.textContent).toContain('unbootable');
    expect(caution.textContent).toContain('Follow local codes and licensed practice.');
  });

  it('members do not see the owner section; technicians do, and its fields are required once ticked', async () => {
    await setup(['member']);
    expect(root.textContent).not.toContain('On behalf of an owner');
    TestBed.resetTestingModule();

    await setup(['technician']);
    expect(root.textContent).toContain('On behalf of an owner');
    await fillRequired();
    const behalf = Array.from(root.querySelectorAll<HTMLElement>('mat-checkbox')).find((c) =>
      c.textContent?.includes('for someone else'),
    )!;
    behalf.querySelector('input')!.click();
    await fixture.whenStable();
    submit();
    await fixture.whenStable();
    http.expectNone('/api/tickets');
    expect(errors()).toEqual(expect.arrayContaining(["Enter the owner's name.", "Enter the owner's e-mail."]));

    type('input[formcontrolname="name"]', 'Bram Ellery');
    type('input[formcontrolname="email"]', 'bram@kestrelfen.example');
    type('input[formcontrolname="callSign"]', 'q9xyz');
    await fixture.whenStable();
    submit();
    fixture.detectChanges();
    const req = http.expectOne('/api/tickets');
    expect(req.request.body.owner).toEqual({ name: 'Bram Ellery', email: 'bram@kestrelfen.example', callSign: 'Q9XYZ' });
    req.flush({ tag: 'RW-0043' }, { status: 201, statusText: 'Created' });
  });
});
