// Capacitor discharge through a bleeder: the RC law (definitions; worked by hand in each comment).
// The 60 V default: IEC 60204-1 (2016) clause 6.2.4 (from memory).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { capacitorDischarge } from './discharge';
import { CalcInputError } from './input-error';

const close = (actual: number, expected: number, eps = 1e-9) => assert.ok(Math.abs(actual - expected) <= eps, `${actual} ≠ ${expected}`);

describe('capacitor discharge', () => {
  it('400 V on 470 µF through 100 kΩ: τ 47 s, 89.2 s to 60 V, 37.6 J, 1.6 W at the start', () => {
    // τ = 100 000 × 470e-6 = 47 s; t = 47 × ln(400 / 60) = 47 × 1.897120 = 89.1646 s;
    // E = ½ × 470e-6 × 400² = 37.6 J; P0 = 400² / 100 000 = 1.6 W
    const d = capacitorDischarge(400, 470e-6, 100_000);
    close(d.timeConstantS, 47, 1e-12);
    close(d.seconds, 89.16463928963643, 1e-9);
    close(d.joules, 37.6, 1e-12);
    close(d.initialWatts, 1.6, 1e-12);
    assert.equal(d.safeVolts, 60);
  });
  it('a valve amplifier: 3000 V on 25 µF through 50 kΩ to 30 V: τ 1.25 s, 5.76 s, 112.5 J, 180 W', () => {
    // τ = 1.25 s; t = 1.25 × ln(100) = 5.7565 s; E = ½ × 25e-6 × 9e6 = 112.5 J; P0 = 9e6 / 5e4 = 180 W
    const d = capacitorDischarge(3000, 25e-6, 50_000, 30);
    close(d.seconds, 1.25 * Math.log(100), 1e-12);
    close(d.joules, 112.5, 1e-9);
    close(d.initialWatts, 180, 1e-9);
  });
  it('the voltage after `seconds` is the safe voltage: V0 e^(−t/RC) = V_safe', () => {
    for (const [v, c, r, safe] of [[340, 220e-6, 47_000, 60], [2500, 40e-6, 100_000, 50], [61, 1e-3, 10, 60]]) {
      const d = capacitorDischarge(v, c, r, safe);
      close(v * Math.exp(-d.seconds / d.timeConstantS), safe, 1e-9);
    }
  });
  it('already at or below the safe voltage: 0 s (and the energy is still given)', () => {
    const d = capacitorDischarge(48, 10_000e-6, 100);
    assert.equal(d.seconds, 0);
    close(d.joules, 11.52, 1e-12); // ½ × 0.01 × 48²
  });
  it('refuses zero and absurd values on their own fields', () => {
    const field = (fn: () => unknown) => {
      try { fn(); } catch (e) { if (e instanceof CalcInputError) return e.field; throw e; }
      return 'none';
    };
    assert.equal(field(() => capacitorDischarge(0, 1e-6, 1000)), 'volts');
    assert.equal(field(() => capacitorDischarge(60_000, 1e-6, 1000)), 'volts');
    assert.equal(field(() => capacitorDischarge(400, 0, 1000)), 'farads');
    assert.equal(field(() => capacitorDischarge(400, 11, 1000)), 'farads');
    assert.equal(field(() => capacitorDischarge(400, 1e-6, 0)), 'ohms');
    assert.equal(field(() => capacitorDischarge(400, 1e-6, 2e9)), 'ohms');
    assert.equal(field(() => capacitorDischarge(400, 1e-6, 1000, 0)), 'safeVolts');
    assert.equal(field(() => capacitorDischarge(400, 1e-6, 1000, 2000)), 'safeVolts');
  });
});
