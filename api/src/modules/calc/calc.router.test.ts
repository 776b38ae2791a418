// The calculation endpoints through HTTP, on a tiny app that mounts only the calc router with an
// error handler like the real app's (AppError → status and toBody()). Expected figures are the
// domain tests' worked examples (Forsberg 1988; ARRL Handbook definitions; NEC Ch. 9 Table 8).
// The "not signed in → 401" check belongs to the real app and is added where it is assembled.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import express, { type NextFunction, type Request, type Response } from 'express';
import request from 'supertest';
import { AppError } from '../../errors';
import { calcRouter } from './calc.router';

const app = express();
app.use('/api/calc', calcRouter);
app.use((err: unknown, _req: Request, res: Response, _next: NextFunction) => {
  if (err instanceof AppError) res.status(err.status).json(err.toBody());
  else res.status(500).json({ error: { code: 'internal_error', message: 'Something went wrong.' } });
});

const close = (actual: number, expected: number, eps = 1e-9) =>
  assert.ok(Math.abs(actual - expected) <= eps, `${actual} ≠ ${expected}`);

async function bad(path: string, fields: string[]) {
  const res = await request(app).get(path);
  assert.equal(res.status, 400, `${path} → ${res.status} ${JSON.stringify(res.body)}`);
  assert.equal(res.body.error.code, 'validation_failed');
  assert.equal(typeof res.body.error.message, 'string');
  assert.ok(res.body.error.message.length > 3);
  assert.deepEqual(Object.keys(res.body.error.fields ?? {}).sort(), [...fields].sort());
  return res.body.error as { message: string; fields: Record<string, string> };
}

describe('GET /api/calc/xmodem', () => {
  it('plans 1 MiB in 1K blocks with CRC at 115200 baud', async () => {
    const res = await request(app).get('/api/calc/xmodem?bytes=1048576&block=1024&check=crc&baud=115200');
    assert.equal(res.status, 200);
    assert.deepEqual(Object.keys(res.body).sort(), ['blocks', 'paddingBytes', 'seconds', 'wireBytes']);
    assert.equal(res.body.blocks, 1024);
    assert.equal(res.body.paddingBytes, 0);
    assert.equal(res.body.wireBytes, 1_053_697); // 1024 × (3 + 1024 + 2) + 1 EOT
    close(res.body.seconds, 91.46675347222222);
  });
  it('plans one byte over a block with the 8-bit checksum', async () => {
    const res = await request(app).get('/api/calc/xmodem?bytes=129&block=128&check=sum&baud=9600');
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
    const res = await request(app).get('/api/calc/rf?forwardW=100&reflectedW=4');
    assert.equal(res.status, 200);
    assert.deepEqual(Object.keys(res.body).sort(), ['forwardDbm', 'mismatchLossDb', 'reflectionCoefficient', 'returnLossDb', 'swr']);
    close(res.body.reflectionCoefficient, 0.2);
    close(res.body.swr, 1.5);
    close(res.body.returnLossDb, 13.979400086720377);
    close(res.body.mismatchLossDb, 0.17728766960431616);
    close(res.body.forwardDbm, 50);
  });
  it('no reflected power: return loss is null (unbounded)', async () => {
    const res = await request(app).get('/api/calc/rf?forwardW=5&reflectedW=0');
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
  });
});

describe('GET /api/calc/dc-drop', () => {
  it('20 A, 2 m of AWG 12 from 13.8 V: 0.52 V drop, 13.28 V at the radio, within tolerance', async () => {
    const res = await request(app).get('/api/calc/dc-drop?currentA=20&lengthM=2&awg=12&supplyV=13.8');
    assert.equal(res.status, 200);
    close(res.body.dropV, 0.519685039, 1e-8);
    close(res.body.voltageAtRadioV, 13.280314961, 1e-8);
    assert.equal(res.body.withinTolerance, true);
    assert.equal(res.body.gauge, 'AWG 12');
    close(res.body.minV, 11.73);
    close(res.body.maxV, 15.87);
    assert.equal(res.body.tolerancePct, 15);
  });
  it('22 A, 3 m of 2.5 mm² from 13.8 V with a ±5 % band: 12.75 V, outside', async () => {
    const res = await request(app).get('/api/calc/dc-drop?currentA=22&lengthM=3&mm2=2.5&supplyV=13.8&tolerancePct=5');
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
  it('refuses a current the lead cannot carry at that supply (the domain check, as a 400)', async () => {
    const e = await bad('/api/calc/dc-drop?currentA=1000&lengthM=2&awg=12&supplyV=13.8', ['currentA']);
    assert.match(e.fields.currentA, /whole supply/);
  });
});
