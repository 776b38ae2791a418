import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { copperOhmPerMetre, dcLeadDrop, gaugeLabel } from './dc-lead';
import { CalcInputError } from './input-error';

const close = (actual: number, expected: number, eps = 1e-9) =>
  assert.ok(Math.abs(actual - expected) <= eps, `${actual} ≠ ${expected}`);

describe('copper resistance per metre', () => {
  // NFPA 70 (NEC) Chapter 9 Table 8, uncoated copper, stranded, DC at 75 °C (ohm/kFT), ÷ 304.8 m/kft.
  const nec: [10 | 12 | 14 | 16 | 18, number][] = [
    [18, 7.95],
    [16, 4.99],
    [14, 3.14],
    [12, 1.98],
    [10, 1.24],
  ];
  for (const [awg, ohmPerKft] of nec) {
    it(`AWG ${awg}: ${ohmPerKft} ohm/kFT (NEC Ch. 9 Table 8) = ${(ohmPerKft / 0.3048).toFixed(2)} mΩ/m`, () => {
      close(copperOhmPerMetre({ awg }).ohmPerM, ohmPerKft / 304.8, 1e-12);
    });
  }
  it('AWG 12 is 6.50 mΩ/m (1.98 / 304.8 = 0.0064961)', () => {
    close(copperOhmPerMetre({ awg: 12 }).ohmPerM, 0.0064961, 1e-7);
  });
  // IEC 60228 (2004) Table 3, class 5 flexible, plain annealed copper, maximum at 20 °C (Ω/km).
  const iec: [1.5 | 2.5 | 4 | 6, number][] = [
    [1.5, 13.3],
    [2.5, 7.98],
    [4, 4.95],
    [6, 3.3],
  ];
  for (const [mm2, ohmPerKm] of iec) {
    it(`${mm2} mm²: ${ohmPerKm} Ω/km (IEC 60228 class 5)`, () => {
      close(copperOhmPerMetre({ mm2 }).ohmPerM, ohmPerKm / 1000, 1e-12);
    });
  }
  it('each table gets smaller as the conductor gets larger', () => {
    const awg = [18, 16, 14, 12, 10].map((g) => copperOhmPerMetre({ awg: g as 18 }).ohmPerM);
    const mm2 = [1.5, 2.5, 4, 6].map((g) => copperOhmPerMetre({ mm2: g as 1.5 }).ohmPerM);
    for (const list of [awg, mm2]) for (let i = 1; i < list.length; i++) assert.ok(list[i] < list[i - 1]);
  });
  it('unknown gauges are refused on their own field', () => {
    assert.throws(() => copperOhmPerMetre({ awg: 13 as 12 }), (e: unknown) => e instanceof CalcInputError && e.field === 'awg');
    assert.throws(() => copperOhmPerMetre({ mm2: 2 as 2.5 }), (e: unknown) => e instanceof CalcInputError && e.field === 'mm2');
  });
  it('labels', () => {
    assert.equal(gaugeLabel({ awg: 12 }), 'AWG 12');
    assert.equal(gaugeLabel({ mm2: 2.5 }), '2.5 mm²');
  });
});

describe('voltage drop worked by hand', () => {
  it('20 A through 2 m of AWG 12 from 13.8 V: 0.52 V drop, 13.28 V at the radio, within ±15 %', () => {
    // R/m = 1.98 / 304.8 = 0.0064961 Ω/m; out and back = 4 m → 0.0259843 Ω;
    // drop = 20 × 0.0259843 = 0.519685 V; at the radio 13.8 − 0.519685 = 13.280315 V;
    // band 13.8 × (1 ± 0.15) = 11.73 … 15.87 V → within.
    const d = dcLeadDrop({ currentA: 20, lengthM: 2, gauge: { awg: 12 }, supplyV: 13.8 });
    close(d.leadResistanceOhm, 0.025984252, 1e-8);
    close(d.dropV, 0.519685039, 1e-8);
    close(d.voltageAtRadioV, 13.280314961, 1e-8);
    close(d.minV, 11.73, 1e-9);
    close(d.maxV, 15.87, 1e-9);
    assert.equal(d.withinTolerance, true);
    assert.equal(d.gauge, 'AWG 12');
  });
  it('22 A through 3 m of 2.5 mm² from 13.8 V: 1.05 V drop, 12.75 V at the radio', () => {
    // 7.98 mΩ/m × 6 m = 0.04788 Ω; × 22 A = 1.05336 V; 13.8 − 1.05336 = 12.74664 V
    const d = dcLeadDrop({ currentA: 22, lengthM: 3, gauge: { mm2: 2.5 }, supplyV: 13.8 });
    close(d.dropV, 1.05336, 1e-9);
    close(d.voltageAtRadioV, 12.74664, 1e-9);
    assert.equal(d.withinTolerance, true);
  });
  it('20 A through 5 m of AWG 18 from 13.8 V: 5.22 V drop leaves 8.58 V, outside the band', () => {
    // 7.95 / 304.8 × 10 m = 0.260827 Ω; × 20 A = 5.216535 V; 13.8 − 5.216535 = 8.583465 V < 11.73 V
    const d = dcLeadDrop({ currentA: 20, lengthM: 5, gauge: { awg: 18 }, supplyV: 13.8 });
    close(d.dropV, 5.216535433, 1e-8);
    close(d.voltageAtRadioV, 8.583464567, 1e-8);
    assert.equal(d.withinTolerance, false);
  });
  it('a supply set too high is outside the band too (16.5 V, nothing drawn)', () => {
    const d = dcLeadDrop({ currentA: 0, lengthM: 2, gauge: { awg: 10 }, supplyV: 16.5 });
    assert.equal(d.dropV, 0);
    assert.equal(d.withinTolerance, false);
  });
  it('the band is configurable: ±10 % of 13.8 V is 12.42–15.18 V', () => {
    // 12.74664 V from the 2.5 mm² example: inside ±15 %, inside ±10 % (≥ 12.42), outside ±5 % (< 13.11)
    const base = { currentA: 22, lengthM: 3, gauge: { mm2: 2.5 as const }, supplyV: 13.8 };
    const ten = dcLeadDrop({ ...base, tolerancePct: 10 });
    close(ten.minV, 12.42, 1e-9);
    close(ten.maxV, 15.18, 1e-9);
    assert.equal(ten.withinTolerance, true);
    assert.equal(dcLeadDrop({ ...base, tolerancePct: 5 }).withinTolerance, false);
    // a 12 V nominal radio with ±5 %: 11.4–12.6 V, and 12.75 V is above it
    assert.equal(dcLeadDrop({ ...base, nominalV: 12, tolerancePct: 5 }).withinTolerance, false);
  });
  it('the edge of the band counts as within', () => {
    // supply exactly at the lower edge with no current
    assert.equal(dcLeadDrop({ currentA: 0, lengthM: 1, gauge: { awg: 12 }, supplyV: 11.73 }).withinTolerance, true);
  });
});

describe('refused inputs', () => {
  const base = { currentA: 10, lengthM: 2, gauge: { awg: 12 as const }, supplyV: 13.8 };
  const fieldOf = (fn: () => unknown) => {
    try { fn(); } catch (e) { if (e instanceof CalcInputError) return e.field; throw e; }
    return 'none';
  };
  it('negative current or length, zero supply, NaN, a band of 100 % or more', () => {
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, currentA: -1 })), 'currentA');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, lengthM: -2 })), 'lengthM');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, supplyV: 0 })), 'supplyV');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, currentA: Number.NaN })), 'currentA');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, tolerancePct: 100 })), 'tolerancePct');
  });
  it('a drop as large as the supply is refused (the lead cannot carry that current)', () => {
    // 1000 A × 0.0259843 Ω = 25.98 V > 13.8 V
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, currentA: 1000 })), 'currentA');
  });
});
