// The calculation endpoints through HTTP, on the real app (createApp: session, anti-forgery and the
// central error handler, which answers a domain CalcInputError as 400 with the field named).
// Expected figures are the domain tests' worked examples (Forsberg 1988; ARRL Handbook
// definitions; NEC Ch. 9 Table 8 corrected to 20 °C; IARU Region 1 R.1; Times Microwave LMR-400
// datasheet), each repeated by hand in a comment.
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { anonymous, createUser, setupTestApp, signIn, type TestApp, type TestClient } from '../../../test/helpers';

let t: TestApp;
let member: TestClient;

before(async () => {
  t = await setupTestApp();
  await createUser(t.sequelize, { email: 'calc@router.example', password: 'calc-router-passphrase', roles: ['member'] });
  member = await signIn(t.app, 'calc@router.example', 'calc-router-passphrase');
});
after(() => t.close());

const get = (path: string) => member.get(path);

const close = (actual: number, expected: number, eps = 1e-9) =>
  assert.ok(Math.abs(actual - expected) <= eps, `${actual} ≠ ${expected}`);

async function bad(path: string, fields: string[]) {
  const res = await get(path);
  assert.equal(res.status, 400, `${path} → ${res.status} ${JSON.stringify(res.body)}`);
  assert.equal(res.body.error.code, 'validation_failed');
  assert.equal(typeof res.body.error.message, 'string');
  assert.ok(res.body.error.message.length > 3);
  assert.deepEqual(Object.keys(res.body.error.fields ?? {}).sort(), [...fields].sort());
  return res.body.error as { message: string; fields: Record<string, string> };
}

describe('GET /api/calc/xmodem', () => {
  it('plans 1 MiB in 1K blocks with CRC at 115200 baud', async () => {
    const res = await get('/api/calc/xmodem?bytes=1048576&block=1024&check=crc&baud=115200');
    assert.equal(res.status, 200);
    assert.deepEqual(Object.keys(res.body).sort(), ['blocks', 'paddingBytes', 'seconds', 'wireBytes']);
    assert.equal(res.body.blocks, 1024);
    assert.equal(res.body.paddingBytes, 0);
    assert.equal(res.body.wireBytes, 1_053_697); // 1024 × (3 + 1024 + 2) + 1 EOT
    close(res.body.seconds, 91.46675347222222);
  });
  it('plans one byte over a block with the 8-bit checksum', async () => {
    const res = await get('/api/calc/xmodem?bytes=129&block=128&check=sum&baud=9600');
    assert.equal(res.status, 200);
    // 2 blocks, 127 SUB, 2 × 132 + 1 = 265 bytes, 2650 / 9600 s
    assert.deepEqual([res.body.blocks, res.body.paddingBytes, res.body.wireBytes], [2, 127, 265]);
    close(res.body.seconds, 2650 / 9600);
  });
  it('refuses missing, non-numeric, negative and zero sizes', async () => {
    assert.deepEqual((await bad('/api/calc/xmodem', ['bytes', 'block', 'check', 'baud'])).fields.bytes, 'Required.');
    await bad('/api/calc/xmodem?bytes=12kB&block=128&check=crc&baud=115200', ['bytes']);
    await bad('/api/calc/xmodem?bytes=-5&block=128&check=crc&baud=115200', ['bytes']);
    const zero = await bad('/api/calc/xmodem?bytes=0&block=128&check=crc&baud=115200', ['bytes']);
    assert.match(zero.fields.bytes, /empty/);
    await bad('/api/calc/xmodem?bytes=10.5&block=128&check=crc&baud=115200', ['bytes']);
    await bad('/api/calc/xmodem?bytes=1&bytes=2&block=128&check=crc&baud=115200', ['bytes']);
  });
  it('refuses an unknown block size or check mode, and a baud outside the usual rates', async () => {
    await bad('/api/calc/xmodem?bytes=1000&block=512&check=crc&baud=115200', ['block']);
    await bad('/api/calc/xmodem?bytes=1000&block=128&check=crc32&baud=115200', ['check']);
    const baud = await bad('/api/calc/xmodem?bytes=1000&block=128&check=crc&baud=100000', ['baud']);
    assert.match(baud.fields.baud, /115200/);
    await bad('/api/calc/xmodem?bytes=1000&block=128&check=crc&baud=-9600', ['baud']);
  });
});

describe('GET /api/calc/rf', () => {
  it('100 W forward, 4 W reflected: Γ 0.2, SWR 1.5, RL 13.98 dB, ML 0.18 dB, 50 dBm', async () => {
    const res = await get('/api/calc/rf?forwardW=100&reflectedW=4');
    assert.equal(res.status, 200);
    assert.deepEqual(Object.keys(res.body).sort(), ['forwardDbm', 'mismatchLossDb', 'reflectionCoefficient', 'returnLossDb', 'swr']);
    close(res.body.reflectionCoefficient, 0.2);
    close(res.body.swr, 1.5);
    close(res.body.returnLossDb, 13.979400086720377);
    close(res.body.mismatchLossDb, 0.17728766960431616);
    close(res.body.forwardDbm, 50);
  });
  it('no reflected power: return loss is null (unbounded)', async () => {
    const res = await get('/api/calc/rf?forwardW=5&reflectedW=0');
    assert.equal(res.status, 200);
    assert.equal(res.body.returnLossDb, null);
    assert.equal(res.body.swr, 1);
    assert.equal(res.body.mismatchLossDb, 0);
  });
  it('refuses reflected above forward, and total reflection', async () => {
    assert.match((await bad('/api/calc/rf?forwardW=10&reflectedW=12', ['reflectedW'])).fields.reflectedW, /above forward/);
    assert.match((await bad('/api/calc/rf?forwardW=10&reflectedW=10', ['reflectedW'])).fields.reflectedW, /Total reflection: check the load/);
  });
  it('refuses missing, non-numeric, negative and zero powers', async () => {
    await bad('/api/calc/rf?reflectedW=1', ['forwardW']);
    await bad('/api/calc/rf?forwardW=ten&reflectedW=1', ['forwardW']);
    await bad('/api/calc/rf?forwardW=0&reflectedW=0', ['forwardW']);
    await bad('/api/calc/rf?forwardW=10&reflectedW=-1', ['reflectedW']);
    await bad('/api/calc/rf?forwardW=Infinity&reflectedW=1', ['forwardW']);
    await bad('/api/calc/rf?forwardW=1e400&reflectedW=1', ['forwardW']);
  });
  it('refuses powers above 10 kW', async () => {
    const e = await bad('/api/calc/rf?forwardW=20000&reflectedW=1', ['forwardW']);
    assert.match(e.fields.forwardW, /10000 W/);
  });
  it('a tiny reflected power still gives a finite return loss: 100 W / 1 µW → 80 dB', async () => {
    const res = await get('/api/calc/rf?forwardW=100&reflectedW=0.000001');
    assert.equal(res.status, 200);
    close(res.body.returnLossDb, 80, 1e-9);
    const tiny = await get('/api/calc/rf?forwardW=10000&reflectedW=1e-320');
    assert.equal(tiny.status, 200);
    assert.equal(typeof tiny.body.returnLossDb, 'number');
    assert.ok(tiny.body.returnLossDb > 3000);
  });
});

describe('GET /api/calc/dc-drop', () => {
  it('20 A, 2 m of AWG 12 from 13.8 V at 20 °C: 0.43 V drop, 13.37 V at the radio, within tolerance and ampacity', async () => {
    // 1.98 / 304.8 / 1.21615 × 4 m × 20 A = 0.42732 V
    const res = await get('/api/calc/dc-drop?currentA=20&lengthM=2&awg=12&supplyV=13.8');
    assert.equal(res.status, 200);
    close(res.body.dropV, 0.427319853, 1e-8);
    close(res.body.voltageAtRadioV, 13.372680147, 1e-8);
    assert.equal(res.body.conductorC, 20);
    assert.equal(res.body.ampacityA, 25);
    assert.equal(res.body.withinAmpacity, true);
    assert.equal(res.body.fuseA, 25);
    assert.equal(res.body.fuseProtectsLead, true);
    assert.equal(res.body.withinTolerance, true);
    assert.equal(res.body.gauge, 'AWG 12');
    close(res.body.minV, 11.73);
    close(res.body.maxV, 15.87);
    assert.equal(res.body.tolerancePct, 15);
  });
  it('25 A through 0.5 m of AWG 18: within the voltage band but past the 10 A ampacity', async () => {
    const res = await get('/api/calc/dc-drop?currentA=25&lengthM=0.5&awg=18&supplyV=13.8');
    assert.equal(res.status, 200);
    assert.equal(res.body.withinTolerance, true);
    assert.equal(res.body.withinAmpacity, false);
    assert.equal(res.body.fuseA, 35);
    assert.equal(res.body.fuseProtectsLead, false);
  });
  it('a warm conductor: conductorC=60 raises the drop (7.98 mΩ/m × 1.1572)', async () => {
    const res = await get('/api/calc/dc-drop?currentA=22&lengthM=3&mm2=2.5&supplyV=13.8&conductorC=60');
    assert.equal(res.status, 200);
    close(res.body.voltageAtRadioV, 12.581051808, 1e-8);
    assert.match(res.body.source, /corrected to 60 °C/);
  });
  it('22 A, 3 m of 2.5 mm² from 13.8 V with a ±5 % band: 12.75 V, outside', async () => {
    const res = await get('/api/calc/dc-drop?currentA=22&lengthM=3&mm2=2.5&supplyV=13.8&tolerancePct=5');
    assert.equal(res.status, 200);
    close(res.body.voltageAtRadioV, 12.74664);
    assert.equal(res.body.withinTolerance, false);
    assert.equal(res.body.gauge, '2.5 mm²');
  });
  it('refuses an unknown gauge, both gauges, or none', async () => {
    await bad('/api/calc/dc-drop?currentA=20&lengthM=2&awg=13&supplyV=13.8', ['awg']);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=2&mm2=2&supplyV=13.8', ['mm2']);
    const both = await bad('/api/calc/dc-drop?currentA=20&lengthM=2&awg=12&mm2=2.5&supplyV=13.8', ['awg', 'mm2']);
    assert.match(both.fields.awg, /not both/);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=2&supplyV=13.8', ['awg']);
  });
  it('refuses missing, non-numeric and negative values', async () => {
    await bad('/api/calc/dc-drop?lengthM=2&awg=12&supplyV=13.8', ['currentA']);
    await bad('/api/calc/dc-drop?currentA=-1&lengthM=2&awg=12&supplyV=13.8', ['currentA']);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=-2&awg=12&supplyV=13.8', ['lengthM']);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=2&awg=12&supplyV=abc', ['supplyV']);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=2&awg=12&supplyV=13.8&tolerancePct=150', ['tolerancePct']);
  });
  it('refuses values above the sane bounds', async () => {
    await bad('/api/calc/dc-drop?currentA=500&lengthM=2&awg=12&supplyV=13.8', ['currentA']);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=200&awg=12&supplyV=13.8', ['lengthM']);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=2&awg=12&supplyV=230', ['supplyV']);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=2&awg=12&supplyV=13.8&conductorC=150', ['conductorC']);
    await bad('/api/calc/dc-drop?currentA=20&lengthM=2&awg=12&supplyV=13.8&nominalV=100', ['nominalV']);
  });
  it('a decimal comma is refused with a message that says so, never read as 25', async () => {
    const e = await bad('/api/calc/dc-drop?currentA=2,5&lengthM=2&awg=12&supplyV=13.8', ['currentA']);
    assert.match(e.fields.currentA, /point for decimals/);
  });
  it('refuses a current the lead cannot carry at that supply (the domain check, mapped to 400 by the central handler)', async () => {
    // 100 A × 0.0214469 Ω/m × 20 m = 42.9 V > 13.8 V
    const e = await bad('/api/calc/dc-drop?currentA=100&lengthM=10&awg=18&supplyV=13.8', ['currentA']);
    assert.match(e.fields.currentA, /whole supply/);
    assert.match(e.message, /^currentA: /);
  });
});

describe('GET /api/calc/level', () => {
  it('50 µV at 50 Ω on HF: −73.01 dBm, 33.98 dBµV, just under S9', async () => {
    // (50e-6)² / 50 = 5e-11 W → −73.0103 dBm; S-units 9 − 0.0103 / 6
    const res = await get('/api/calc/level?value=50&unit=uV');
    assert.equal(res.status, 200);
    assert.deepEqual(Object.keys(res.body).sort(), ['band', 'dBW', 'dBm', 'dBuV', 'ohms', 'sMeter', 'uV', 'watts']);
    close(res.body.dBm, -73.01029995663981);
    close(res.body.dBuV, 33.979400086720375);
    close(res.body.sMeter.units, 9 - 0.01029995663981 / 6);
    assert.equal(res.body.sMeter.overS9Db, 0);
  });
  it('−63 dBm on VHF is S9 + 30 dB (S9 = −93 dBm above 30 MHz)', async () => {
    const res = await get('/api/calc/level?value=-63&unit=dBm&band=vhf');
    assert.equal(res.status, 200);
    assert.deepEqual(res.body.sMeter, { units: 9, overS9Db: 30 });
  });
  it('refuses a missing unit, an unknown band, 0 W, an impedance of 0 and a level beyond +90 dBm', async () => {
    await bad('/api/calc/level?value=5', ['unit']);
    await bad('/api/calc/level?value=5&unit=dBm&band=uhf', ['band']);
    await bad('/api/calc/level?value=0&unit=W', ['value']);
    await bad('/api/calc/level?value=5&unit=dBm&ohms=0', ['ohms']);
    await bad('/api/calc/level?value=120&unit=dBm', ['value']);
    await bad('/api/calc/level?value=-3,5&unit=dBm', ['value']);
  });
});

describe('GET /api/calc/dummy-load', () => {
  it('100 W into 50 Ω: 70.71 V r.m.s., 100 V peak, 1.414 A', async () => {
    const res = await get('/api/calc/dummy-load?watts=100&ohms=50');
    assert.equal(res.status, 200);
    close(res.body.vRms, Math.sqrt(5000));
    close(res.body.vPeak, 100, 1e-9);
    close(res.body.vPeakToPeak, 200, 1e-9);
    close(res.body.amps, Math.SQRT2);
  });
  it('defaults to 50 Ω; refuses 0 W, more than 10 kW, and 0 Ω', async () => {
    close((await get('/api/calc/dummy-load?watts=5')).body.vRms, Math.sqrt(250));
    await bad('/api/calc/dummy-load?watts=0', ['watts']);
    await bad('/api/calc/dummy-load?watts=50000', ['watts']);
    await bad('/api/calc/dummy-load?watts=100&ohms=0', ['ohms']);
  });
});

describe('GET /api/calc/attenuator', () => {
  it('10 dB pi in 50 Ω: 96.25 Ω shunt, 71.15 Ω series; E24 100 Ω and 68 Ω give 9.63 dB', async () => {
    const res = await get('/api/calc/attenuator?db=10&ohms=50&shape=pi&inputW=5');
    assert.equal(res.status, 200);
    close(res.body.shuntOhms, (50 * (Math.sqrt(10) + 1)) / (Math.sqrt(10) - 1), 1e-9); // 50 × 4.162278 / 2.162278 = 96.2475
    close(res.body.seriesOhms, (50 * 9) / (2 * Math.sqrt(10)), 1e-9); // 50 × 9 / (2 √10)
    assert.equal(res.body.e24.shuntOhms, 100);
    assert.equal(res.body.e24.seriesOhms, 68);
    close(res.body.e24.attenuationDb, 9.63, 0.005);
    close(res.body.power.firstResistorW, 250 / 96.24752955742645, 1e-9); // V² / R, V² = 5 W × 50 Ω
  });
  it('refuses 0 dB, a missing shape, an unknown shape and absurd power', async () => {
    await bad('/api/calc/attenuator?db=0&shape=pi', ['db']);
    await bad('/api/calc/attenuator?db=6', ['shape']);
    await bad('/api/calc/attenuator?db=6&shape=bridged', ['shape']);
    await bad('/api/calc/attenuator?db=6&shape=tee&inputW=1e6', ['inputW']);
  });
});

describe('GET /api/calc/line-loss', () => {
  it('1 dB matched at SWR 3: 1.50 dB total, 0.50 dB extra', async () => {
    const res = await get('/api/calc/line-loss?matchedLossDb=1&swr=3');
    assert.equal(res.status, 200);
    close(res.body.totalLossDb, 1.5038525490782206);
    close(res.body.extraLossDb, 0.5038525490782206);
    assert.equal(res.body.cable, undefined);
  });
  it('30 m of LMR-400 at 145 MHz, SWR 2: matched 1.49 dB from the datasheet formula', async () => {
    const res = await get('/api/calc/line-loss?cable=lmr-400&lengthM=30&mhz=145&swr=2');
    assert.equal(res.status, 200);
    close(res.body.matchedLossDb, 1.486482875039872);
    assert.equal(res.body.cable.name, 'LMR-400');
    assert.match(res.body.cable.source, /Times Microwave Systems/);
  });
  it('refuses both or neither loss sources, a cable without length or frequency, an SWR below 1, and a line over 30 dB', async () => {
    await bad('/api/calc/line-loss?matchedLossDb=1&cable=lmr-400&lengthM=3&mhz=14&swr=2', ['matchedLossDb', 'cable']);
    await bad('/api/calc/line-loss?swr=2', ['matchedLossDb']);
    await bad('/api/calc/line-loss?cable=lmr-400&swr=2', ['lengthM', 'mhz']);
    await bad('/api/calc/line-loss?matchedLossDb=1&swr=0.5', ['swr']);
    await bad('/api/calc/line-loss?cable=rg-58&lengthM=3&mhz=14&swr=2', ['cable']);
    const long = await bad('/api/calc/line-loss?cable=lmr-240&lengthM=1000&mhz=2400&swr=1.5', ['lengthM']);
    assert.match(long.fields.lengthM, /more than 30 dB/);
  });
});

describe('GET /api/calc/discharge', () => {
  it('400 V on 470 µF through 100 kΩ: 89.2 s to 60 V, 37.6 J, 1.6 W', async () => {
    const res = await get('/api/calc/discharge?volts=400&farads=0.00047&ohms=100000');
    assert.equal(res.status, 200);
    close(res.body.seconds, 47 * Math.log(400 / 60));
    close(res.body.joules, 37.6);
    close(res.body.initialWatts, 1.6);
    assert.equal(res.body.safeVolts, 60);
  });
  it('refuses 0 F, 0 Ω, 100 kV and a missing resistor', async () => {
    await bad('/api/calc/discharge?volts=400&farads=0&ohms=1000', ['farads']);
    await bad('/api/calc/discharge?volts=400&farads=0.001&ohms=0', ['ohms']);
    await bad('/api/calc/discharge?volts=100000&farads=0.001&ohms=1000', ['volts']);
    await bad('/api/calc/discharge?volts=400&farads=0.001', ['ohms']);
  });
});

describe('signed out', () => {
  it('every calculation answers 401', async () => {
    const anon = await anonymous(t.app);
    for (const path of ['xmodem', 'rf', 'dc-drop', 'level', 'dummy-load', 'attenuator', 'line-loss', 'discharge']) {
      const res = await anon.get(`/api/calc/${path}`);
      assert.equal(res.status, 401, path);
    }
  });
});
