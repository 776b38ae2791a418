// Feed-line loss with SWR. The relation is the ARRL Antenna Book's ("Transmission Lines"; from
// memory, edition not checked). Each value is worked by hand in its comment, and the relation is
// checked against an independent bookkeeping of the forward and reflected waves written here.
// Coax: Times Microwave Systems LMR datasheets' attenuation tables (dB/100 ft, printed to 0.1 dB),
// as reproduced by a club's published feed-line page, at 10, 30, 50, 150, 220 and 450 MHz.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { coaxLineLoss, lineLossWithSwr } from './line-loss';
import { coaxDbPer100ft, coaxMatchedLossDb, type CoaxType } from './coax';
import { CalcInputError } from './input-error';

const close = (actual: number, expected: number, eps = 1e-9) => assert.ok(Math.abs(actual - expected) <= eps, `${actual} ≠ ${expected}`);
const fieldOf = (fn: () => unknown) => {
  try { fn(); } catch (e) { if (e instanceof CalcInputError) return e.field; throw e; }
  return 'none';
};

/** Independent: follow 1 W of forward wave down the line and the reflection back. */
function wavesLossDb(matchedLossDb: number, swr: number): number {
  const a = 10 ** (matchedLossDb / 10);
  const g2 = ((swr - 1) / (swr + 1)) ** 2;
  const forwardAtLoad = 1 / a;
  const reflectedAtLoad = forwardAtLoad * g2;
  const reflectedBackAtInput = reflectedAtLoad / a;
  const intoLine = 1 - reflectedBackAtInput; // net power the transmitter delivers
  const intoLoad = forwardAtLoad - reflectedAtLoad; // net power the load takes
  return 10 * Math.log10(intoLine / intoLoad);
}

describe('total loss with SWR at the load', () => {
  it('1 dB matched loss at SWR 3:1: 1.50 dB total, 0.50 dB extra (worked by hand)', () => {
    // a = 10^0.1 = 1.258925; |Γ| = 0.5; (1.5848932 − 0.25) / (1.2589254 × 0.75) = 1.3348932 / 0.9441941 = 1.413791 → 1.5039 dB
    const l = lineLossWithSwr(1, 3);
    close(l.totalLossDb, 1.5038525490782206, 1e-9);
    close(l.extraLossDb, 0.5038525490782206, 1e-9);
    close(l.efficiency, 1 / 1.413791, 1e-6);
  });
  it('3.01 dB matched loss (a = 2) at SWR 3:1: 4.26 dB total, and the meter at the transmitter reads 1.67:1', () => {
    // a = 2, Γ² = 0.25: (4 − 0.25) / (2 × 0.75) = 2.5 → 3.9794 dB … with a = 10^(3.0103/10) = 2.0000
    // Γ_in = 0.5 / 2 = 0.25 → SWR_in = 1.25 / 0.75 = 1.6667
    const l = lineLossWithSwr(10 * Math.log10(2), 3);
    close(l.totalLossDb, 10 * Math.log10(2.5), 1e-9);
    close(l.swrAtInput, 5 / 3, 1e-9);
  });
  it('a matched load adds nothing; a lossless line loses nothing at any SWR', () => {
    const matched = lineLossWithSwr(2.5, 1);
    close(matched.totalLossDb, 2.5, 1e-12);
    assert.equal(matched.extraLossDb, 0);
    close(matched.swrAtInput, 1, 1e-12);
    const lossless = lineLossWithSwr(0, 10);
    close(lossless.totalLossDb, 0, 1e-12);
    close(lossless.swrAtInput, 10, 1e-9);
  });
  it('agrees with the wave bookkeeping everywhere', () => {
    for (const l of [0, 0.1, 0.5, 1, 2, 3, 6, 10, 30]) {
      for (const s of [1, 1.2, 1.5, 2, 3, 5, 10, 50, 100]) close(lineLossWithSwr(l, s).totalLossDb, wavesLossDb(l, s), 1e-9);
    }
  });
  it('refuses a negative or absurd matched loss, an SWR below 1 or above 100', () => {
    assert.equal(fieldOf(() => lineLossWithSwr(-1, 2)), 'matchedLossDb');
    assert.equal(fieldOf(() => lineLossWithSwr(31, 2)), 'matchedLossDb');
    assert.equal(fieldOf(() => lineLossWithSwr(1, 0.9)), 'swr');
    assert.equal(fieldOf(() => lineLossWithSwr(1, 101)), 'swr');
    assert.equal(fieldOf(() => lineLossWithSwr(1, Number.NaN)), 'swr');
  });
});

describe("coax matched loss from the maker's formula (Times Microwave LMR datasheets)", () => {
  // Datasheet tables, dB per 100 ft, printed to 0.1 dB.
  const tables: Record<CoaxType, [number, number][]> = {
    'lmr-240': [[10, 0.8], [30, 1.3], [50, 1.7], [150, 3.0], [220, 3.7], [450, 5.3]],
    'lmr-400': [[10, 0.4], [30, 0.7], [50, 0.9], [150, 1.5], [220, 1.9], [450, 2.7]],
    'lmr-600': [[10, 0.2], [30, 0.4], [50, 0.5], [150, 1.0], [220, 1.2], [450, 1.7]],
  };
  for (const [type, rows] of Object.entries(tables) as [CoaxType, [number, number][]][]) {
    it(`${type}: the formula rounds to the datasheet's table at ${rows.map((r) => r[0]).join(', ')} MHz`, () => {
      for (const [mhz, printed] of rows) {
        const value = coaxDbPer100ft(type, mhz);
        assert.ok(Math.abs(value - printed) <= 0.05 + 1e-9, `${type} at ${mhz} MHz: ${value.toFixed(3)} vs ${printed}`);
      }
    });
  }
  it('30 m of LMR-400 at 145 MHz: 1.49 dB (worked by hand)', () => {
    // 0.12229 × sqrt(145) + 0.00026 × 145 = 1.47256 + 0.03770 = 1.51026 dB/100 ft
    // ÷ 0.3048 = 4.95494 dB/100 m; × 0.30 = 1.48648 dB
    const c = coaxMatchedLossDb('lmr-400', 30, 145);
    close(c.dbPer100m, 4.954942916799573, 1e-9);
    close(c.matchedLossDb, 1.486482875039872, 1e-9);
  });
  it('and with SWR 2:1 at the antenna: 1.75 dB total (the line-loss relation on that matched loss)', () => {
    const l = coaxLineLoss('lmr-400', 30, 145, 2);
    close(l.matchedLossDb, 1.486482875039872, 1e-9);
    close(l.totalLossDb, wavesLossDb(1.486482875039872, 2), 1e-9);
    close(l.totalLossDb, 1.75, 0.005);
    assert.equal(l.cable.name, 'LMR-400');
    assert.match(l.cable.source, /Times Microwave Systems LMR-400 datasheet/);
  });
  it('refuses unknown cables, frequencies outside 0.1 MHz–6 GHz, lengths outside 0–1000 m, and a line over 30 dB', () => {
    assert.equal(fieldOf(() => coaxMatchedLossDb('rg-58' as CoaxType, 10, 14)), 'cable');
    assert.equal(fieldOf(() => coaxMatchedLossDb('lmr-400', 10, 0)), 'mhz');
    assert.equal(fieldOf(() => coaxMatchedLossDb('lmr-400', 10, 7000)), 'mhz');
    assert.equal(fieldOf(() => coaxMatchedLossDb('lmr-400', 0, 14)), 'lengthM');
    assert.equal(fieldOf(() => coaxMatchedLossDb('lmr-400', 1001, 14)), 'lengthM');
    assert.equal(fieldOf(() => coaxLineLoss('lmr-240', 1000, 2400, 1.5)), 'lengthM');
  });
});
