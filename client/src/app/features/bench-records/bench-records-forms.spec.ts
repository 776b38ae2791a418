import { FormControl, FormGroup } from '@angular/forms';
import { bandLineValidator, formatMinor, handBackItemValidator, mhzToHz, moneyValidator, toMinorUnits } from './bench-records-forms';

describe('bench record form rules', () => {
  it('reads money as integer minor units without floating point', () => {
    expect(toMinorUnits('12.50')).toBe(1250);
    expect(toMinorUnits('12')).toBe(1200);
    expect(toMinorUnits('0.5')).toBe(50);
    expect(toMinorUnits('0,07')).toBe(7);
    // 0.1 + 0.2 style slips cannot happen: 19.99 is 1999, not 1998.9999.
    expect(toMinorUnits('19.99')).toBe(1999);
    expect(toMinorUnits('-3')).toBeNull();
    expect(toMinorUnits('1.234')).toBeNull();
    expect(toMinorUnits('abc')).toBeNull();
    expect(formatMinor(4900)).toBe('49.00');
    expect(formatMinor(7)).toBe('0.07');
  });

  it('marks an amount it cannot read', () => {
    expect(moneyValidator(new FormControl('12.50'))).toBeNull();
    expect(moneyValidator(new FormControl('twelve'))).toEqual({ money: true });
  });

  it('turns MHz as typed into whole Hz', () => {
    expect(mhzToHz(14.200014)).toBe(14_200_014);
    expect(mhzToHz('7.1')).toBe(7_100_000);
    expect(mhzToHz(null)).toBeNull();
    expect(mhzToHz('')).toBeNull();
  });

  const band = (v: Partial<{ forwardW: number | null; reflectedW: number | null; nominalMHz: number | null; measuredMHz: number | null }>) =>
    new FormGroup({
      forwardW: new FormControl<number | null>(v.forwardW ?? 100),
      reflectedW: new FormControl<number | null>(v.reflectedW ?? 4),
      nominalMHz: new FormControl<number | null>(v.nominalMHz ?? null),
      measuredMHz: new FormControl<number | null>(v.measuredMHz ?? null),
    });

  it('refuses reflected power at or above forward power on a band line', () => {
    expect(bandLineValidator(band({}))).toBeNull();
    expect(bandLineValidator(band({ reflectedW: 120 }))).toEqual({ reflectedNotBelowForward: true });
    expect(bandLineValidator(band({ reflectedW: 100 }))).toEqual({ reflectedNotBelowForward: true });
  });

  it('wants both frequencies or neither', () => {
    expect(bandLineValidator(band({ nominalMHz: 14.2 }))).toEqual({ frequencyPair: true });
    expect(bandLineValidator(band({ nominalMHz: 14.2, measuredMHz: 14.200008 }))).toBeNull();
  });

  it('wants a note for an item that does not go back', () => {
    const item = (returned: boolean, note: string) => new FormGroup({ item: new FormControl('DC lead'), returned: new FormControl(returned), note: new FormControl(note) });
    expect(handBackItemValidator(item(true, ''))).toBeNull();
    expect(handBackItemValidator(item(false, ''))).toEqual({ noteNeeded: true });
    expect(handBackItemValidator(item(false, 'Kept by the owner at intake'))).toBeNull();
  });
});
