// Work after the answer: runs without being awaited, logs its failures, and idle() waits for all of it.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { Writable } from 'node:stream';
import { pino } from 'pino';
import { BackgroundWork } from './background';

test('runs tasks without waiting, logs a failure with its label, and idle() waits for every task (and those they start)', async () => {
  const lines: Record<string, unknown>[] = [];
  const logger = pino(new Writable({ write: (chunk, _enc, cb) => (lines.push(JSON.parse(chunk.toString())), cb()) }));
  const work = new BackgroundWork();
  const done: string[] = [];
  let release!: () => void;
  const gate = new Promise<void>((resolve) => (release = resolve));

  work.run('slow', logger, async () => {
    await gate;
    done.push('slow');
    work.run('follow-up', logger, async () => done.push('follow-up'));
  });
  work.run('broken', logger, async () => {
    throw new Error('mail table locked');
  });
  assert.deepEqual(done, [], 'run() does not wait');

  const idle = work.idle();
  release();
  await idle;
  assert.deepEqual(done, ['slow', 'follow-up']);
  assert.equal(lines.length, 1);
  assert.equal(lines[0]!.task, 'broken');
  assert.equal(lines[0]!.msg, 'background work failed');
  assert.equal((lines[0]!.err as { message: string }).message, 'mail table locked');
  await work.idle(); // nothing left: resolves at once
});
