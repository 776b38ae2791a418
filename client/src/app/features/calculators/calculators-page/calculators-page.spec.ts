import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, TestRequest } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { CalculatorsPage, RECOMPUTE_DEBOUNCE_MS } from './calculators-page';
import { minutesSeconds, secondsText, swrText } from '../calc-format';

// Figures the fake server answers with are the API's own worked examples (api/src/domain tests):
// 1 MiB in 1K CRC blocks at 115200 baud (Forsberg 1988 layout); 100 W / 4 W (Γ = 0.2, ARRL
// Handbook definitions); 20 A through 2 m of AWG 12 (NEC Ch. 9 Table 8).
const XMODEM_1MIB = { blocks: 1024, paddingBytes: 0, wireBytes: 1_053_697, seconds: 91.46675347222222 };
const RF_100_4 = { reflectionCoefficient: 0.2, swr: 1.5, returnLossDb: 13.979400086720377, mismatchLossDb: 0.17728766960431616, forwardDbm: 50 };
const DC_20A_2M_AWG12 = {
  gauge: 'AWG 12', source: 'NEC Chapter 9 Table 8, stranded uncoated copper, 75 °C', ohmPerM: 0.0064961,
  leadResistanceOhm: 0.025984252, dropV: 0.519685039, voltageAtRadioV: 13.280314961, nominalV: 13.8,
  tolerancePct: 15, minV: 11.73, maxV: 15.87, withinTolerance: true,
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
    dc.flush(DC_20A_2M_AWG12);
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
    expect(text('dc-drop')).toBe('0.52 V');
    expect(text('dc-at-radio')).toBe('13.28 V');
    expect(text('dc-tolerance')).toContain('Within');
    expect(text('dc-tolerance')).toContain('check_circle');
  });

  it('recomputes RF as you type: one call for the settled values, newest figures shown', async () => {
    one('/api/calc/xmodem').flush(XMODEM_1MIB);
    one('/api/calc/rf').flush(RF_100_4);
    one('/api/calc/dc-drop').flush(DC_20A_2M_AWG12);
    await settle();

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
    one('/api/calc/xmodem').flush(XMODEM_1MIB);
    one('/api/calc/rf').flush(RF_100_4);
    one('/api/calc/dc-drop').flush(DC_20A_2M_AWG12);
    await settle();

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
    one('/api/calc/xmodem').flush(XMODEM_1MIB);
    one('/api/calc/rf').flush({ ...RF_100_4, reflectionCoefficient: 0, swr: 1, returnLossDb: null, mismatchLossDb: 0 });
    one('/api/calc/dc-drop').flush(DC_20A_2M_AWG12);
    await settle();
    expect(text('rf-return-loss')).toBe('No reflection (unbounded)');

    fixture.componentInstance['dcForm'].controls.gauge.setValue('mm2:2.5');
    type('dc-supply', '12');
    await settle();
    const dc = one('/api/calc/dc-drop');
    expect(dc.request.params.get('mm2')).toBe('2.5');
    expect(dc.request.params.has('awg')).toBe(false);
    expect(dc.request.params.get('supplyV')).toBe('12');
    dc.flush({ ...DC_20A_2M_AWG12, gauge: '2.5 mm²', dropV: 0.6384, voltageAtRadioV: 11.3616, withinTolerance: false });
    await settle();
    expect(text('dc-at-radio')).toBe('11.36 V');
    expect(text('dc-tolerance')).toContain('Outside');
    expect(text('dc-tolerance')).toContain('warning');
  });

  it('does not call the API while a field is empty, and shows a message that belongs to no field above the card', async () => {
    one('/api/calc/xmodem').flush(XMODEM_1MIB);
    one('/api/calc/rf').flush(RF_100_4);
    one('/api/calc/dc-drop').flush(DC_20A_2M_AWG12);
    await settle();

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
});
