// Slow clients (Node's http.Server requestTimeout / headersTimeout; OWASP Denial of Service Cheat
// Sheet, "slow HTTP" attacks): a request that declares a long body and sends nothing, or whose
// headers never end, is answered 408 and its connection closed, while normal requests go on.
// Process-level handlers log unhandled rejections and uncaught exceptions as JSON.
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import { EventEmitter } from 'node:events';
import net, { type AddressInfo } from 'node:net';
import { Writable } from 'node:stream';
import type http from 'node:http';
import { pino } from 'pino';
import { setupTestApp, type TestApp } from '../test/helpers';
import { createHttpServer } from './http-server';
import { installProcessHandlers } from './process-handlers';

let t: TestApp | undefined;
let server: http.Server | undefined;
after(async () => {
  server?.closeAllConnections();
  await new Promise((resolve) => (server ? server.close(resolve) : resolve(undefined)));
  await t?.close();
});

/** Sends `raw` on a new connection and collects what comes back until the server closes it (or the deadline). */
function rawExchange(port: number, raw: string, deadlineMs: number): Promise<{ text: string; closedAfterMs: number | null }> {
  return new Promise((resolve, reject) => {
    const started = Date.now();
    const socket = net.connect(port, '127.0.0.1', () => socket.write(raw));
    let text = '';
    socket.on('data', (d) => (text += d.toString('latin1')));
    socket.on('error', reject);
    const timer = setTimeout(() => {
      socket.destroy();
      resolve({ text, closedAfterMs: null });
    }, deadlineMs);
    socket.on('close', () => {
      clearTimeout(timer);
      resolve({ text, closedAfterMs: Date.now() - started });
    });
  });
}

test('a request that declares a long body and sends nothing, or never ends its headers, is dropped with 408', { timeout: 60_000 }, async () => {
  t = await setupTestApp();
  server = createHttpServer(t.app, { RW_REQUEST_TIMEOUT_MS: 1500, RW_HEADERS_TIMEOUT_MS: 1000 });
  await new Promise<void>((resolve) => server!.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;

  // Control: a whole request on the same server is answered normally.
  const ok = await fetch(`http://127.0.0.1:${port}/api/auth/session`);
  assert.equal(ok.status, 200);

  const silentBody = await rawExchange(
    port,
    'POST /api/auth/sign-in HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: application/json\r\nContent-Length: 100000\r\n\r\n{"email":',
    15_000,
  );
  assert.notEqual(silentBody.closedAfterMs, null, 'the server closed the connection');
  assert.match(silentBody.text, /^HTTP\/1\.1 408 /);
  assert.ok(silentBody.closedAfterMs! >= 1000, `dropped by the timeout, not at once (${silentBody.closedAfterMs} ms)`);

  const endlessHeaders = await rawExchange(port, 'GET /api/auth/session HTTP/1.1\r\nHost: 127.0.0.1\r\nX-Slow: a', 15_000);
  assert.notEqual(endlessHeaders.closedAfterMs, null, 'the server closed the connection');
  assert.match(endlessHeaders.text, /^HTTP\/1\.1 408 /);

  // Still serving.
  assert.equal((await fetch(`http://127.0.0.1:${port}/api/auth/session`)).status, 200);
});

test('process handlers: an unhandled rejection is logged and serving goes on; an uncaught exception is logged and stops', () => {
  const lines: Record<string, unknown>[] = [];
  const sink = new Writable({
    write(chunk, _enc, cb) {
      for (const line of chunk.toString().split('\n').filter(Boolean)) lines.push(JSON.parse(line));
      cb();
    },
  });
  const logger = pino({ level: 'info' }, sink);
  const proc = new EventEmitter();
  const fatal: unknown[] = [];
  installProcessHandlers(logger, (err) => fatal.push(err), proc);

  proc.emit('unhandledRejection', new Error('lost promise\r\n{"level":30,"msg":"forged"}'), Promise.resolve());
  assert.equal(fatal.length, 0, 'a lost promise does not stop the API');
  proc.emit('uncaughtException', new TypeError('broken state'), 'uncaughtException');
  assert.equal(fatal.length, 1);
  assert.equal((fatal[0] as Error).message, 'broken state');

  assert.equal(lines.length, 2, 'one JSON line each: the CRLF inside the message forged no extra line');
  assert.equal(lines[0]!.level, 50);
  assert.equal(lines[0]!.msg, 'unhandled promise rejection');
  assert.match(String((lines[0]!.err as { message: string }).message), /^lost promise/);
  assert.equal(lines[1]!.level, 60);
  assert.equal(lines[1]!.msg, 'uncaught exception; stopping');
  assert.equal((lines[1]!.err as { type: string }).type, 'TypeError');
});
