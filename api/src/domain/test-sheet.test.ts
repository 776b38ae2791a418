// Check values: worked by hand from the definitions named in rf.ts (The ARRL Handbook for Radio
// Communications, "Transmission Lines" chapter, and IEEE Std 100, 7th edition, 2000, entries
// "return loss" and "mismatch loss"; from memory, edition and page not checked here):
//   |Γ| = sqrt(Pr/Pf), SWR = (1 + |Γ|)/(1 − |Γ|), RL = 10 log10 (Pf/Pr), ML = −10 log10 (1 − Pr/Pf),
//   P(dBm) = 10 log10 (P / 1 mW), power error = 10 log10 (P/Prated), ppm = Δf / f × 10⁶.
// The limits are the defaults of test-sheet.ts (common practice, no published source).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { CalcInputError } from './input-error';
import { DEFAULT_TEST_LIMITS, bandFigures, evaluateTestSheet, limitsConflict, type BandInput } from './test-sheet';

const near = (actual: number | null, expected: number, places = 3) => {
  assert.notEqual(actual, null);
  assert.ok(Math.abs((actual as number) - expected) < 0.5 * 10 ** -places, `${actual} ≠ ${expected} to ${places} places`);
};

const band = (over: Partial<BandInput> = {}): BandInput => ({ band: '20 m', ratedW: 100, forwardW: 100, reflectedW: 4, ...over });

describe('band figures through the RF functions (worked by hand)', () => {
  it('Pf 100 W, Pr 4 W → Γ = 0.2, SWR 1.5, RL 13.979 dB, ML 0.177 dB, 50.00 dBm, 0 dB against 100 W', () => {
    // worked by hand: Γ = sqrt(4/100) = 0.2; SWR = 1.2/0.8 = 1.5; RL = 10 log10 25 = 13.979;
    // ML = −10 log10 0.96 = 0.1773; 10 log10 100 000 mW = 50; 10 log10 (100/100) = 0.
    const f = bandFigures(band());
    near(f.reflectionCoefficient, 0.2);
    near(f.swr, 1.5);
    near(f.returnLossDb, 13.979);
    near(f.mismatchLossDb, 0.177);
    near(f.forwardDbm, 50);
    near(f.powerErrorDb, 0);
    assert.equal(f.frequencyErrorHz, null);
  });

  it('Pf 50 W, Pr 2 W from a 50 W radio → Γ = 0.2, 46.99 dBm', () => {
    // worked by hand: sqrt(2/50) = 0.2; 10 log10 50 000 = 46.990.
    const f = bandFigures(band({ ratedW: 50, forwardW: 50, reflectedW: 2 }));
    near(f.reflectionCoefficient, 0.2);
    near(f.forwardDbm, 46.99, 2);
  });

  it('80 W from a 100 W radio is −0.969 dB; 79 W is −1.024 dB', () => {
    // worked by hand: 10 log10 0.8 = −0.9691; 10 log10 0.79 = −1.0237.
    near(bandFigures(band({ forwardW: 80, reflectedW: 1 })).powerErrorDb, -0.969);
    near(bandFigures(band({ forwardW: 79, reflectedW: 1 })).powerErrorDb, -1.024);
  });

  it('14 200 000 Hz dialled, 14 200 014 Hz counted → +14 Hz, +0.986 ppm', () => {
    // worked by hand: 14 / 14.2 = 0.98592 ppm.
    const f = bandFigures(band({ nominalHz: 14_200_000, measuredHz: 14_200_014 }));
    assert.equal(f.frequencyErrorHz, 14);
    near(f.frequencyErrorPpm, 0.986);
  });
});

describe('pass or fail per line against the default limits (common practice, no published source)', () => {
  const sheet = (bands: BandInput[], supplyVoltageV = 13.8, receiveCurrentA = 1.2) =>
    evaluateTestSheet({ supplyVoltageV, receiveCurrentA, bands }, DEFAULT_TEST_LIMITS);

  it('a good radio passes every line; SWR exactly at the 1.5:1 limit passes', () => {
    const r = sheet([band({ nominalHz: 14_200_000, measuredHz: 14_200_014 })]);
    assert.equal(r.passed, true);
    assert.deepEqual(
      r.checks.map((c) => [c.line, c.shown, c.passed]),
      [
        ['Supply voltage at the radio', '13.80 V', true],
        ['Receive current', '1.20 A', true],
        ['20 m: SWR', '1.50:1', true],
        ['20 m: output against rating', '0.00 dB', true],
        ['20 m: frequency error', '+14 Hz (+0.99 ppm)', true],
      ],
    );
    assert.ok(r.checks.every((c) => c.source.length > 0), 'every line names its source');
  });

  it('Pr 9 W of 100 W → SWR 1.86:1 fails (worked by hand: Γ = 0.3, 1.3/0.7 = 1.857), and the sheet fails', () => {
    const r = sheet([band({ reflectedW: 9 })]);
    const swr = r.checks.find((c) => c.line === '20 m: SWR')!;
    assert.equal(swr.shown, '1.86:1');
    assert.equal(swr.passed, false);
    assert.equal(swr.field, 'bands.0.reflectedW');
    assert.equal(r.passed, false);
  });

  it('79 W from 100 W fails the −1 dB line; 80 W passes it', () => {
    assert.equal(sheet([band({ forwardW: 79, reflectedW: 1 })]).passed, false);
    assert.equal(sheet([band({ forwardW: 80, reflectedW: 1 })]).passed, true);
  });

  it('15 Hz high at 14.2 MHz is +1.056 ppm and fails the ±1 ppm line (worked by hand: 15 / 14.2)', () => {
    const r = sheet([band({ nominalHz: 14_200_000, measuredHz: 14_200_015 })]);
    const line = r.checks.find((c) => c.line === '20 m: frequency error')!;
    assert.equal(line.shown, '+15 Hz (+1.06 ppm)');
    assert.equal(line.passed, false);
  });

  it('a low supply or a high receive current fails its line', () => {
    assert.equal(sheet([band()], 11.5).checks[0]!.passed, false);
    assert.equal(sheet([band()], 13.8, 3).checks[1]!.passed, false);
  });

  it('one failing band fails the sheet even when another passes', () => {
    const r = sheet([band(), band({ band: '40 m', reflectedW: 16 })]);
    assert.equal(r.bands.length, 2);
    assert.equal(r.passed, false);
  });
});

describe('input that cannot be a measurement is refused with the field at fault', () => {
  const fieldOf = (fn: () => unknown) => {
    try {
      fn();
    } catch (err) {
      assert.ok(err instanceof CalcInputError);
      return err.field;
    }
    assert.fail('expected a CalcInputError');
  };
  const evaluate = (b: BandInput) => () => evaluateTestSheet({ supplyVoltageV: 13.8, receiveCurrentA: 1, bands: [band(), b] }, DEFAULT_TEST_LIMITS);

  it('reflected above forward, reflected equal to forward, negative power', () => {
    assert.equal(fieldOf(evaluate(band({ reflectedW: 120 }))), 'bands.1.reflectedW');
    assert.equal(fieldOf(evaluate(band({ reflectedW: 100 }))), 'bands.1.reflectedW');
    assert.equal(fieldOf(evaluate(band({ forwardW: -5 }))), 'bands.1.forwardW');
    assert.equal(fieldOf(evaluate(band({ reflectedW: -1 }))), 'bands.1.reflectedW');
    assert.equal(fieldOf(evaluate(band({ ratedW: 0 }))), 'bands.1.ratedW');
  });

  it('one frequency without the other, and a kHz-for-Hz slip', () => {
    assert.equal(fieldOf(evaluate(band({ nominalHz: 14_200_000 }))), 'bands.1.measuredHz');
    assert.equal(fieldOf(evaluate(band({ nominalHz: 14_200_000, measuredHz: 14_200 * 1000 * 1.02 }))), 'bands.1.measuredHz');
  });

  it('no bands, no supply voltage', () => {
    assert.equal(fieldOf(() => evaluateTestSheet({ supplyVoltageV: 13.8, receiveCurrentA: 1, bands: [] }, DEFAULT_TEST_LIMITS)), 'bands');
    assert.equal(fieldOf(() => evaluateTestSheet({ supplyVoltageV: 0, receiveCurrentA: 1, bands: [band()] }, DEFAULT_TEST_LIMITS)), 'supplyVoltageV');
  });

  it('limits that cannot stand together', () => {
    assert.equal(limitsConflict(DEFAULT_TEST_LIMITS), null);
    assert.equal(limitsConflict({ ...DEFAULT_TEST_LIMITS, supplyMinV: { value: 16, source: 'x' } })?.key, 'supplyMinV');
  });
});
