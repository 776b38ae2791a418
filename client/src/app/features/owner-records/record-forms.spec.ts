import { FormControl } from '@angular/forms';
import { measurementValidator, optionalNumber, priceValidator, quantityValidator, recordFieldMessage } from './record-forms';

describe('bench record form validation', () => {
  it('measurements: empty is fine, numbers in range pass, text and out-of-range values get a message', () => {
    const v = measurementValidator(60, 'V');
    expect(v(new FormControl(''))).toBeNull();
    expect(v(new FormControl('13,2'))).toBeNull();
    expect(v(new FormControl('thirteen'))?.['measurement']).toContain('number in V');
    expect(v(new FormControl('75'))?.['measurement']).toBe('Give a value from 0 to 60 V.');
    expect(optionalNumber('13,2')).toBe(13.2);
    expect(optionalNumber('')).toBeNull();
  });

  it('quantities: above zero, at most two decimals', () => {
    expect(quantityValidator(new FormControl('1.5'))).toBeNull();
    expect(quantityValidator(new FormControl('0'))?.['quantity']).toContain('above 0');
    expect(quantityValidator(new FormControl('1.005'))?.['quantity']).toContain('two decimals');
    expect(quantityValidator(new FormControl(''))?.['quantity']).toContain('Enter a quantity');
  });

  it('prices: in the currency’s minor unit (GBP two decimals, JPY none)', () => {
    let currency = 'GBP';
    const v = priceValidator(() => currency);
    expect(v(new FormControl('12.50'))).toBeNull();
    expect(v(new FormControl('12.505'))?.['price']).toContain('GBP');
    currency = 'JPY';
    expect(v(new FormControl('1500'))).toBeNull();
    expect(v(new FormControl('15.5'))).not.toBeNull();
    const c = new FormControl('x', { validators: quantityValidator });
    expect(recordFieldMessage(c, 'the quantity')).toContain('number');
  });
});
