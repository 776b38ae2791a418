// The live board's event stream against the real MariaDB: who may open it, that it reports the
// revision at once and again after a move (on this replica and on another one), and that the
// revision watch reads the database once per interval per process, not once per open stream.
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { createUser, setupTestApp, signIn, truncateAll, type TestApp, type TestClient } from '../../../test/helpers';
import { SESSION_COOKIE } from '../auth/tokens';
import express from 'express';
import { createRevisionWatch, serveBoardStream } from './board-events';

const PW = 'correct horse battery';
let t: TestApp;
let server: Server;
let base = '';
let tech: TestClient, member: TestClient;

before(async () => {
  t = await setupTestApp();
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
after(async () => {
  server.closeAllConnections();
  await new Promise((resolve) => server.close(resolve));
  await t.close();
});

beforeEach(async () => {
  await truncateAll(t.sequelize);
  await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  [member, tech] = await Promise.all(['perrin', 'tobin'].map((n) => signIn(t.app, `${n}@kestrelfen.example`, PW)));
});

/** An open event stream read through real HTTP, as a browser's EventSource would read it. */
async function openStream(who: TestClient, url = `${base}/api/board/events`) {
  const abort = new AbortController();
  const res = await fetch(url, { headers: { cookie: `${SESSION_COOKIE}=${who.cookie(SESSION_COOKIE)}` }, signal: abort.signal });
  const reader = res.body!.getReader();
  const decoder = new TextDecoder();
  let buffered = '';
  /** The next `revision` event's data, or an error after `ms`. */
  async function nextRevision(ms = 5000): Promise<string | null> {
    const deadline = Date.now() + ms;
    for (;;) {
      const end = buffered.indexOf('\n\n');
      if (end >= 0) {
        const block = buffered.slice(0, end);
        buffered = buffered.slice(end + 2);
        const lines = block.split('\n');
        if (lines[0] === 'event: revision') return (JSON.parse(lines[1]!.slice('data: '.length)) as { revision: string | null }).revision;
        continue; // retry: and comment lines
      }
      const left = deadline - Date.now();
      if (left <= 0) throw new Error('no revision event in time');
      const chunk = await Promise.race([
        reader.read(),
        new Promise<never>((_, reject) => setTimeout(() => reject(new Error('no revision event in time')), left)),
      ]);
      if (chunk.done) throw new Error('the stream ended');
      buffered += decoder.decode(chunk.value, { stream: true });
    }
  }
  return { res, nextRevision, close: () => abort.abort() };
}

const intake = {
  equipmentKind: 'transceiver',
  makeModel: 'Carrow Avocet 5 QRP transceiver',
  units: ['transceiver'],
  faultReported: 'No transmit output on any band.',
  accessories: [],
  reflashConsent: false,
  notifyByEmail: false,
};

describe('GET /api/board/events', () => {
  it('is for technicians and admins: a member gets 403 and no stream, nobody signed in 401', async () => {
    const res = await member.get('/api/board/events').expect(403);
    assert.equal(res.body.error.code, 'forbidden');
    const anon = await fetch(`${base}/api/board/events`);
    assert.equal(anon.status, 401);
    assert.equal(((await anon.json()) as { error: { code: string } }).error.code, 'not_signed_in');
  });

  it('reports the revision at once, and a new one within a few seconds of a move', async () => {
    const ticket = (await member.post('/api/tickets', intake).expect(201)).body;
    const stream = await openStream(tech);
    try {
      assert.equal(stream.res.status, 200);
      assert.match(stream.res.headers.get('content-type') ?? '', /^text\/event-stream/);
      assert.equal(stream.res.headers.get('cache-control'), 'no-store');
      const first = await stream.nextRevision();
      assert.ok(first !== null && /^\d+$/.test(first), `revision ${first}`);
      // The board read says which revision it is at, so a client can tell whether it is current.
      assert.equal((await tech.get('/api/board').expect(200)).headers['x-board-revision'], first);

      const started = Date.now();
      await tech.post(`/api/tickets/${ticket.tag}/moves`, { to: 'diagnosis', version: 0 }).expect(200);
      const second = await stream.nextRevision(5000);
      assert.ok(BigInt(second!) > BigInt(first), `revision went from ${first} to ${second}`);
      // The watch polls once a second: the change arrives within about one interval.
      assert.ok(Date.now() - started < 3000, `took ${Date.now() - started} ms`);
    } finally {
      stream.close();
    }
  });

  it('a stream on one replica hears about a move made through another (the revision lives in the database)', async () => {
    const ticket = (await member.post('/api/tickets', intake).expect(201)).body;
    const { createApp } = await import('../../app');
    const replica = createApp({ config: t.config, sequelize: t.sequelize, logger: t.logger });
    const replicaServer = replica.listen(0, '127.0.0.1');
    await new Promise((resolve) => replicaServer.once('listening', resolve));
    const stream = await openStream(tech, `http://127.0.0.1:${(replicaServer.address() as AddressInfo).port}/api/board/events`);
    try {
      const first = await stream.nextRevision();
      await tech.post(`/api/tickets/${ticket.tag}/moves`, { to: 'diagnosis', version: 0 }).expect(200); // through the first app
      const second = await stream.nextRevision(5000);
      assert.notEqual(second, first);
    } finally {
      stream.close();
      replicaServer.closeAllConnections();
      await new Promise((resolve) => replicaServer.close(resolve));
    }
  });
});

describe('the revision watch', () => {
  it('reads the database once per interval however many streams listen, and stops with the last one', async () => {
    const bump = () =>
      t.sequelize.query('INSERT INTO club_settings (id, wait_limit_hours, board_revision) VALUES (1, 72, 1) ON DUPLICATE KEY UPDATE board_revision = board_revision + 1');
    await bump();
    const watch = createRevisionWatch(t.sequelize, { intervalMs: 100 });
    const heard: (string | null)[][] = Array.from({ length: 20 }, () => []);
    const stops = heard.map((list) => watch.subscribe((r) => list.push(r)));
    assert.equal(watch.listeners, 20);
    await new Promise((r) => setTimeout(r, 550));
    const polls = watch.polls;
    // About 5 polls in 550 ms at 100 ms, not 20 streams × 5.
    assert.ok(polls >= 3 && polls <= 6, `${polls} polls`);
    // Every listener heard the current revision once (no change since).
    for (const list of heard) assert.equal(list.length, 1);

    await bump();
    await new Promise((r) => setTimeout(r, 250));
    for (const list of heard) {
      assert.equal(list.length, 2);
      assert.ok(BigInt(list[1]!) === BigInt(list[0]!) + 1n);
    }

    for (const stop of stops) stop();
    assert.equal(watch.listeners, 0);
    const after = watch.polls;
    await new Promise((r) => setTimeout(r, 300));
    assert.equal(watch.polls, after, 'no polling while no stream is open');
  });
});

describe('one stream', () => {
  it('says retry, sends a heartbeat comment, and ends after its maximum age with a reconnect notice', async () => {
    const watch = createRevisionWatch(t.sequelize, { intervalMs: 100 });
    const app = express();
    app.get('/events', (req, res) => serveBoardStream(t.sequelize, watch, req, res, { heartbeatMs: 100, maxAgeMs: 450, retryMs: 2500 }));
    const local = app.listen(0, '127.0.0.1');
    await new Promise((resolve) => local.once('listening', resolve));
    try {
      const started = Date.now();
      const res = await fetch(`http://127.0.0.1:${(local.address() as AddressInfo).port}/events`);
      const text = await res.text(); // resolves when the server ends the stream
      assert.ok(Date.now() - started >= 400, 'ended by its maximum age, not before');
      assert.ok(text.startsWith('retry: 2500\n\n'), text);
      assert.match(text, /^: still here$/m);
      assert.ok(text.endsWith('event: reconnect\ndata: {}\n\n'), text);
      assert.equal(watch.listeners, 0, 'the ended stream left the watch');
    } finally {
      local.closeAllConnections();
      await new Promise((resolve) => local.close(resolve));
    }
  });
});
