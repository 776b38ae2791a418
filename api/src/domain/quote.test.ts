// Quote arithmetic: worked examples by hand (no published source for a club's quote; the rounding
// is common commercial practice, no published source); minor-unit digits from ISO 4217.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { currencyMinorDigits, decimalToMinor, formatMoney, isCurrencyCode, lineTotalMinor, minorToDecimal, needsOwnerApproval, quantityToHundredths, quoteTotalMinor } from './quote';

test('line totals: quantity in hundredths × unit price in minor units, rounded half up (worked by hand)', () => {
  // 2 × £12.50 = £25.00 → 200 × 1250 / 100 = 2500.
  assert.equal(lineTotalMinor({ quantityHundredths: 200, unitPriceMinor: 1250 }), 2500);
  // 1.5 h × £18.00 = £27.00 → 150 × 1800 / 100 = 2700.
  assert.equal(lineTotalMinor({ quantityHundredths: 150, unitPriceMinor: 1800 }), 2700);
  // 0.25 h × £18.33 = £4.5825 → 458.25p, rounds to 458p.
  assert.equal(lineTotalMinor({ quantityHundredths: 25, unitPriceMinor: 1833 }), 458);
  // 0.5 × £0.05 = 2.5p, half up → 3p.
  assert.equal(lineTotalMinor({ quantityHundredths: 50, unitPriceMinor: 5 }), 3);
  // 0.5 × £0.03 = 1.5p → 2p; 0.01 × £0.49 = 0.49p → 0p.
  assert.equal(lineTotalMinor({ quantityHundredths: 50, unitPriceMinor: 3 }), 2);
  assert.equal(lineTotalMinor({ quantityHundredths: 1, unitPriceMinor: 49 }), 0);
  // The largest line: 1000 × 100 000.00 = 100 000 000.00 → 10 000 000 000 minor units, exact.
  assert.equal(lineTotalMinor({ quantityHundredths: 100_000, unitPriceMinor: 10_000_000 }), 10_000_000_000);
});

test('quote total is the sum of the rounded line totals (worked by hand)', () => {
  // Diagnosis £15.00 + 1.5 h labour at £18.00 (£27.00) + 2 × final transistor at £14.75 (£29.50) = £71.50.
  const lines = [
    { quantityHundredths: 100, unitPriceMinor: 1500 },
    { quantityHundredths: 150, unitPriceMinor: 1800 },
    { quantityHundredths: 200, unitPriceMinor: 1475 },
  ];
  assert.equal(quoteTotalMinor(lines), 7150);
  // Rounding per line, not on the sum: 3 × (0.5 × 3p = 1.5p → 2p) = 6p (on the sum it would be 4.5p → 5p).
  assert.equal(quoteTotalMinor([1, 2, 3].map(() => ({ quantityHundredths: 50, unitPriceMinor: 3 }))), 6);
  assert.equal(quoteTotalMinor([]), 0);
});

test('bad amounts are refused, never rounded into something else', () => {
  assert.throws(() => lineTotalMinor({ quantityHundredths: 0, unitPriceMinor: 100 }));
  assert.throws(() => lineTotalMinor({ quantityHundredths: 100, unitPriceMinor: -1 }));
  assert.throws(() => lineTotalMinor({ quantityHundredths: 100, unitPriceMinor: 12.5 }));
  assert.equal(quantityToHundredths(1.5), 150);
  assert.equal(quantityToHundredths(0.1), 10); // 0.1 × 100 = 10.000000000000002 in binary: still 10
  assert.equal(quantityToHundredths(2.35), 235);
  assert.throws(() => quantityToHundredths(1.005), /two decimals/);
  assert.throws(() => quantityToHundredths(0), /above zero/);
  assert.throws(() => quantityToHundredths(1000.01), /up to 1000/);
});

test('approval only strictly above the threshold', () => {
  assert.equal(needsOwnerApproval(5000, 5000), false);
  assert.equal(needsOwnerApproval(5001, 5000), true);
  assert.equal(needsOwnerApproval(0, 0), false);
});

test('minor-unit digits follow ISO 4217 (GBP 2, EUR 2, JPY 0, KWD 3)', () => {
  assert.equal(currencyMinorDigits('GBP'), 2);
  assert.equal(currencyMinorDigits('EUR'), 2);
  assert.equal(currencyMinorDigits('JPY'), 0);
  assert.equal(currencyMinorDigits('KWD'), 3);
  assert.equal(isCurrencyCode('GBP'), true);
  assert.equal(isCurrencyCode('gbp'), false);
  assert.equal(isCurrencyCode('XYZ'), false);
});

test('amounts written out exactly from minor units', () => {
  assert.equal(minorToDecimal(7150, 'GBP'), '71.50');
  assert.equal(minorToDecimal(5, 'GBP'), '0.05');
  assert.equal(minorToDecimal(1500, 'JPY'), '1500');
  assert.equal(minorToDecimal(1234, 'KWD'), '1.234');
  assert.equal(formatMoney(7150, 'GBP'), '£71.50');
  assert.equal(formatMoney(123456789, 'GBP'), '£1,234,567.89');
  assert.equal(decimalToMinor('72.5', 'GBP'), 7250);
  assert.equal(decimalToMinor('72,50', 'GBP'), 7250);
  assert.equal(decimalToMinor('0.05', 'GBP'), 5);
  assert.equal(decimalToMinor('1500', 'JPY'), 1500);
  assert.equal(decimalToMinor('15.5', 'JPY'), null);
  assert.equal(decimalToMinor('1.005', 'GBP'), null);
  assert.equal(decimalToMinor('-1', 'GBP'), null);
});
