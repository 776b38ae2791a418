import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import {
  allocatePayment,
  balanceOf,
  formatMoney,
  lineAmount,
  majorUnits,
  minorUnitDigits,
  nextMonth,
  parseMajorUnits,
  priceOn,
  processingFee,
  rateFor,
  requireMinorUnits,
  sumMinor,
  type FeePrice,
} from './money';
import { CalcInputError } from './input-error';

describe('minor units (ISO 4217 minor-unit column)', () => {
  it('GBP and EUR have 2 digits, JPY 0, BHD 3 (ISO 4217 list one, minor unit column)', () => {
    assert.equal(minorUnitDigits('GBP'), 2);
    assert.equal(minorUnitDigits('EUR'), 2);
    assert.equal(minorUnitDigits('JPY'), 0);
    assert.equal(minorUnitDigits('BHD'), 3);
  });
  it('formats exactly: 1250 GBP is £12.50, 5 is £0.05, -300 is -£3.00, 123456789 is £1,234,567.89 (worked by hand)', () => {
    assert.equal(formatMoney(1250, 'GBP'), '£12.50');
    assert.equal(formatMoney(5, 'GBP'), '£0.05');
    assert.equal(formatMoney(-300, 'GBP'), '-£3.00');
    assert.equal(formatMoney(123456789, 'GBP'), '£1,234,567.89');
    assert.equal(formatMoney(500, 'JPY'), 'JP¥500'); // CLDR en-GB symbol for JPY
  });
  it('major units for CSV and parsing typed amounts without floats (0.1 + 0.2 never appears)', () => {
    assert.equal(majorUnits(1250, 'GBP'), '12.50');
    assert.equal(majorUnits(-7, 'GBP'), '-0.07');
    assert.equal(parseMajorUnits('12.5', 'GBP'), 1250);
    assert.equal(parseMajorUnits('0.30', 'GBP'), 30);
    assert.equal(parseMajorUnits('12', 'GBP'), 1200);
    assert.equal(parseMajorUnits('12.505', 'GBP'), null, 'more decimals than the currency has');
    assert.equal(parseMajorUnits('-1', 'GBP'), null);
    assert.equal(parseMajorUnits('1e3', 'GBP'), null);
  });
  it('refuses negative, fractional and non-number amounts with the field named', () => {
    for (const bad of [-1, 12.5, Number.NaN, '12' as unknown as number, 10_000_001]) {
      assert.throws(() => requireMinorUnits('amount', bad), (e: unknown) => e instanceof CalcInputError && e.field === 'amount');
    }
    assert.equal(requireMinorUnits('amount', 0), 0);
    assert.throws(() => requireMinorUnits('amount', 0, 1), CalcInputError);
    assert.throws(() => sumMinor([1, 0.5]), CalcInputError);
  });
});

describe('fee schedule: member and non-member prices across an effective-date change (worked example)', () => {
  // Diagnosis fee: £5.00 / £8.00 from 2026-01-01, raised to £6.00 / £9.50 from 2026-04-01.
  const diagnosis: FeePrice[] = [
    { effectiveFrom: '2026-04-01', memberPrice: 600, nonMemberPrice: 950 },
    { effectiveFrom: '2026-01-01', memberPrice: 500, nonMemberPrice: 800 },
  ];
  it('before the first price there is none', () => assert.equal(priceOn(diagnosis, '2025-12-31'), null));
  it('31 March: the old price (member 500, non-member 800)', () => {
    const p = priceOn(diagnosis, '2026-03-31')!;
    assert.equal(rateFor(p, true), 500);
    assert.equal(rateFor(p, false), 800);
  });
  it('1 April: the new price (member 600, non-member 950)', () => {
    const p = priceOn(diagnosis, '2026-04-01')!;
    assert.equal(rateFor(p, true), 600);
    assert.equal(rateFor(p, false), 950);
  });
  it('labour at £12.00 an hour × 3 hours = £36.00 (3600)', () => assert.equal(lineAmount(1200, 3), 3600));
  it('quantity must be a whole number from 1 to 1000', () => {
    assert.throws(() => lineAmount(1200, 0), CalcInputError);
    assert.throws(() => lineAmount(1200, 1.5), CalcInputError);
  });
});

describe('balances: charges − waivers − payments + refunds (worked examples)', () => {
  it('a member: session £3.00 + diagnosis £5.00 + parts £4.37 = £12.37 owed', () => {
    assert.equal(balanceOf({ charges: sumMinor([300, 500, 437]), waivers: 0, payments: 0, refunds: 0 }), 1237);
  });
  it('partial waiver of £2.00 with a payment of £10.37 settles it (1237 − 200 − 1037 = 0)', () => {
    assert.equal(balanceOf({ charges: 1237, waivers: 200, payments: 1037, refunds: 0 }), 0);
  });
  it('a refund of £1.50 after settlement makes £1.50 owed again (0 + 150)', () => {
    assert.equal(balanceOf({ charges: 1237, waivers: 200, payments: 1037, refunds: 150 }), 150);
  });
  it('a full waiver settles without a payment', () => assert.equal(balanceOf({ charges: 800, waivers: 800, payments: 0, refunds: 0 }), 0));
  it('paying too much gives a negative balance (a refund is owed)', () => assert.equal(balanceOf({ charges: 500, waivers: 0, payments: 700, refunds: 0 }), -200));
});

describe('allocating a payment to charges (oldest first)', () => {
  it('£10.00 over open charges 300, 500, 437 → 300, 500, 200, nothing left over', () => {
    const r = allocatePayment(1000, [
      { chargeId: 1, open: 300 },
      { chargeId: 2, open: 500 },
      { chargeId: 3, open: 437 },
    ]);
    assert.deepEqual(r.allocations, [
      { chargeId: 1, amount: 300 },
      { chargeId: 2, amount: 500 },
      { chargeId: 3, amount: 200 },
    ]);
    assert.equal(r.unallocated, 0);
  });
  it('skips settled charges and reports what is left over', () => {
    const r = allocatePayment(900, [
      { chargeId: 1, open: 0 },
      { chargeId: 2, open: 500 },
    ]);
    assert.deepEqual(r.allocations, [{ chargeId: 2, amount: 500 }]);
    assert.equal(r.unallocated, 400);
  });
});

describe('processing fee of the provider (percentage half up + fixed)', () => {
  // UK standard cards 1.5% + 20p (stripe.com/gb/pricing, from memory): £12.37 → 18.555p → 19p + 20p = 39p.
  it('1237 at 150 bp + 20 = 39', () => assert.equal(processingFee(1237, 150, 20), 39));
  it('1000 at 150 bp + 20 = 35 (exactly 15 + 20)', () => assert.equal(processingFee(1000, 150, 20), 35));
  it('1233 at 150 bp + 20: 18.495 rounds down to 18 → 38', () => assert.equal(processingFee(1233, 150, 20), 38));
  it('1234 at 150 bp + 20: 18.51 rounds up to 19 → 39', () => assert.equal(processingFee(1234, 150, 20), 39));
});

describe('months', () => {
  it('next month rolls the year', () => {
    assert.equal(nextMonth('2026-12'), '2027-01');
    assert.equal(nextMonth('2026-03'), '2026-04');
  });
});
