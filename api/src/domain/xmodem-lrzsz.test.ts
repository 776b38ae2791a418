// Interoperability of our XMODEM engines with the classic lrzsz implementation (Debian package
// lrzsz, 0.12.21): `rx` receives what our sender sends, and our receiver receives what `sx` sends,
// in checksum and CRC-16 modes with 128-byte and 1K blocks, over the children's stdin/stdout. With a
// byte damaged in flight, each side retries and the file still ends identical up to the SUB padding.
// The test command installs lrzsz when it is missing (as root).
import { after, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { XmodemSender } from './xmodem-sender';
import { XmodemReceiver } from './xmodem-receiver';
import type { XmodemBlockSize, XmodemCheckMode } from './xmodem';
import type { XmodemStep } from './xmodem-wire';

const dir = mkdtempSync(path.join(tmpdir(), 'rw-xmodem-'));
after(() => rmSync(dir, { recursive: true, force: true }));

type Engine = XmodemSender | XmodemReceiver;

/**
 * Connects an engine to a child process's stdin/stdout with a real clock, until both have finished.
 * `damage` may change the bytes of one direction in flight (the index counts bytes on that line).
 */
function connect(
  engine: Engine,
  command: string,
  args: string[],
  damage: { towardChild?: (b: number, i: number) => number; fromChild?: (b: number, i: number) => number } = {},
): Promise<{ code: number | null; stderr: string }> {
  const child = spawn(command, args, { cwd: dir, stdio: ['pipe', 'pipe', 'pipe'] });
  const t0 = performance.now();
  const now = () => performance.now() - t0;
  let sentIndex = 0;
  let receivedIndex = 0;
  let stderr = '';
  const write = (step: XmodemStep) => {
    for (const chunk of step.send) {
      const out = damage.towardChild ? chunk.map((b) => damage.towardChild!(b, sentIndex++)) : chunk;
      if (!child.stdin.destroyed) child.stdin.write(out);
    }
  };
  child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
  child.stdin.on('error', () => {}); // the child may close its end first once it has finished
  child.stdout.on('data', (d: Buffer) => {
    const bytes = damage.fromChild ? Uint8Array.from(d, (b) => damage.fromChild!(b, receivedIndex++)) : new Uint8Array(d);
    write(engine.receive(bytes, now()));
  });
  const timer = setInterval(() => write(engine.tick(now())), 20);
  write(engine.start(now()));
  return new Promise((resolve) => {
    const guard = setTimeout(() => child.kill('SIGKILL'), 60_000);
    child.on('close', (code) => {
      clearInterval(timer);
      clearTimeout(guard);
      resolve({ code, stderr });
    });
  });
}

const padded = (img: Buffer, block: number) => {
  const size = Math.ceil(img.length / block) * block;
  return Buffer.concat([img, Buffer.alloc(size - img.length, 0x1a)]);
};

describe('our sender → lrzsz rx', () => {
  for (const check of ['sum', 'crc'] as const) {
    for (const block of [128, 1024] as const) {
      it(`${block}-byte blocks, ${check === 'crc' ? 'CRC-16 (rx -c)' : 'checksum (rx)'}: the file arrives identical`, async () => {
        const img = randomBytes(5 * block + 77);
        const out = `out-${check}-${block}.bin`;
        const sender = new XmodemSender(img, { block });
        const { code, stderr } = await connect(sender, 'rx', [...(check === 'crc' ? ['-c'] : []), '-q', out]);
        assert.equal(sender.state, 'done', stderr);
        assert.equal(code, 0, stderr);
        assert.equal(sender.check, check);
        assert.deepEqual(readFileSync(path.join(dir, out)), padded(img, block));
      });
    }
  }

  it('a byte damaged in block 3 is sent again and the file still arrives identical', async () => {
    const block: XmodemBlockSize = 128;
    const img = randomBytes(6 * block);
    const sender = new XmodemSender(img, { block });
    // CRC blocks are 133 bytes: byte 300 on the line is inside block 3.
    const { code, stderr } = await connect(sender, 'rx', ['-c', '-q', 'damaged.bin'], { towardChild: (b, i) => (i === 300 ? b ^ 0x20 : b) });
    assert.equal(code, 0, stderr);
    assert.equal(sender.state, 'done');
    assert.ok(sender.retries >= 1, `retries: ${sender.retries}`);
    assert.deepEqual(readFileSync(path.join(dir, 'damaged.bin')), padded(img, block));
  });
});

describe('lrzsz sx → our receiver', () => {
  const cases: { check: XmodemCheckMode; k: boolean }[] = [
    { check: 'sum', k: false },
    { check: 'crc', k: false },
    { check: 'crc', k: true },
  ];
  for (const { check, k } of cases) {
    it(`sx${k ? ' -k (1K blocks)' : ''} with our receiver asking for ${check === 'crc' ? 'CRC-16' : 'the checksum'}: identical`, async () => {
      const img = randomBytes(3 * 1024 + 300);
      const name = `in-${check}-${k}.bin`;
      writeFileSync(path.join(dir, name), img);
      const receiver = new XmodemReceiver({ check });
      const { code, stderr } = await connect(receiver, 'sx', [...(k ? ['-k'] : []), '-q', name]);
      assert.equal(receiver.state, 'done', stderr);
      assert.equal(code, 0, stderr);
      assert.equal(receiver.check, check);
      const got = Buffer.from(receiver.data());
      assert.deepEqual(got.subarray(0, img.length), img);
      assert.ok(got.subarray(img.length).every((b) => b === 0x1a), 'only SUB padding after the image');
    });
  }

  it('a byte damaged in flight makes our receiver NAK after the line clears, and the file still arrives identical', async () => {
    const img = randomBytes(5 * 128);
    writeFileSync(path.join(dir, 'hit.bin'), img);
    const receiver = new XmodemReceiver({ check: 'crc' });
    const { code, stderr } = await connect(receiver, 'sx', ['-q', 'hit.bin'], { fromChild: (b, i) => (i === 140 ? b ^ 0x01 : b) });
    assert.equal(code, 0, stderr);
    assert.equal(receiver.state, 'done');
    assert.ok(receiver.retries >= 1, `retries: ${receiver.retries}`);
    assert.deepEqual(Buffer.from(receiver.data()).subarray(0, img.length), img);
  });

  it('our cancel sequence stops sx', async () => {
    writeFileSync(path.join(dir, 'stop.bin'), randomBytes(20 * 128));
    const receiver = new XmodemReceiver({ check: 'crc' });
    let cancelled = false;
    const original = receiver.receive.bind(receiver);
    receiver.receive = (bytes, now) => {
      const step = original(bytes, now);
      if (!cancelled && receiver.blocksReceived >= 2) {
        cancelled = true;
        const stop = receiver.cancel('Stopped by the test.');
        return { send: [...step.send, ...stop.send], events: [...step.events, ...stop.events] };
      }
      return step;
    };
    const { code } = await connect(receiver, 'sx', ['-q', 'stop.bin']);
    assert.equal(receiver.state, 'cancelled');
    assert.notEqual(code, 0, 'sx reports the cancelled transfer as a failure');
  });
});
