import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatStepper } from '@angular/material/stepper';
import { provideRouter } from '@angular/router';
import { Role } from '../../../core/auth/auth.models';
import { SessionStore } from '../../../core/auth/session-store';
import { IntakePage } from './intake-page';
import { CONTACT_MESSAGE, EMAIL_UPDATES_MESSAGE, SYMPTOM_MESSAGE } from './intake-rules';

/** A stepper walk of six steps takes a few seconds on a busy machine. */
const SLOW = 30_000;

describe('IntakePage (Hand in equipment, the stepper)', () => {
  let fixture: ComponentFixture<IntakePage>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function setup(roles: Role[]) {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])],
    });
    TestBed.inject(SessionStore).set({ id: 7, email: 'orla@kestrelfen.example', displayName: 'Orla Fenwick', callSign: 'Q2KFA', roles });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(IntakePage);
    root = fixture.nativeElement;
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  const stepIndex = () => (fixture.componentInstance['stepper']() as MatStepper).selectedIndex;
  const forms = () => Array.from(root.querySelectorAll<HTMLFormElement>('form'));
  const texts = (selector: string) => Array.from(root.querySelectorAll(selector)).map((e) => e.textContent?.trim());

  /** Presses Next on step `i` (0-based) and waits for the page to settle. */
  async function next(i: number) {
    forms()[i]!.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await fixture.whenStable();
  }

  function type(selector: string, value: string) {
    const el = root.querySelector<HTMLInputElement | HTMLTextAreaElement>(selector)!;
    el.value = value;
    el.dispatchEvent(new Event('input'));
    el.dispatchEvent(new Event('blur'));
  }

  function tick(label: string) {
    const box = Array.from(root.querySelectorAll<HTMLElement>('mat-checkbox')).find((c) => c.textContent?.trim() === label)!;
    box.querySelector('input')!.click();
  }

  function choose(label: string) {
    const radio = Array.from(root.querySelectorAll<HTMLElement>('mat-radio-button')).find((c) => c.textContent?.trim() === label)!;
    radio.querySelector('input')!.click();
  }

  async function chooseKind(label: string) {
    root.querySelector<HTMLElement>('mat-select[formcontrolname="equipmentKind"] .mat-mdc-select-trigger')!.click();
    await fixture.whenStable();
    Array.from(document.querySelectorAll<HTMLElement>('mat-option'))
      .find((o) => o.textContent?.trim() === label)!
      .click();
    await fixture.whenStable();
  }

  /** Equipment, fault, accessories: valid values, leaving the page on the consent step. */
  async function fillMiddleSteps() {
    await chooseKind('Transceiver');
    type('input[formcontrolname="makeModel"]', 'Kestrel QX-7');
    type('input[formcontrolname="serialNumber"]', 'KF-000123');
    await next(1);
    tick('Relay clicks, no display');
    type('textarea[formcontrolname="faultReported"]', 'Relay clicks at power-on, display stays dark.');
    await next(2);
    tick('Control cable');
    await next(3);
  }

  it('someone at the bench: a name alone does not pass the owner step; a phone makes it pass', async () => {
    await setup(['technician']);
    choose('Someone at the bench');
    await fixture.whenStable();
    type('input[formcontrolname="name"]', 'Edmund Rushby');
    await next(0);
    expect(stepIndex()).toBe(0);
    expect(texts('[role="alert"]')).toContain(CONTACT_MESSAGE);
    type('input[formcontrolname="phone"]', '01632 960417');
    await next(0);
    expect(stepIndex()).toBe(1);
  }, SLOW);

  it('a member to hand in for must be chosen from the list', async () => {
    await setup(['technician']);
    choose('A member of the club');
    await fixture.whenStable();
    await next(0);
    expect(stepIndex()).toBe(0);
    expect(texts('[role="alert"]').join(' ')).toContain('Choose the member from the list');
  }, SLOW);

  it('the equipment and fault steps say what each needs, and hold the stepper until it is given', async () => {
    await setup(['member']);
    await next(0); // a member hands in their own: nothing to fill
    expect(stepIndex()).toBe(1);
    await next(1);
    expect(stepIndex()).toBe(1);
    expect(texts('mat-error')).toEqual(expect.arrayContaining(['Choose the kind of equipment.', 'Enter the make and model.']));
    await chooseKind('Transceiver');
    type('input[formcontrolname="makeModel"]', 'Kestrel QX-7');
    await next(1);
    expect(stepIndex()).toBe(2);
    type('textarea[formcontrolname="faultReported"]', 'dead');
    await next(2);
    expect(stepIndex()).toBe(2);
    expect(texts('[role="alert"]')).toContain(SYMPTOM_MESSAGE);
    expect(texts('mat-error')).toContain('Fault as reported needs at least 5 characters.');
  }, SLOW);

  it('updates by e-mail need an e-mail address for someone at the bench', async () => {
    await setup(['technician']);
    choose('Someone at the bench');
    await fixture.whenStable();
    type('input[formcontrolname="name"]', 'Edmund Rushby');
    type('input[formcontrolname="phone"]', '01632 960417');
    await next(0);
    await fillMiddleSteps();
    expect(stepIndex()).toBe(4);
    choose('By e-mail');
    await next(4);
    expect(stepIndex()).toBe(4);
    expect(texts('[role="alert"]')).toContain(EMAIL_UPDATES_MESSAGE);
    choose('By phone');
    await next(4);
    expect(stepIndex()).toBe(5);
  }, SLOW);

  it('sends the whole intake, then shows the tag, the intake tag link and the photos', async () => {
    await setup(['technician']);
    choose('Someone at the bench');
    await fixture.whenStable();
    type('input[formcontrolname="name"]', 'Edmund Rushby');
    type('input[formcontrolname="phone"]', '01632 960417');
    type('input[formcontrolname="callSign"]', 'q4erb');
    await next(0);
    await fillMiddleSteps();
    tick('The owner agrees to a reflash of the firmware if the technician needs one');
    choose('By phone');
    await next(4);
    expect(root.textContent).toContain('Edmund Rushby · 01632 960417');
    Array.from(root.querySelectorAll<HTMLButtonElement>('button')).find((b) => b.textContent?.includes('Hand in and open a ticket'))!.click();
    await fixture.whenStable();

    const req = http.expectOne('/api/tickets');
    expect(req.request.body).toEqual({
      equipmentKind: 'transceiver',
      makeModel: 'Kestrel QX-7',
      serialNumber: 'KF-000123',
      units: [],
      symptoms: ['relay_clicks_no_display'],
      faultReported: 'Relay clicks at power-on, display stays dark.',
      accessories: ['Control cable'],
      reflashConsent: true,
      updatesBy: 'phone',
      owner: { name: 'Edmund Rushby', phone: '01632 960417', callSign: 'Q4ERB' },
    });
    req.flush({ tag: 'RW-0042', state: 'intake' }, { status: 201, statusText: 'Created' });
    // The last step opens and its photo gallery asks for the list (whenStable would wait for that answer).
    for (let i = 0; i < 5; i++) {
      await new Promise((r) => setTimeout(r));
      fixture.detectChanges();
    }
    http.expectOne('/api/tickets/RW-0042/photos?stage=intake').flush({ items: [] });
    await fixture.whenStable();
    expect(stepIndex()).toBe(6);
    expect(root.querySelector('[data-testid="opened-tag"]')?.textContent?.trim()).toBe('RW-0042');
    expect(root.querySelector<HTMLAnchorElement>('[data-testid="intake-tag-link"]')?.getAttribute('href')).toBe('/api/tickets/RW-0042/intake-tag.pdf');
    expect(root.textContent).toContain('No condition photos yet.');
  }, SLOW);

  it('server field errors land on their controls, with a message pointing back to the step', async () => {
    await setup(['technician']);
    choose('Someone at the bench');
    await fixture.whenStable();
    type('input[formcontrolname="name"]', 'Edmund Rushby');
    type('input[formcontrolname="phone"]', '01632 960417');
    await next(0);
    await fillMiddleSteps();
    choose('No updates');
    await next(4);
    Array.from(root.querySelectorAll<HTMLButtonElement>('button')).find((b) => b.textContent?.includes('Hand in and open a ticket'))!.click();
    await fixture.whenStable();
    http
      .expectOne('/api/tickets')
      .flush(
        { error: { code: 'validation_failed', message: 'Some fields need attention.', fields: { 'owner.phone': 'That number has too few digits.' } } },
        { status: 400, statusText: 'Bad Request' },
      );
    await fixture.whenStable();
    const phoneField = root.querySelector('input[formcontrolname="phone"]')!.closest('mat-form-field')!;
    expect(phoneField.querySelector('mat-error')?.textContent?.trim()).toBe('That number has too few digits.');
  }, SLOW);

  it('shows the reflash caution on the consent step', async () => {
    await setup(['member']);
    const caution = root.querySelector('rw-caution');
    expect(caution?.getAttribute('aria-label')).toBe("Caution: A reflash can erase the radio's settings");
    expect(caution?.textContent).toContain('Settings and memories may be lost.');
  }, SLOW);
});
