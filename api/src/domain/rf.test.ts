// Check values: the SWR → return loss / mismatch loss rows below are the SWR / return-loss /
// mismatch-loss table of The ARRL Handbook for Radio Communications ("Transmission Lines" chapter)
// as remembered: from memory, edition and table number not checked here. Because they are from
// memory, each row is also worked by hand in its comment from |Γ| = (SWR − 1) / (SWR + 1) and the
// definitions RL = −20 log10 |Γ|, ML = −10 log10 (1 − |Γ|²) (IEEE Std 100, 7th edition, 2000,
// entries "return loss" and "mismatch loss"; from memory).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import {
  FORWARD_W_BOUND,
  dbmToWatts,
  frequencyError,
  gammaFromSwr,
  mismatchLossDbFromGamma,
  powerErrorDb,
  returnLossDbFromGamma,
  rfFigures,
  swrFromGamma,
  wattsToDbm,
} from './rf';
import { CalcInputError } from './input-error';

const near = (actual: number | null, expected: number, places = 2) => {
  assert.notEqual(actual, null);
  assert.ok(Math.abs((actual as number) - expected) < 0.5 * 10 ** -places, `${actual} ≠ ${expected} to ${places} places`);
};

describe('SWR → return loss and mismatch loss (handbook table; values from memory, derived beside)', () => {
  const table: { swr: number; gamma: number; rl: number; ml: number }[] = [
    { swr: 1.1, gamma: 0.0476, rl: 26.44, ml: 0.01 }, // Γ = 0.1/2.1
    { swr: 1.2, gamma: 0.0909, rl: 20.83, ml: 0.04 }, // Γ = 0.2/2.2 = 1/11
    { swr: 1.5, gamma: 0.2, rl: 13.98, ml: 0.18 }, // Γ = 0.5/2.5; RL = 20 log10 5; ML = −10 log10 0.96
    { swr: 2.0, gamma: 0.3333, rl: 9.54, ml: 0.51 }, // Γ = 1/3; RL = 20 log10 3; ML = −10 log10 (8/9)
    { swr: 3.0, gamma: 0.5, rl: 6.02, ml: 1.25 }, // Γ = 1/2; RL = 20 log10 2; ML = −10 log10 0.75
    { swr: 5.0, gamma: 0.6667, rl: 3.52, ml: 2.55 }, // Γ = 2/3; RL = 20 log10 1.5; ML = −10 log10 (5/9)
    { swr: 10.0, gamma: 0.8182, rl: 1.74, ml: 4.81 }, // Γ = 9/11; ML = −10 log10 (40/121)
  ];
  for (const row of table) {
    it(`SWR ${row.swr}:1 → |Γ| ${row.gamma}, RL ${row.rl} dB, ML ${row.ml} dB`, () => {
      const g = gammaFromSwr(row.swr);
      near(g, row.gamma, 4);
      near(returnLossDbFromGamma(g), row.rl);
      near(mismatchLossDbFromGamma(g), row.ml);
      near(swrFromGamma(g), row.swr, 9);
    });
  }
});

describe('figures from forward and reflected power', () => {
  it('100 W forward, 4 W reflected: |Γ| = 0.2, SWR 1.50:1, RL 13.98 dB, ML 0.18 dB, 50 dBm', () => {
    // sqrt(4/100) = 0.2 exactly: the SWR 1.5 row above
    const f = rfFigures(100, 4);
    near(f.reflectionCoefficient, 0.2, 12);
    near(f.swr, 1.5, 12);
    near(f.returnLossDb, 13.979400086720377, 9);
    near(f.mismatchLossDb, 0.17728766960431616, 9);
    near(f.forwardDbm, 50, 12);
  });
  it('90 W forward, 10 W reflected: Γ² = 1/9, SWR 2:1, RL 9.54 dB', () => {
    const f = rfFigures(90, 10); // Γ = sqrt(1/9) = 1/3 exactly → SWR 2:1
    near(f.swr, 2, 9);
    near(f.returnLossDb, 9.54);
  });
  it('no reflected power: SWR 1:1, mismatch loss 0 dB, return loss unbounded (null)', () => {
    const f = rfFigures(5, 0);
    assert.equal(f.reflectionCoefficient, 0);
    assert.equal(f.swr, 1);
    assert.equal(f.returnLossDb, null);
    assert.equal(f.mismatchLossDb, 0);
    assert.ok(Object.is(f.mismatchLossDb, 0), 'mismatch loss must be +0, not −0');
  });
  it('any reflected power above zero gives a finite return loss, however small (never null)', () => {
    // RL = 10 log10 (Pf / Pr): 100 W and 1 µW → 10 log10 1e8 = 80 dB; the smallest double still finite
    near(rfFigures(100, 1e-6).returnLossDb, 80, 9);
    for (const [f, r] of [[100, 1e-12], [100, 1e-300], [10_000, Number.MIN_VALUE], [1e-9, Number.MIN_VALUE]]) {
      const fig = rfFigures(f, r);
      assert.equal(typeof fig.returnLossDb, 'number', `${f} W / ${r} W`);
      assert.ok(Number.isFinite(fig.returnLossDb as number) && (fig.returnLossDb as number) > 0, `${f} W / ${r} W → ${fig.returnLossDb}`);
      assert.ok(Number.isFinite(fig.swr) && Number.isFinite(fig.mismatchLossDb));
    }
    // 10 kW / 5e-324 W: 40 + 3233.06 dB, computed from the logarithms so nothing overflows
    near(rfFigures(10_000, Number.MIN_VALUE).returnLossDb, 40 - 10 * Math.log10(Number.MIN_VALUE), 6);
  });
  it('forward power above 10 kW is refused (sane bound), and 10 kW itself is 70 dBm', () => {
    assert.equal(FORWARD_W_BOUND.max, 10_000);
    assert.throws(() => rfFigures(10_001, 0), (e: unknown) => e instanceof CalcInputError && e.field === 'forwardW');
    near(rfFigures(10_000, 0).forwardDbm, 70, 12);
  });
  it('reflected equal to forward is refused as total reflection', () => {
    assert.throws(() => rfFigures(10, 10), (e: unknown) => e instanceof CalcInputError && e.field === 'reflectedW' && /Total reflection: check the load/.test(e.message));
  });
  it('reflected above forward, zero or negative forward, negative reflected and NaN are refused', () => {
    const fieldOf = (fn: () => unknown) => {
      try { fn(); } catch (e) { if (e instanceof CalcInputError) return e.field; throw e; }
      return 'none';
    };
    assert.equal(fieldOf(() => rfFigures(10, 12)), 'reflectedW');
    assert.equal(fieldOf(() => rfFigures(0, 0)), 'forwardW');
    assert.equal(fieldOf(() => rfFigures(-1, 0)), 'forwardW');
    assert.equal(fieldOf(() => rfFigures(10, -0.1)), 'reflectedW');
    assert.equal(fieldOf(() => rfFigures(Number.NaN, 1)), 'forwardW');
  });
});

describe('watts ↔ dBm (dBm = 10 log10 (P / 1 W) + 30: decibels relative to 1 mW, by definition)', () => {
  it('1 mW = 0 dBm, 1 W = 30 dBm, 5 W = 36.99 dBm, 100 W = 50 dBm, 1500 W = 61.76 dBm', () => {
    near(wattsToDbm(0.001), 0, 12);
    near(wattsToDbm(1), 30, 12);
    near(wattsToDbm(5), 36.99); // 30 + 10 log10 5 = 36.9897
    near(wattsToDbm(100), 50, 12);
    near(wattsToDbm(1500), 61.76); // 30 + 10 log10 1500 = 61.7609
  });
  it('and back: 50 dBm = 100 W, 43 dBm ≈ 20 W', () => {
    near(dbmToWatts(50), 100, 9);
    near(dbmToWatts(43), 19.95); // 10^4.3 mW = 19 952.6 mW
    near(dbmToWatts(wattsToDbm(12.5)), 12.5, 9);
  });
  it('zero or negative watts have no dBm', () => {
    assert.throws(() => wattsToDbm(0), CalcInputError);
    assert.throws(() => wattsToDbm(-3), CalcInputError);
  });
});

describe('power error against the rating', () => {
  it('90 W from a 100 W radio is −0.46 dB; 100 W is 0 dB; 50 W is −3.01 dB', () => {
    near(powerErrorDb(90, 100), -0.46); // 10 log10 0.9 = −0.4576
    near(powerErrorDb(100, 100), 0, 12);
    near(powerErrorDb(50, 100), -3.01); // 10 log10 0.5 = −3.0103
  });
});

describe('frequency error in Hz and ppm (ppm = error / nominal × 10⁶)', () => {
  it('14.200 000 MHz nominal, 14.200 011 MHz measured: +11 Hz, +0.77 ppm', () => {
    // 11 / 14 200 000 × 10⁶ = 0.774647…
    const e = frequencyError(14_200_011, 14_200_000);
    near(e.errorHz, 11, 6);
    near(e.errorPpm, 0.774647887, 6);
  });
  it('145.500 MHz nominal, 145.499 855 MHz measured: −145 Hz, −1.00 ppm (rounded to 2 decimal places; −0.997 ppm to 3 significant figures)', () => {
    // −145 / 145 500 000 × 10⁶ = −0.996563…
    const e = frequencyError(145_499_855, 145_500_000);
    near(e.errorHz, -145, 6);
    near(e.errorPpm, -0.99656357, 6);
  });
  it('10 MHz nominal, +8 Hz: +0.8 ppm', () => {
    near(frequencyError(10_000_008, 10_000_000).errorPpm, 0.8, 9);
  });
  it('no error is 0 Hz and 0 ppm; a zero nominal is refused', () => {
    assert.deepEqual(frequencyError(7_100_000, 7_100_000), { errorHz: 0, errorPpm: 0 });
    assert.throws(() => frequencyError(7_100_000, 0), CalcInputError);
  });
});
