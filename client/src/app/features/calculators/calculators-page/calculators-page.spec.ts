import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, TestRequest } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { CalculatorsPage, RECOMPUTE_DEBOUNCE_MS } from './calculators-page';
import { minutesSeconds, secondsText, siText, signedPercent, sMeterText, swrText } from '../calc-format';
import { signalLevel } from '@domain/levels';
import { dummyLoadFigures } from '@domain/dummy-load';
import { attenuatorPad } from '@domain/attenuator';
import { coaxLineLoss, lineLossWithSwr } from '@domain/line-loss';
import { capacitorDischarge } from '@domain/discharge';
import { dcLeadDrop } from '@domain/dc-lead';

// Figures the fake server answers with are the API's own worked examples (api/src/domain tests):
// 1 MiB in 1K CRC blocks at 115200 baud (Forsberg 1988 layout); 100 W / 4 W (Γ = 0.2, ARRL
// Handbook definitions); 20 A through 2 m of AWG 12 (NEC Ch. 9 Table 8, corrected to 20 °C). The
// new cards' answers are made by the shared domain functions themselves (the same code the API runs).
const XMODEM_1MIB = { blocks: 1024, paddingBytes: 0, wireBytes: 1_053_697, seconds: 91.46675347222222 };
const RF_100_4 = { reflectionCoefficient: 0.2, swr: 1.5, returnLossDb: 13.979400086720377, mismatchLossDb: 0.17728766960431616, forwardDbm: 50 };
const DC_20A_2M_AWG12 = dcLeadDrop({ currentA: 20, lengthM: 2, gauge: { awg: 12 }, supplyV: 13.8 });
const OTHER_CARDS: Record<string, object> = {
  '/api/calc/level': signalLevel(-73, 'dBm'),
  '/api/calc/dummy-load': dummyLoadFigures(100, 50),
  '/api/calc/attenuator': attenuatorPad(10, 50, 'pi', 5),
  '/api/calc/line-loss': coaxLineLoss('lmr-400', 30, 14.2, 2),
  '/api/calc/discharge': capacitorDischarge(400, 470e-6, 100_000),
};

describe('CalculatorsPage', () => {
  let fixture: ComponentFixture<CalculatorsPage>;
  let http: HttpTestingController;
  let el: HTMLElement;

  /** Lets the (zero) debounce fire and the view catch up. */
  async function settle() {
    await new Promise((resolve) => setTimeout(resolve, 5));
    await fixture.whenStable();
  }

  function type(testId: string, value: string) {
    const input = el.querySelector<HTMLInputElement>(`[data-testid="${testId}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
  }

  const text = (testId: string) => el.querySelector(`[data-testid="${testId}"]`)?.textContent?.replace(/\s+/g, ' ').trim();
  const one = (path: string): TestRequest => http.expectOne((r) => r.url === path);

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), { provide: RECOMPUTE_DEBOUNCE_MS, useValue: 0 }],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CalculatorsPage);
    el = fixture.nativeElement;
    await settle();
  });

  afterEach(() => http.verify());

  /** Answers the first requests of every card: the three page cards as given, the others from OTHER_CARDS. */
  async function answerAll(first: { xmodem?: object; rf?: object; dc?: object } = {}) {
    one('/api/calc/xmodem').flush(first.xmodem ?? XMODEM_1MIB);
    one('/api/calc/rf').flush(first.rf ?? RF_100_4);
    one('/api/calc/dc-drop').flush(first.dc ?? DC_20A_2M_AWG12);
    for (const [path, body] of Object.entries(OTHER_CARDS)) one(path).flush(body);
    await settle();
  }

  it('asks the API for all three cards with the starting values and shows the figures with units', async () => {
    const x = one('/api/calc/xmodem');
    expect(x.request.method).toBe('GET');
    expect(x.request.params.get('bytes')).toBe('1048576');
    expect(x.request.params.get('block')).toBe('1024');
    expect(x.request.params.get('check')).toBe('crc');
    expect(x.request.params.get('baud')).toBe('115200');
    x.flush(XMODEM_1MIB);
    one('/api/calc/rf').flush(RF_100_4);
    const dc = one('/api/calc/dc-drop');
    expect(dc.request.params.get('awg')).toBe('12');
    expect(dc.request.params.has('mm2')).toBe(false);
    expect(dc.request.params.get('conductorC')).toBe('20');
    dc.flush(DC_20A_2M_AWG12);
    for (const [path, body] of Object.entries(OTHER_CARDS)) one(path).flush(body);
    await settle();

    expect(text('xmodem-blocks')).toBe('1,024');
    expect(text('xmodem-padding')).toBe('0 bytes');
    expect(text('xmodem-wire')).toBe('1,053,697 bytes');
    expect(text('xmodem-time')).toBe('1:31 (91.5 s)');
    expect(text('rf-swr')).toBe('1.50:1');
    expect(text('rf-gamma')).toBe('0.200');
    expect(text('rf-return-loss')).toBe('13.98 dB');
    expect(text('rf-mismatch-loss')).toBe('0.18 dB');
    expect(text('rf-dbm')).toBe('50.0 dBm');
    expect(text('dc-drop')).toBe('0.43 V');
    expect(text('dc-at-radio')).toBe('13.37 V');
    expect(text('dc-tolerance')).toContain('Within');
    expect(text('dc-tolerance')).toContain('check_circle');
    expect(text('dc-ampacity')).toContain('Within');
    expect(text('dc-ampacity')).toContain('25 A');
    expect(text('dc-fuse')).toBe('25 A protects this lead');
  });

  it('recomputes RF as you type: one call for the settled values, newest figures shown', async () => {
    await answerAll();

    type('rf-forward', '90');
    type('rf-reflected', '10');
    await settle();
    const calls = http.match((r) => r.url === '/api/calc/rf');
    expect(calls.length).toBe(1); // both keystrokes fell in one debounce window
    expect(calls[0].request.params.get('forwardW')).toBe('90');
    expect(calls[0].request.params.get('reflectedW')).toBe('10');
    calls[0].flush({ reflectionCoefficient: 1 / 3, swr: 2, returnLossDb: 9.542425094393248, mismatchLossDb: 0.5115252244738129, forwardDbm: 49.54242509439325 });
    await settle();
    expect(text('rf-swr')).toBe('2.00:1');
    expect(text('rf-return-loss')).toBe('9.54 dB');
    expect(text('rf-dbm')).toBe('49.5 dBm');
  });

  it("shows the server's field message on the matching control, and no figures", async () => {
    await answerAll();

    type('rf-reflected', '120');
    await settle();
    const message = 'Reflected power cannot be above forward power: check the meter direction.';
    one('/api/calc/rf').flush(
      { error: { code: 'validation_failed', message: `reflectedW: ${message}`, fields: { reflectedW: message } } },
      { status: 400, statusText: 'Bad Request' },
    );
    await settle();
    expect(text('rf-reflected-error')).toBe(message);
    expect(el.querySelector('[data-testid="rf-figures"]')).toBeNull();

    // Correcting the value clears the message and asks again.
    type('rf-reflected', '1');
    await settle();
    one('/api/calc/rf').flush({ ...RF_100_4, reflectionCoefficient: 0.1, swr: 1.2222222222222223, returnLossDb: 20, mismatchLossDb: 0.0436480540245009 });
    await settle();
    expect(el.querySelector('[data-testid="rf-reflected-error"]')).toBeNull();
    expect(text('rf-swr')).toBe('1.22:1');
  });

  it('maps the gauge to mm2, marks a voltage outside the band with a word and an icon, and shows unbounded return loss', async () => {
    await answerAll({ rf: { ...RF_100_4, reflectionCoefficient: 0, swr: 1, returnLossDb: null, mismatchLossDb: 0 } });
    expect(text('rf-return-loss')).toBe('No reflection (unbounded)');

    fixture.componentInstance['dcForm'].controls.gauge.setValue('mm2:2.5');
    type('dc-supply', '12');
    await settle();
    const dc = one('/api/calc/dc-drop');
    expect(dc.request.params.get('mm2')).toBe('2.5');
    expect(dc.request.params.has('awg')).toBe(false);
    expect(dc.request.params.get('supplyV')).toBe('12');
    dc.flush(dcLeadDrop({ currentA: 20, lengthM: 2, gauge: { mm2: 2.5 }, supplyV: 12 }));
    await settle();
    expect(text('dc-at-radio')).toBe('11.36 V'); // 12 − 20 A × 4 m × 7.98 mΩ/m (IEC 60228, 20 °C) = 12 − 0.6384
    expect(text('dc-tolerance')).toContain('Outside');
    expect(text('dc-tolerance')).toContain('warning');
  });

  it('does not call the API while a field is empty, and shows a message that belongs to no field above the card', async () => {
    await answerAll();

    type('xmodem-bytes', '');
    await settle();
    http.expectNone((r) => r.url === '/api/calc/xmodem');
    expect(el.querySelector('[data-testid="xmodem-figures"]')).toBeNull();

    type('xmodem-bytes', '2048');
    await settle();
    one('/api/calc/xmodem').flush({ error: { code: 'internal_error', message: 'Something went wrong on the server. Try again in a moment.' } }, { status: 500, statusText: 'Server Error' });
    await settle();
    expect(el.querySelector('[data-testid="xmodem-card"] [role="alert"]')?.textContent).toContain('Something went wrong');
  });
});

describe('CalculatorsPage: decimal commas, the new cards and the cautions', () => {
  let fixture: ComponentFixture<CalculatorsPage>;
  let http: HttpTestingController;
  let el: HTMLElement;

  async function settle() {
    await new Promise((resolve) => setTimeout(resolve, 5));
    await fixture.whenStable();
  }
  function type(testId: string, value: string) {
    const input = el.querySelector<HTMLInputElement>(`[data-testid="${testId}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
  }
  const text = (testId: string) => el.querySelector(`[data-testid="${testId}"]`)?.textContent?.replace(/\s+/g, ' ').trim();
  const one = (path: string): TestRequest => http.expectOne((r) => r.url === path);

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), { provide: RECOMPUTE_DEBOUNCE_MS, useValue: 0 }],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CalculatorsPage);
    el = fixture.nativeElement;
    await settle();
    one('/api/calc/xmodem').flush(XMODEM_1MIB);
    one('/api/calc/rf').flush(RF_100_4);
    one('/api/calc/dc-drop').flush(DC_20A_2M_AWG12);
    for (const [path, body] of Object.entries(OTHER_CARDS)) one(path).flush(body);
    await settle();
  });
  afterEach(() => http.verify());

  it('reads "2,5" as 2.5 (never 25) and sends it with a point', async () => {
    type('rf-forward', '2,5');
    type('rf-reflected', '0,1');
    await settle();
    const rf = one('/api/calc/rf');
    expect(rf.request.params.get('forwardW')).toBe('2.5');
    expect(rf.request.params.get('reflectedW')).toBe('0.1');
    rf.flush(RF_100_4);
    await settle();
  });

  it('refuses "1,000" with a message under the field and asks the server nothing', async () => {
    type('dc-current', '1,000');
    await settle();
    http.expectNone((r) => r.url === '/api/calc/dc-drop');
    const error = el.querySelector('[data-testid="dc-card"] mat-error')?.textContent ?? '';
    expect(error).toContain('1.000 or 1000');
    expect(el.querySelector('[data-testid="dc-figures"]')).toBeNull();
  });

  it('shows the signal level in every unit and the S-meter reading', async () => {
    expect(text('level-s')).toBe('S9');
    expect(text('level-dbm')).toBe('−73.0 dBm');
    expect(text('level-dbuv')).toBe('34.0 dBµV');
    expect(text('level-volts')).toBe('50.1 µV');
    expect(text('level-watts')).toBe('50.1 pW');
    type('level-value', '-63');
    await settle();
    const req = one('/api/calc/level');
    expect(req.request.params.get('unit')).toBe('dBm');
    expect(req.request.params.get('band')).toBe('hf');
    req.flush(signalLevel(-63, 'dBm'));
    await settle();
    expect(text('level-s')).toBe('S9 + 10 dB');
  });

  it('shows dummy-load voltages, pad values with E24 errors, line loss with its source, and the discharge time', async () => {
    expect(text('dummy-vpp')).toBe('200.0 V');
    expect(text('dummy-vrms')).toBe('70.71 V');
    expect(text('dummy-amps')).toBe('1.414 A');
    expect(text('pad-shunt')).toBe('96.2 Ω');
    expect(text('pad-series')).toBe('71.2 Ω');
    expect(text('pad-shunt-e24')).toBe('100 Ω +3.9 %');
    expect(text('pad-series-e24')).toBe('68.0 Ω −4.4 %');
    expect(text('pad-e24-db')).toBe('9.63 dB');
    expect(text('pad-first-w')).toBe('2.60 W');
    expect(text('line-source')).toContain('Times Microwave Systems LMR-400 datasheet');
    expect(text('line-total')).toMatch(/^\d+\.\d{2} dB$/);
    expect(text('discharge-time')).toBe('1:29 (89.2 s)');
    expect(text('discharge-joules')).toBe('37.6 J');
    expect(text('discharge-watts')).toBe('1.60 W');
  });

  it('sends µF and kΩ as farads and ohms', async () => {
    type('discharge-uf', '25');
    type('discharge-kohm', '50');
    type('discharge-volts', '3000');
    await settle();
    const req = one('/api/calc/discharge');
    expect(req.request.params.get('farads')).toBe('0.000025');
    expect(req.request.params.get('ohms')).toBe('50000');
    expect(req.request.params.get('volts')).toBe('3000');
    req.flush(capacitorDischarge(3000, 25e-6, 50_000));
    await settle();
    expect(text('discharge-joules')).toBe('113 J');
  });

  it('line loss: "Other" asks for the matched loss and sends it instead of a cable', async () => {
    expect(el.querySelector('[data-testid="line-card"] [data-testid="line-length"]')).not.toBeNull();
    const card = fixture.debugElement.query((d) => d.name === 'rw-line-loss-card').componentInstance as { form: { controls: { line: { setValue(v: string): void } } } };
    card.form.controls.line.setValue('typed');
    await settle();
    expect(el.querySelector('[data-testid="line-length"]')).toBeNull();
    const req = one('/api/calc/line-loss');
    expect(req.request.params.get('matchedLossDb')).toBe('1');
    expect(req.request.params.has('cable')).toBe(false);
    req.flush(lineLossWithSwr(1, 2));
    await settle();
    expect(text('line-matched-loss')).toBe('1.00 dB');
    expect(el.querySelector('[data-testid="line-source"]')).toBeNull();
  });

  it('marks a lead past its ampacity in words and an icon, and a fuse too big for it', async () => {
    type('dc-current', '25');
    type('dc-length', '0,5');
    await settle();
    const req = one('/api/calc/dc-drop');
    expect(req.request.params.get('lengthM')).toBe('0.5');
    req.flush(dcLeadDrop({ currentA: 25, lengthM: 0.5, gauge: { awg: 18 }, supplyV: 13.8 }));
    await settle();
    expect(text('dc-tolerance')).toContain('Within');
    expect(text('dc-ampacity')).toContain('Over: the lead will overheat');
    expect(text('dc-ampacity')).toContain('local_fire_department');
    expect(text('dc-fuse')).toBe('35 A too big for this lead: use a heavier one');
  });

  it('puts the mains / high-voltage caution beside the discharge card and the fusing caution beside the DC lead', () => {
    const discharge = el.querySelector('[data-testid="discharge-card"]')!.closest('.calc-row')!;
    expect(discharge.querySelector('rw-caution')?.textContent).toContain('Mains and stored charge can kill');
    const dc = el.querySelector('[data-testid="dc-card"]')!.closest('.calc-row')!;
    expect(dc.querySelector('rw-caution')?.textContent).toContain('fuse');
  });
});

describe('calculator formatting', () => {
  it('prints times as m:ss (h:mm:ss past an hour) and seconds with a fitting precision', () => {
    expect(minutesSeconds(91.46675347222222)).toBe('1:31');
    expect(minutesSeconds(10_536_970 / 9600)).toBe('18:18');
    expect(minutesSeconds(3725)).toBe('1:02:05');
    expect(minutesSeconds(0.023)).toBe('0:00');
    expect(secondsText(0.023177083333333334)).toBe('0.0232 s');
    expect(secondsText(1097.6)).toBe('1098 s');
    expect(swrText(1.5)).toBe('1.50:1');
  });
  it('prints SI prefixes with 3 significant figures, S-meter readings and signed percentages', () => {
    expect(siText(5.011872336272715e-11, 'W')).toBe('50.1 pW');
    expect(siText(0.00047, 'F')).toBe('470 µF');
    expect(siText(96.2475, 'Ω')).toBe('96.2 Ω');
    expect(siText(4700, 'Ω')).toBe('4.70 kΩ');
    expect(siText(0.9996, 'W')).toBe('1.00 W');
    expect(siText(0, 'J')).toBe('0 J');
    expect(sMeterText({ units: 9, overS9Db: 0 })).toBe('S9');
    expect(sMeterText({ units: 7.33, overS9Db: 0 })).toBe('S7.3');
    expect(sMeterText({ units: 9, overS9Db: 12.4 })).toBe('S9 + 12 dB');
    expect(sMeterText({ units: 9, overS9Db: 3.04 })).toBe('S9 + 3.0 dB');
    expect(signedPercent(3.898)).toBe('+3.9 %');
    expect(signedPercent(-4.43)).toBe('−4.4 %');
    expect(signedPercent(0.01)).toBe('0.0 %');
  });
});
