import { FormControl } from '@angular/forms';
import { decimalValidator, decimalValue, readDecimal } from './decimal';

describe('readDecimal (a decimal comma is read as the point or refused, never dropped)', () => {
  it('reads points and commas alike', () => {
    expect(readDecimal('2.5')).toEqual({ value: 2.5 });
    expect(readDecimal('2,5')).toEqual({ value: 2.5 });
    expect(readDecimal(' 13,8 ')).toEqual({ value: 13.8 });
    expect(readDecimal(',5')).toEqual({ value: 0.5 });
    expect(readDecimal('-0,25')).toEqual({ value: -0.25 });
    expect(readDecimal('1e-6')).toEqual({ value: 0.000001 });
    expect(readDecimal('1 000 000')).toEqual({ value: 1_000_000 });
    expect(readDecimal('1048576')).toEqual({ value: 1_048_576 });
  });
  it('never reads "2,5" as 25', () => {
    expect(decimalValue('2,5')).not.toBe(25);
  });
  it('refuses what could be a thousands separator, or mixes marks, with a message', () => {
    const thousand = readDecimal('1,000');
    expect(thousand && 'error' in thousand && thousand.error).toContain('1.000 or 1000');
    expect(readDecimal('1,000,000')).toEqual({ error: expect.stringContaining('no thousands separators') });
    expect(readDecimal('1.000,5')).toEqual({ error: expect.stringContaining('one decimal mark') });
    expect(readDecimal('12kB')).toEqual({ error: 'Enter a number, e.g. 2.5.' });
    expect(readDecimal('1e999')).toEqual({ error: 'Enter a number, e.g. 2.5.' });
  });
  it('empty is null; the validator says required, or gives the message', () => {
    expect(readDecimal('  ')).toBeNull();
    expect(decimalValidator(new FormControl(''))).toEqual({ required: true });
    expect(decimalValidator(new FormControl('2,5'))).toBeNull();
    expect(decimalValidator(new FormControl('2,500'))).toEqual({ decimal: expect.stringContaining('2.500 or 2500') });
    expect(Number.isNaN(decimalValue('abc'))).toBe(true);
  });
});
