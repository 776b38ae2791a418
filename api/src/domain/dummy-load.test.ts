// Dummy-load voltages: P = V²/R for a sine wave's r.m.s. voltage, V_peak = √2 V_rms (definitions;
// every value below is worked by hand in its comment).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { dummyLoadFigures } from './dummy-load';
import { CalcInputError } from './input-error';

const close = (actual: number, expected: number, eps = 1e-9) => assert.ok(Math.abs(actual - expected) <= eps, `${actual} ≠ ${expected}`);

describe('dummy load', () => {
  it('100 W into 50 Ω: 70.71 V r.m.s., 100.0 V peak, 200.0 V peak to peak, 1.414 A', () => {
    // sqrt(100 × 50) = sqrt(5000) = 70.7107; × √2 = 100; I = sqrt(100/50) = √2
    const d = dummyLoadFigures(100, 50);
    close(d.vRms, 70.71067811865476);
    close(d.vPeak, 100, 1e-12);
    close(d.vPeakToPeak, 200, 1e-12);
    close(d.amps, Math.SQRT2);
  });
  it('5 W (a handheld) into 50 Ω: 15.81 V r.m.s., 22.36 V peak, 0.316 A', () => {
    // sqrt(250) = 15.8114; sqrt(500) = 22.3607; sqrt(0.1) = 0.316228
    const d = dummyLoadFigures(5);
    close(d.vRms, 15.811388300841896);
    close(d.vPeak, 22.360679774997898);
    close(d.amps, 0.31622776601683794);
  });
  it('1500 W into 50 Ω: 273.9 V r.m.s., 387.3 V peak; 100 W into 75 Ω: 86.60 V r.m.s.', () => {
    close(dummyLoadFigures(1500, 50).vRms, 273.8612787525831); // sqrt(75 000)
    close(dummyLoadFigures(1500, 50).vPeak, 387.2983346207417); // sqrt(150 000)
    close(dummyLoadFigures(100, 75).vRms, 86.60254037844386); // sqrt(7500)
  });
  it('power and resistance back from the figures: V × I = P, V / I = R', () => {
    const d = dummyLoadFigures(37.5, 50);
    close(d.vRms * d.amps, 37.5, 1e-9);
    close(d.vRms / d.amps, 50, 1e-9);
  });
  it('refuses 0 W, more than 10 kW, and loads outside 1–1000 Ω', () => {
    for (const [w, r, field] of [[0, 50, 'watts'], [-1, 50, 'watts'], [10_001, 50, 'watts'], [100, 0, 'ohms'], [100, 1001, 'ohms'], [Number.NaN, 50, 'watts']] as const) {
      assert.throws(() => dummyLoadFigures(w, r), (e: unknown) => e instanceof CalcInputError && e.field === field);
    }
  });
});
