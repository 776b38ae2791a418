// Crash safety (reliability.md, test 21; the transactional outbox pattern): the API process is
// killed with SIGKILL in the middle of a burst of ticket moves and intakes, then started again.
// Every request that was answered 2xx must be in the database with its audit event and its outbox
// mail, and nothing may be half-written from the requests that were cut off: no ticket without its
// 'opened' event and mail, no move without its 'moved' event and mail, no bump of the board
// revision without its write. Loopback only; bounded in time.
import { after, test } from 'node:test';
import assert from 'node:assert/strict';
import { spawn, type ChildProcess } from 'node:child_process';
import net, { type AddressInfo } from 'node:net';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { createUser, setupTestApp, signIn, type TestApp } from '../test/helpers';

const ROOT = path.resolve(import.meta.dirname, '..', '..');
const PASSWORD = 'kill switch at the bench';
const PRE_OPENED = 30;
const LANES = 12;
const KILL_AFTER_ACKNOWLEDGED = 15;

let t: TestApp | undefined;
const children: ChildProcess[] = [];
after(async () => {
  for (const child of children) if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  await t?.close();
});

const intake = (n: number) => ({
  equipmentKind: 'transceiver',
  makeModel: `Crashproof CP-${n} HF transceiver`,
  units: ['main body'],
  faultReported: 'Display dark after a power cut.',
  accessories: ['DC lead'],
  reflashConsent: true,
  notifyByEmail: true,
});

async function freePort(): Promise<number> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  await new Promise((resolve) => server.close(resolve));
  return port;
}

/** The API as a child process, as `npm start` runs it, on its own port; resolves once it answers. */
async function startApi(t: TestApp, port: number): Promise<{ child: ChildProcess; stderr: () => string }> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'api/src/index.ts'], {
    cwd: ROOT,
    env: {
      ...process.env,
      NODE_ENV: 'test',
      RW_HOST: '127.0.0.1',
      RW_PORT: String(port),
      RW_DB_HOST: t.config.RW_DB_HOST,
      RW_DB_PORT: String(t.config.RW_DB_PORT),
      RW_DB_NAME: t.config.RW_DB_NAME,
      RW_COOKIE_SECURE: 'false',
      RW_CLIENT_DIST: '',
      RW_OUTBOX_INTERVAL_MS: '0', // leave the mail rows pending, to be counted
      RW_LOG_LEVEL: 'warn',
      RW_SIGNIN_MAX_PER_ADDRESS: '1000',
    },
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  children.push(child);
  let stderr = '';
  child.stderr!.on('data', (d: Buffer) => (stderr += d.toString()));
  const deadline = Date.now() + 90_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`The API exited during start-up (${child.exitCode}): ${stderr}`);
    if (Date.now() > deadline) throw new Error(`The API did not answer within 90 s: ${stderr}`);
    try {
      if ((await fetch(`http://127.0.0.1:${port}/api/auth/session`)).ok) return { child, stderr: () => stderr };
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 200)); // polling for start-up, with a deadline
  }
}

/** A signed-in HTTP client on the child (fetch with its own cookie store and anti-forgery header). */
async function client(port: number, email: string) {
  const cookies = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair!.indexOf('=');
      cookies.set(pair!.slice(0, eq), pair!.slice(eq + 1));
    }
  };
  const request = async (method: string, url: string, body?: unknown) => {
    const res = await fetch(`http://127.0.0.1:${port}${url}`, {
      method,
      headers: {
        cookie: [...cookies].map(([k, v]) => `${k}=${v}`).join('; '),
        ...(method === 'GET' ? {} : { 'x-xsrf-token': cookies.get('XSRF-TOKEN') ?? '', 'content-type': 'application/json' }),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    keep(res);
    return { status: res.status, body: (await res.json().catch(() => null)) as Record<string, unknown> | null };
  };
  await request('GET', '/api/auth/session');
  const signedIn = await request('POST', '/api/auth/sign-in', { email, password: PASSWORD });
  assert.equal(signedIn.status, 200, `sign-in on the child as ${email}`);
  return request;
}

type Outcome =
  | { kind: 'intake'; status: number; id?: number }
  | { kind: 'move'; tag: string; status: number }
  | { kind: 'intake' | 'move'; tag?: string; error: string };

async function rows<T extends object>(t: TestApp, sql: string): Promise<T[]> {
  return t.sequelize.query<T>(sql, { type: QueryTypes.SELECT });
}

test('SIGKILL mid-burst of moves and intakes: every 2xx is stored whole, nothing is half-written', { timeout: 300_000 }, async () => {
  const db = (t = await setupTestApp());
  await createUser(db.sequelize, { email: 'tess.kilner@kestrelfen.example', password: PASSWORD, roles: ['technician'] });
  await createUser(db.sequelize, { email: 'abel.crane@kestrelfen.example', password: PASSWORD, roles: ['member'] });
  // Tickets waiting at intake for the burst to move, opened in-process before the child starts.
  const member = await signIn(db.app, 'abel.crane@kestrelfen.example', PASSWORD);
  const waiting: string[] = [];
  for (let i = 0; i < PRE_OPENED; i++) waiting.push((await member.post('/api/tickets', intake(i)).expect(201)).body.tag);

  const port = await freePort();
  const first = await startApi(db, port);
  const tech = await client(port, 'tess.kilner@kestrelfen.example');
  const owner = await client(port, 'abel.crane@kestrelfen.example');

  // The burst: LANES loops, each sending moves (of a random waiting ticket, so some collide and
  // get 409) and intakes back to back, until the process is killed under them.
  const outcomes: Outcome[] = [];
  let acknowledged = 0;
  let killed = false;
  let killNow!: () => void;
  const killSignal = new Promise<void>((resolve) => (killNow = resolve));
  const lane = async (n: number) => {
    for (let i = 0; !killed; i++) {
      const move = (n + i) % 3 !== 0;
      const tag = waiting[Math.floor(Math.random() * waiting.length)]!;
      try {
        if (move) {
          const res = await tech('POST', `/api/tickets/${tag}/moves`, { to: 'diagnosis', version: 0 });
          outcomes.push({ kind: 'move', tag, status: res.status });
          if (res.status >= 200 && res.status < 300) acknowledged++;
        } else {
          const res = await owner('POST', '/api/tickets', intake(1000 + n * 100 + i));
          outcomes.push({ kind: 'intake', status: res.status, id: res.body?.id as number | undefined });
          if (res.status >= 200 && res.status < 300) acknowledged++;
        }
      } catch (err) {
        outcomes.push({ kind: move ? 'move' : 'intake', tag: move ? tag : undefined, error: String((err as Error).cause ?? err) });
      }
      if (acknowledged >= KILL_AFTER_ACKNOWLEDGED) killNow();
    }
  };
  const lanes = Array.from({ length: LANES }, (_, n) => lane(n));
  await Promise.race([killSignal, new Promise((resolve) => setTimeout(resolve, 60_000))]);
  const exited = new Promise((resolve) => first.child.once('exit', resolve));
  first.child.kill('SIGKILL');
  killed = true;
  await exited;
  await Promise.all(lanes);

  const cutOff = outcomes.filter((o) => 'error' in o);
  const answered = outcomes.filter((o): o is Exclude<Outcome, { error: string }> => !('error' in o));
  assert.ok(acknowledged >= KILL_AFTER_ACKNOWLEDGED, `the burst got ${acknowledged} 2xx before the kill; stderr: ${first.stderr()}`);
  assert.ok(cutOff.length > 0, 'some requests were in flight when the process died');
  for (const o of answered) assert.ok([200, 201, 409].includes(o.status), `unexpected answer ${JSON.stringify(o)}`);

  // Start again on the same database and port: it recovers by itself and serves.
  await startApi(db, port);
  const techAgain = await client(port, 'tess.kilner@kestrelfen.example');

  // Every acknowledged intake: the ticket, its one 'opened' event and its one mail.
  const intakesOk = answered.filter((o) => o.kind === 'intake' && o.status === 201) as { id: number }[];
  for (const { id } of intakesOk) {
    assert.ok(Number.isInteger(id), 'a 201 carries the ticket id');
    const [ticket] = await rows<{ state: string; version: number }>(db, `SELECT state, version FROM tickets WHERE id = ${id}`);
    assert.ok(ticket, `acknowledged ticket ${id} is in the database`);
    const [events] = await rows<{ n: number }>(db, `SELECT COUNT(*) AS n FROM ticket_events WHERE ticket_id = ${id} AND kind = 'opened'`);
    assert.equal(Number(events!.n), 1, `ticket ${id} has its opened event`);
    const [mails] = await rows<{ n: number }>(db, `SELECT COUNT(*) AS n FROM outbox WHERE ticket_id = ${id} AND kind = 'ticket_opened'`);
    assert.equal(Number(mails!.n), 1, `ticket ${id} has its opened mail`);
  }
  // Every acknowledged move: the ticket in diagnosis at version 1, one 'moved' event, one mail.
  const movesOk = answered.filter((o) => o.kind === 'move' && o.status === 200) as { tag: string }[];
  assert.equal(new Set(movesOk.map((m) => m.tag)).size, movesOk.length, 'one winner per ticket and version');
  for (const { tag } of movesOk) {
    const detail = await techAgain('GET', `/api/tickets/${tag}`);
    assert.equal(detail.status, 200);
    assert.equal(detail.body!.state, 'diagnosis', `${tag} stayed moved`);
    assert.equal(detail.body!.version, 1);
    const moved = (detail.body!.events as { kind: string; fromState: string; toState: string }[]).filter((e) => e.kind === 'moved');
    assert.deepEqual(moved.map((e) => [e.fromState, e.toState]), [['intake', 'diagnosis']], `${tag} has its moved event`);
    const id = Number(tag.slice(3));
    const [mails] = await rows<{ n: number }>(db, `SELECT COUNT(*) AS n FROM outbox WHERE ticket_id = ${id} AND kind = 'ticket_moved'`);
    assert.equal(Number(mails!.n), 1, `${tag} has its moved mail`);
  }

  // Nothing half-written anywhere, whether answered or cut off: per ticket, one opened event and
  // mail, one moved event and mail per version step, a state that matches its events.
  const tickets = await rows<{ id: number; state: string; version: number; opened: number; moved: number; opened_mails: number; moved_mails: number; last_to: string | null }>(db,
    `SELECT t.id, t.state, t.version,
            (SELECT COUNT(*) FROM ticket_events e WHERE e.ticket_id = t.id AND e.kind = 'opened') AS opened,
            (SELECT COUNT(*) FROM ticket_events e WHERE e.ticket_id = t.id AND e.kind = 'moved') AS moved,
            (SELECT COUNT(*) FROM outbox o WHERE o.ticket_id = t.id AND o.kind = 'ticket_opened') AS opened_mails,
            (SELECT COUNT(*) FROM outbox o WHERE o.ticket_id = t.id AND o.kind = 'ticket_moved') AS moved_mails,
            (SELECT e.to_state FROM ticket_events e WHERE e.ticket_id = t.id ORDER BY e.id DESC LIMIT 1) AS last_to
       FROM tickets t`,
  );
  assert.ok(tickets.length >= PRE_OPENED + intakesOk.length);
  for (const row of tickets) {
    const label = `ticket ${row.id}`;
    assert.equal(Number(row.opened), 1, `${label}: one opened event`);
    assert.equal(Number(row.opened_mails), 1, `${label}: one opened mail`);
    assert.equal(Number(row.moved), Number(row.version), `${label}: one moved event per version step`);
    assert.equal(Number(row.moved_mails), Number(row.version), `${label}: one moved mail per version step`);
    assert.equal(row.last_to, row.state, `${label}: its state is where its last event put it`);
  }
  const [orphans] = await rows<{ events: number; mails: number }>(db,
    `SELECT (SELECT COUNT(*) FROM ticket_events e LEFT JOIN tickets t ON t.id = e.ticket_id WHERE t.id IS NULL) AS events,
            (SELECT COUNT(*) FROM outbox o WHERE o.ticket_id IS NOT NULL AND o.ticket_id NOT IN (SELECT id FROM tickets)) AS mails`,
  );
  assert.deepEqual([Number(orphans!.events), Number(orphans!.mails)], [0, 0], 'no event or mail without its ticket');
  // The board revision is bumped in the same transaction as each write: one per ticket and per move.
  const [settings] = await rows<{ board_revision: number }>(db, 'SELECT board_revision FROM club_settings WHERE id = 1');
  const totalMoves = tickets.reduce((n, r) => n + Number(r.moved), 0);
  assert.equal(Number(settings!.board_revision), tickets.length + totalMoves, 'board revision matches the writes that committed');

  // And the restarted API takes new work.
  const fresh = await techAgain('POST', '/api/tickets', intake(9999));
  assert.equal(fresh.status, 201, 'an intake after the restart');
});
