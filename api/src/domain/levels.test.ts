// Signal levels and S-units. Conversions are checked against values worked by hand in each
// comment (definitions of dBm, dBW, dBµV; P = V² / R). The S-meter checks follow IARU Region 1
// Technical Recommendation R.1 (1981; from memory, text not checked here): S9 = −73 dBm below
// 30 MHz, −93 dBm above, 6 dB per S-unit.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { levelToDbm, signalLevel, sMeterReading } from './levels';
import { CalcInputError } from './input-error';

const close = (actual: number, expected: number, eps = 1e-9) => assert.ok(Math.abs(actual - expected) <= eps, `${actual} ≠ ${expected}`);
const fieldOf = (fn: () => unknown) => {
  try { fn(); } catch (e) { if (e instanceof CalcInputError) return e.field; throw e; }
  return 'none';
};

describe('one level in every unit (worked by hand)', () => {
  it('0 dBm at 50 Ω: 1 mW, −30 dBW, 223.6 mV, 106.99 dBµV', () => {
    // V = sqrt(0.001 × 50) = 0.2236068 V; dBµV = 20 log10 223 606.8 = 106.9897
    const l = signalLevel(0, 'dBm');
    close(l.watts, 0.001, 1e-15);
    close(l.dBW, -30);
    close(l.uV, 223_606.797749979, 1e-6);
    close(l.dBuV, 106.98970004336019, 1e-9);
  });
  it('50 µV into 50 Ω is −73.01 dBm (P = (50 µV)² / 50 Ω = 5 × 10⁻¹¹ W) and 33.98 dBµV', () => {
    // 10 log10 (5e-11) + 30 = −103.0103 + 30 = −73.0103 dBm; 20 log10 50 = 33.9794 dBµV
    const l = signalLevel(50, 'uV');
    close(l.dBm, -73.01029995663981, 1e-9);
    close(l.watts, 5e-11, 1e-22);
    close(l.dBuV, 33.979400086720375, 1e-9);
  });
  it('1 µV = 0 dBµV = −106.99 dBm at 50 Ω, and −108.75 dBm at 75 Ω', () => {
    close(signalLevel(0, 'dBuV').dBm, -106.98970004336019, 1e-9); // 0 − 120 − 10 log10 50 + 30
    close(signalLevel(1, 'uV').dBuV, 0, 1e-9);
    close(signalLevel(1, 'uV', 75).dBm, -108.750612633917, 1e-9); // −120 − 18.7506 + 30
  });
  it('watts, milliwatts and dBW: 100 W = 50 dBm = 20 dBW; 100 mW = 20 dBm; 10 kW = 70 dBm', () => {
    close(signalLevel(100, 'W').dBm, 50);
    close(signalLevel(100, 'W').dBW, 20);
    close(signalLevel(100, 'mW').dBm, 20);
    close(signalLevel(10_000, 'W').dBm, 70);
    close(signalLevel(20, 'dBW').watts, 100, 1e-9);
  });
  it('100 W into 50 Ω is 70.71 V r.m.s. (sqrt(100 × 50)), 157 dBµV', () => {
    const l = signalLevel(50, 'dBm');
    close(l.uV / 1e6, 70.71067811865476, 1e-9);
    close(l.dBuV, 156.98970004336019, 1e-9);
  });
  it('round trip through every unit gives the same dBm', () => {
    const start = signalLevel(-47.3, 'dBm', 75);
    for (const [value, unit] of [[start.dBW, 'dBW'], [start.dBuV, 'dBuV'], [start.uV, 'uV'], [start.watts * 1000, 'mW'], [start.watts, 'W']] as const) {
      close(levelToDbm(value, unit, 75), -47.3, 1e-9);
    }
  });
});

describe('S-meter reading (IARU Region 1 R.1: S9 = −73 dBm HF, −93 dBm VHF, 6 dB per S-unit)', () => {
  it('HF: S9 at −73 dBm; S8 at −79; S1 at −121; S0 at −127; never below 0', () => {
    assert.deepEqual(sMeterReading(-73, 'hf'), { units: 9, overS9Db: 0 });
    assert.deepEqual(sMeterReading(-79, 'hf'), { units: 8, overS9Db: 0 });
    assert.deepEqual(sMeterReading(-121, 'hf'), { units: 1, overS9Db: 0 }); // 9 + (−121 + 73) / 6 = 1
    assert.deepEqual(sMeterReading(-127, 'hf'), { units: 0, overS9Db: 0 });
    assert.deepEqual(sMeterReading(-150, 'hf'), { units: 0, overS9Db: 0 });
  });
  it('fractional below S9: −76 dBm is S8.5', () => {
    close(sMeterReading(-76, 'hf').units, 8.5);
  });
  it('above S9 the reading is S9 plus dB: −63 dBm is S9 + 10 dB on HF, S9 + 30 dB on VHF', () => {
    assert.deepEqual(sMeterReading(-63, 'hf'), { units: 9, overS9Db: 10 });
    assert.deepEqual(sMeterReading(-63, 'vhf'), { units: 9, overS9Db: 30 });
  });
  it('VHF: S9 at −93 dBm (5 µV into 50 Ω is −93.01 dBm, just under S9)', () => {
    assert.deepEqual(sMeterReading(-93, 'vhf'), { units: 9, overS9Db: 0 });
    const five = signalLevel(5, 'uV', 50, 'vhf');
    close(five.dBm, -93.01029995663981, 1e-9);
    close(five.sMeter.units, 9 - 0.01029995663981 / 6, 1e-9);
  });
  it('signalLevel defaults to 50 Ω and HF', () => {
    const l = signalLevel(-73, 'dBm');
    assert.equal(l.ohms, 50);
    assert.equal(l.band, 'hf');
    assert.deepEqual(l.sMeter, { units: 9, overS9Db: 0 });
  });
});

describe('refused inputs', () => {
  it('zero or negative linear levels, levels outside −200…+90 dBm, impedances outside 1 Ω…10 kΩ', () => {
    assert.equal(fieldOf(() => signalLevel(0, 'W')), 'value');
    assert.equal(fieldOf(() => signalLevel(-5, 'uV')), 'value');
    assert.equal(fieldOf(() => signalLevel(0, 'mW')), 'value');
    assert.equal(fieldOf(() => signalLevel(-250, 'dBm')), 'value');
    assert.equal(fieldOf(() => signalLevel(91, 'dBm')), 'value');
    assert.equal(fieldOf(() => signalLevel(2e6, 'W')), 'value'); // 93 dBm
    assert.equal(fieldOf(() => signalLevel(1e-300, 'W')), 'value');
    assert.equal(fieldOf(() => signalLevel(Number.NaN, 'dBm')), 'value');
    assert.equal(fieldOf(() => signalLevel(0, 'dBm', 0)), 'ohms');
    assert.equal(fieldOf(() => signalLevel(0, 'dBm', 20_000)), 'ohms');
    assert.equal(fieldOf(() => signalLevel(0, 'dBm', 50, 'uhf' as 'hf')), 'band');
  });
  it('the edges themselves are accepted', () => {
    close(signalLevel(-200, 'dBm').dBm, -200);
    close(signalLevel(90, 'dBm').watts, 1e6, 1e-6);
  });
});
