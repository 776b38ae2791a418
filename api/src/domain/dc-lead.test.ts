import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { copperOhmPerMetre, copperResistanceAt, dcLeadDrop, gaugeLabel, leadAmpacity, suggestedFuseA } from './dc-lead';
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
    it(`AWG ${awg}: ${ohmPerKft} ohm/kFT at 75 °C (NEC Ch. 9 Table 8) = ${(ohmPerKft / 0.3048).toFixed(2)} mΩ/m`, () => {
      close(copperOhmPerMetre({ awg }, 75).ohmPerM, ohmPerKft / 304.8, 1e-12);
    });
  }
  it('AWG 12 is 6.50 mΩ/m at 75 °C (1.98 / 304.8 = 0.0064961) and 5.34 mΩ/m at 20 °C', () => {
    close(copperOhmPerMetre({ awg: 12 }, 75).ohmPerM, 0.0064961, 1e-7);
    // 0.0064961 / (1 + 0.00393 × 55) = 0.0064961 / 1.21615 = 0.0053415
    close(copperOhmPerMetre({ awg: 12 }).ohmPerM, 0.0053415, 1e-7);
  });
  // IEC 60228 (2004) Table 3, class 5 flexible, plain annealed copper, maximum at 20 °C (Ω/km).
  const iec: [1.5 | 2.5 | 4 | 6, number][] = [
    [1.5, 13.3],
    [2.5, 7.98],
    [4, 4.95],
    [6, 3.3],
  ];
  for (const [mm2, ohmPerKm] of iec) {
    it(`${mm2} mm²: ${ohmPerKm} Ω/km at 20 °C (IEC 60228 class 5)`, () => {
      close(copperOhmPerMetre({ mm2 }, 20).ohmPerM, ohmPerKm / 1000, 1e-12);
    });
  }
  it('both tables at one temperature: ordered by cross-section (AWG 18 0.82, 16 1.31, 1.5, 14 2.08, 2.5, 12 3.31, 4, 10 5.26, 6 mm²)', () => {
    // Cross-sections of the AWG sizes: ASTM B258 (from memory), rounded.
    const byArea = [{ awg: 18 }, { awg: 16 }, { mm2: 1.5 }, { awg: 14 }, { mm2: 2.5 }, { awg: 12 }, { mm2: 4 }, { awg: 10 }, { mm2: 6 }] as const;
    for (const c of [20, 60]) {
      const r = byArea.map((g) => copperOhmPerMetre(g, c).ohmPerM);
      for (let i = 1; i < r.length; i++) assert.ok(r[i] < r[i - 1], `at ${c} °C: ${JSON.stringify(byArea[i])} should be below ${JSON.stringify(byArea[i - 1])}`);
    }
  });
  it("copper's α20 = 0.00393/K (IEC 60028) agrees with the NEC table's own note (α = 0.00323 at 75 °C) to 0.05 % from −20 to 90 °C", () => {
    // NEC Ch. 9 Table 8 note: R2 = R1 [1 + α (T2 − 75)], α_cu = 0.00323
    for (const t of [-20, 0, 20, 40, 60, 90]) {
      const nec = 1 + 0.00323 * (t - 75);
      const ours = copperResistanceAt(1, 75, t);
      assert.ok(Math.abs(ours / nec - 1) < 5e-4, `${t} °C: ${ours} vs ${nec}`);
    }
  });
  it('the answer says which temperature it used', () => {
    assert.match(copperOhmPerMetre({ awg: 12 }).source, /published at 75 °C, corrected to 20 °C/);
    assert.match(copperOhmPerMetre({ mm2: 2.5 }, 60).source, /published at 20 °C, corrected to 60 °C/);
    assert.equal(dcLeadDrop({ currentA: 1, lengthM: 1, gauge: { awg: 12 }, supplyV: 13.8 }).conductorC, 20);
    assert.equal(dcLeadDrop({ currentA: 1, lengthM: 1, gauge: { awg: 12 }, supplyV: 13.8, conductorC: 60 }).conductorC, 60);
  });
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
  it('20 A through 2 m of AWG 12 from 13.8 V at 20 °C: 0.43 V drop, 13.37 V at the radio, within ±15 %', () => {
    // R/m = 1.98 / 304.8 / 1.21615 = 0.00534150 Ω/m; out and back = 4 m → 0.0213660 Ω;
    // drop = 20 × 0.0213660 = 0.427320 V; at the radio 13.8 − 0.427320 = 13.372680 V;
    // band 13.8 × (1 ± 0.15) = 11.73 … 15.87 V → within.
    const d = dcLeadDrop({ currentA: 20, lengthM: 2, gauge: { awg: 12 }, supplyV: 13.8 });
    close(d.leadResistanceOhm, 0.021365993, 1e-8);
    close(d.dropV, 0.427319853, 1e-8);
    close(d.voltageAtRadioV, 13.372680147, 1e-8);
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
  it('20 A through 5 m of AWG 18 from 13.8 V: 4.29 V drop leaves 9.51 V, outside the band', () => {
    // 7.95 / 304.8 / 1.21615 = 0.0214469 Ω/m × 10 m = 0.214469 Ω; × 20 A = 4.289385 V; 13.8 − 4.289385 = 9.510615 V < 11.73 V
    const d = dcLeadDrop({ currentA: 20, lengthM: 5, gauge: { awg: 18 }, supplyV: 13.8 });
    close(d.dropV, 4.289384889, 1e-8);
    close(d.voltageAtRadioV, 9.510615111, 1e-8);
    assert.equal(d.withinTolerance, false);
  });
  it('a warm lead drops more: 22 A through 3 m of 2.5 mm² at 60 °C leaves 12.58 V', () => {
    // 7.98 mΩ/m × (1 + 0.00393 × 40) = 7.98 × 1.1572 = 9.234456 mΩ/m; × 6 m × 22 A = 1.218948 V
    const d = dcLeadDrop({ currentA: 22, lengthM: 3, gauge: { mm2: 2.5 }, supplyV: 13.8, conductorC: 60 });
    close(d.dropV, 1.218948192, 1e-8);
    close(d.voltageAtRadioV, 12.581051808, 1e-8);
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

describe('ampacity and fuse', () => {
  it('ampacity from NEC Table 400.5(A)(1) column B (AWG) and IEC 60335-1 Table 11 (mm²)', () => {
    const awg: [18 | 16 | 14 | 12 | 10, number][] = [[18, 10], [16, 13], [14, 18], [12, 25], [10, 30]];
    for (const [g, a] of awg) assert.equal(leadAmpacity({ awg: g }).ampacityA, a);
    const mm2: [1.5 | 2.5 | 4 | 6, number][] = [[1.5, 16], [2.5, 25], [4, 32], [6, 40]];
    for (const [g, a] of mm2) assert.equal(leadAmpacity({ mm2: g }).ampacityA, a);
    assert.match(leadAmpacity({ awg: 12 }).ampacitySource, /NEC Table 400\.5\(A\)\(1\)/);
    assert.match(leadAmpacity({ mm2: 4 }).ampacitySource, /IEC 60335-1 Table 11/);
  });
  it('25 A through 0.5 m of AWG 18 passes the voltage check but is past the ampacity (10 A)', () => {
    // 0.0214469 Ω/m × 1 m × 25 A = 0.536 V: 13.26 V at the radio, within the band; 25 A > 10 A
    const d = dcLeadDrop({ currentA: 25, lengthM: 0.5, gauge: { awg: 18 }, supplyV: 13.8 });
    assert.equal(d.withinTolerance, true);
    assert.equal(d.ampacityA, 10);
    assert.equal(d.withinAmpacity, false);
    assert.equal(d.fuseA, 35); // 25 × 1.25 = 31.25 → 35 A
    assert.equal(d.fuseProtectsLead, false);
  });
  it('20 A on AWG 12: within its 25 A, fuse 25 A (20 × 1.25), which protects the lead', () => {
    const d = dcLeadDrop({ currentA: 20, lengthM: 2, gauge: { awg: 12 }, supplyV: 13.8 });
    assert.equal(d.withinAmpacity, true);
    assert.equal(d.fuseA, 25);
    assert.equal(d.fuseProtectsLead, true);
  });
  it('the current equal to the ampacity is within it', () => {
    assert.equal(dcLeadDrop({ currentA: 25, lengthM: 1, gauge: { awg: 12 }, supplyV: 13.8 }).withinAmpacity, true);
  });
  it('fuse: the smallest standard rating at or above 125 % (common practice)', () => {
    assert.equal(suggestedFuseA(0), 1);
    assert.equal(suggestedFuseA(0.5), 1);
    assert.equal(suggestedFuseA(5.5), 7.5); // 6.875 → 7.5
    assert.equal(suggestedFuseA(8), 10);
    assert.equal(suggestedFuseA(22), 30); // 27.5 → 30
    assert.equal(suggestedFuseA(24), 30);
    assert.equal(suggestedFuseA(32), 40);
    assert.equal(suggestedFuseA(100), 150); // 125 → 150
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
  it('upper bounds: more than 100 A, 100 m, 60 V, a band over ±50 %, a conductor outside −20…90 °C', () => {
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, currentA: 101 })), 'currentA');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, lengthM: 101 })), 'lengthM');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, supplyV: 61 })), 'supplyV');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, nominalV: 61 })), 'nominalV');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, tolerancePct: 51 })), 'tolerancePct');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, conductorC: 120 })), 'conductorC');
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, conductorC: -40 })), 'conductorC');
  });
  it('a drop as large as the supply is refused (the lead cannot carry that current)', () => {
    // 100 A × 0.0214469 Ω/m × 2 × 10 m = 42.9 V > 13.8 V
    assert.equal(fieldOf(() => dcLeadDrop({ ...base, gauge: { awg: 18 }, lengthM: 10, currentA: 100 })), 'currentA');
  });
});
