// Attenuator pads. Check values:
// - the exact resistor values are the ones printed in the 50 Ω pi and tee attenuator tables of
//   The ARRL Handbook ("Test Equipment and Measurements" chapter; from memory, edition not
//   checked), to 0.1 Ω;
// - every pad is also checked by an independent nodal analysis written here (Kirchhoff's current
//   law solved by Gaussian elimination), which needs no published source: a matched pad shows Z at
//   its input with Z at its output, and loses exactly A dB;
// - E24 values: IEC 60063:2015 Table 1 (from memory);
// - power: the dissipations add up to what the pad takes, P_in (1 − 10^(−A/10)) (energy balance).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { attenuatorPad, padResistors, type PadShape } from './attenuator';
import { E24, nearestE24 } from './e-series';
import { CalcInputError } from './input-error';

const close = (actual: number, expected: number, eps = 1e-9) => assert.ok(Math.abs(actual - expected) <= eps, `${actual} ≠ ${expected}`);

/** Solves A x = b by Gaussian elimination with partial pivoting. */
function solve(a: number[][], b: number[]): number[] {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i]]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r][col]) > Math.abs(m[pivot][col])) pivot = r;
    [m[col], m[pivot]] = [m[pivot], m[col]];
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = m[r][col] / m[col][col];
      for (let c = col; c <= n; c++) m[r][c] -= f * m[col][c];
    }
  }
  return m.map((row, i) => row[n] / row[i]);
}

/**
 * The pad between a 1 V source behind Z and a load Z, by nodal analysis.
 * Pi nodes: in, out. Tee nodes: in, middle, out.
 */
function nodal(shape: PadShape, shunt: number, series: number, z: number): { zin: number; lossDb: number } {
  const g = (r: number) => 1 / r;
  let vIn: number;
  let vLoad: number;
  if (shape === 'pi') {
    const [v1, v2] = solve(
      [
        [g(z) + g(shunt) + g(series), -g(series)],
        [-g(series), g(series) + g(shunt) + g(z)],
      ],
      [g(z) * 1, 0],
    );
    vIn = v1;
    vLoad = v2;
  } else {
    const [v1, vm, v2] = solve(
      [
        [g(z) + g(series), -g(series), 0],
        [-g(series), 2 * g(series) + g(shunt), -g(series)],
        [0, -g(series), g(series) + g(z)],
      ],
      [g(z) * 1, 0, 0],
    );
    vIn = v1;
    vLoad = v2;
    void vm;
  }
  const iIn = (1 - vIn) / z;
  return { zin: vIn / iIn, lossDb: 20 * Math.log10(0.5 / vLoad) };
}

describe('exact pad values (ARRL Handbook 50 Ω tables, from memory; each also checked by nodal analysis)', () => {
  const rows: [PadShape, number, number, number][] = [
    // shape, dB, shunt Ω, series Ω
    ['pi', 3, 292.4, 17.6],
    ['pi', 6, 150.5, 37.4],
    ['pi', 10, 96.2, 71.2],
    ['pi', 20, 61.1, 247.5],
    ['tee', 3, 141.9, 8.55],
    ['tee', 6, 66.9, 16.6],
    ['tee', 10, 35.1, 26.0],
    ['tee', 20, 10.1, 40.9],
  ];
  for (const [shape, db, shunt, series] of rows) {
    it(`${db} dB ${shape}: shunt ${shunt} Ω, series ${series} Ω; Z_in 50 Ω and ${db} dB by nodal analysis`, () => {
      const r = padResistors(db, 50, shape);
      close(r.shuntOhms, shunt, 0.051);
      close(r.seriesOhms, series, shape === 'tee' && db === 3 ? 0.0051 : 0.051);
      const n = nodal(shape, r.shuntOhms, r.seriesOhms, 50);
      close(n.zin, 50, 1e-9);
      close(n.lossDb, db, 1e-9);
    });
  }
  it('any attenuation and impedance matches by nodal analysis (0.1 to 60 dB, 1 Ω to 1 kΩ)', () => {
    for (const shape of ['pi', 'tee'] as const) {
      for (const db of [0.1, 1, 7.3, 15, 33, 60]) {
        for (const z of [1, 50, 75, 600, 1000]) {
          const r = padResistors(db, z, shape);
          const n = nodal(shape, r.shuntOhms, r.seriesOhms, z);
          close(n.zin / z, 1, 1e-9);
          close(n.lossDb, db, 1e-8);
        }
      }
    }
  });
});

describe('nearest E24 values (IEC 60063 E24, from memory)', () => {
  it('has 24 values a decade, each step 6–16 % up', () => {
    assert.equal(E24.length, 24);
    for (let i = 1; i < E24.length; i++) assert.ok(E24[i] / E24[i - 1] > 1.06 && E24[i] / E24[i - 1] < 1.16);
  });
  it('picks the nearest by ratio, across decades, without binary fractions', () => {
    assert.equal(nearestE24(292.4), 300);
    assert.equal(nearestE24(17.61), 18);
    assert.equal(nearestE24(37.35), 36); // 37.35/36 = 1.0375 < 39/37.35 = 1.0442
    assert.equal(nearestE24(4699.99), 4700);
    assert.equal(nearestE24(0.96), 1); // 1/0.96 = 1.0417 < 0.96/0.91 = 1.0549
    assert.equal(nearestE24(96.3), 100); // 100/96.3 = 1.0384 < 96.3/91 = 1.0582
    assert.equal(nearestE24(8.55), 8.2); // 8.55/8.2 = 1.0427 < 9.1/8.55 = 1.0643
    assert.equal(nearestE24(9.6e5), 1e6);
  });
});

describe('the pad as built from E24 values', () => {
  it('10 dB pi in 50 Ω: 100 Ω and 68 Ω give 9.63 dB and 50.33 Ω (nodal analysis agrees)', () => {
    const p = attenuatorPad(10, 50, 'pi');
    assert.equal(p.e24.shuntOhms, 100);
    assert.equal(p.e24.seriesOhms, 68);
    close(p.e24.shuntErrorPct, ((100 - p.shuntOhms) / p.shuntOhms) * 100);
    const n = nodal('pi', 100, 68, 50);
    close(p.e24.attenuationDb, n.lossDb, 1e-9);
    close(p.e24.inputOhms, n.zin, 1e-9);
    close(p.e24.attenuationDb, 9.63, 0.005);
    close(p.e24.inputOhms, 50.33, 0.005);
  });
  it('20 dB tee in 50 Ω: 39 Ω arms and a 10 Ω shunt (nodal analysis agrees)', () => {
    const p = attenuatorPad(20, 50, 'tee');
    assert.equal(p.e24.seriesOhms, 39);
    assert.equal(p.e24.shuntOhms, 10);
    const n = nodal('tee', 10, 39, 50);
    close(p.e24.attenuationDb, n.lossDb, 1e-9);
    close(p.e24.inputOhms, n.zin, 1e-9);
  });
});

describe('power in the resistors', () => {
  it('10 dB pi, 5 W in: input shunt 2.60 W, series 1.64 W, output shunt 0.26 W (worked by hand)', () => {
    // V_in² = 5 × 50 = 250; 250 / 96.25 = 2.597 W. V_out = V_in / √10 = 5 V → 25 / 96.25 = 0.2597 W.
    // Series: (15.811 − 5)² / 71.15 = 116.88 / 71.15 = 1.643 W.
    const p = attenuatorPad(10, 50, 'pi', 5).power;
    close(p.firstResistorW, 2.597469266479578, 1e-9);
    close(p.middleResistorW, 1.6427838068724632, 1e-9);
    close(p.lastResistorW, 0.25974692664795784, 1e-9);
  });
  it('3 dB tee, 100 W in: the input arm takes I² R = 2 A² × 8.55 Ω = 17.1 W', () => {
    // I_in = sqrt(100 / 50) = 1.4142 A; I² = 2; R = 50 (K − 1)/(K + 1) with K = 10^0.15
    const p = attenuatorPad(3, 50, 'tee', 100);
    close(p.power.firstResistorW, 2 * p.seriesOhms, 1e-9);
    close(p.power.firstResistorW, 17.1, 0.01);
  });
  it('the resistors together take P_in (1 − 10^(−A/10)) (energy balance), for both shapes', () => {
    for (const shape of ['pi', 'tee'] as const) {
      for (const db of [0.5, 3, 6, 10, 20, 40]) {
        const p = attenuatorPad(db, 50, shape, 10).power;
        const taken = shape === 'pi' ? p.firstResistorW + p.middleResistorW + p.lastResistorW : p.firstResistorW + p.middleResistorW + p.lastResistorW;
        close(taken, 10 * (1 - 10 ** (-db / 10)), 1e-9);
      }
    }
  });
});

describe('refused inputs', () => {
  it('0 dB and below 0.1 dB, above 60 dB, impedances outside 1–1000 Ω, power outside 0–10 kW, unknown shapes', () => {
    const field = (fn: () => unknown) => {
      try { fn(); } catch (e) { if (e instanceof CalcInputError) return e.field; throw e; }
      return 'none';
    };
    assert.equal(field(() => attenuatorPad(0, 50, 'pi')), 'db');
    assert.equal(field(() => attenuatorPad(0.05, 50, 'pi')), 'db');
    assert.equal(field(() => attenuatorPad(61, 50, 'pi')), 'db');
    assert.equal(field(() => attenuatorPad(10, 0.5, 'pi')), 'ohms');
    assert.equal(field(() => attenuatorPad(10, 5000, 'tee')), 'ohms');
    assert.equal(field(() => attenuatorPad(10, 50, 'pi', 0)), 'inputW');
    assert.equal(field(() => attenuatorPad(10, 50, 'pi', 20_000)), 'inputW');
    assert.equal(field(() => attenuatorPad(10, 50, 'bridged-tee' as PadShape)), 'shape');
  });
});
