// Test fixtures for fees and payments: the local payments fake listening on a free loopback port,
// an app whose SDK points at it, the four roles signed in, a small fee schedule, and helpers to
// open a ticket with charges, pay its checkout at the fake and deliver the fake's events.
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import supertest from 'supertest';
import { createPaymentsFake, signatureHeader, type PaymentsFake, type PaymentsFakeOptions } from '../../payments-fake/fake';
import { DEV_STRIPE_WEBHOOK_SECRET } from '../src/config';
import { createUser, setupTestApp, signIn, type ConfigOverrides, type TestApp, type TestClient } from './helpers';
import type { Clock } from '../src/deps';

export const PASSWORD = 'payments-test-passphrase';

export interface RunningFake {
  fake: PaymentsFake;
  port: number;
  server: Server;
  close(): Promise<void>;
}

export async function startFake(options: Partial<PaymentsFakeOptions> = {}): Promise<RunningFake> {
  let port = 0;
  const fake = createPaymentsFake({
    webhookSecret: DEV_STRIPE_WEBHOOK_SECRET,
    publicUrl: 'http://127.0.0.1:0',
    autoDeliver: false,
    ...options,
  });
  const server = await new Promise<Server>((resolve) => {
    const s = fake.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  port = (server.address() as AddressInfo).port;
  return {
    fake,
    port,
    server,
    async close() {
      await fake.idle();
      server.closeAllConnections();
      await new Promise((r) => server.close(() => r(undefined)));
    },
  };
}

export interface PaymentsWorld {
  t: TestApp;
  fake: RunningFake;
  member: TestClient;
  otherMember: TestClient;
  tech: TestClient;
  treasurer: TestClient;
  fees: { session: number; diagnosis: number; labour: number };
  close(): Promise<void>;
}

/** An app, the fake, the roles and a fee schedule starting today. */
export async function paymentsWorld(overrides: ConfigOverrides = {}, options: { clock?: Clock } = {}): Promise<PaymentsWorld> {
  const fake = await startFake();
  const t = await setupTestApp(
    { RW_STRIPE_PORT: String(fake.port), RW_STRIPE_MAX_RETRIES: '0', RW_SIGNIN_MAX_PER_ADDRESS: '100000', ...overrides },
    options,
  );
  await t.sequelize.query("INSERT INTO club_settings (id, club_name, currency) VALUES (1, 'Test Fen Radio Club', 'GBP') ON DUPLICATE KEY UPDATE currency = 'GBP'");
  const make = async (name: string, roles: ('member' | 'technician' | 'treasurer' | 'admin')[]) => {
    await createUser(t.sequelize, { email: `${name}@pay.example`, password: PASSWORD, roles, displayName: name });
    return signIn(t.app, `${name}@pay.example`, PASSWORD);
  };
  const member = await make('member', ['member']);
  const otherMember = await make('other', ['member']);
  const tech = await make('tech', ['technician']);
  const treasurer = await make('treasurer', ['treasurer']);
  const today = new Date((options.clock ?? (() => new Date()))().getTime()).toISOString().slice(0, 10);
  const add = async (code: string, name: string, unit: 'each' | 'hour', memberPrice: number, nonMemberPrice: number) => {
    const res = await treasurer.post('/api/fees', { code, name, unit, memberPrice, nonMemberPrice, effectiveFrom: today });
    if (res.status !== 201) throw new Error(`fee ${code}: ${res.status} ${res.text}`);
    return (res.body.items as { id: number; code: string }[]).find((i) => i.code === code)!.id;
  };
  const fees = {
    session: await add('bench_session', 'Bench session', 'each', 300, 500),
    diagnosis: await add('diagnosis', 'Diagnosis', 'each', 500, 800),
    labour: await add('labour', 'Labour', 'hour', 1200, 1800),
  };
  return {
    t,
    fake,
    member,
    otherMember,
    tech,
    treasurer,
    fees,
    async close() {
      await fake.close();
      await t.close();
    },
  };
}

/** A ticket of `owner` (handed in by them), its tag. */
export async function openTicket(owner: TestClient, makeModel = 'Fixture HF transceiver'): Promise<string> {
  const res = await owner.post('/api/tickets', {
    equipmentKind: 'transceiver',
    makeModel,
    units: ['main body'],
    faultReported: 'Relay clicks, display stays dark.',
    accessories: [],
    reflashConsent: true,
    notifyByEmail: true,
  });
  if (res.status !== 201) throw new Error(`ticket: ${res.status} ${res.text}`);
  return res.body.tag as string;
}

export async function addCharge(client: TestClient, tag: string, body: object) {
  const res = await client.post(`/api/tickets/${tag}/ledger/charges`, body);
  if (res.status !== 201) throw new Error(`charge on ${tag}: ${res.status} ${res.text}`);
  return res.body;
}

/** Pays a checkout session at the fake with a test card (as the hosted page does). */
export async function payAtFake(fake: RunningFake, checkoutUrl: string, card = '4242424242424242') {
  const sessionId = checkoutUrl.split('/').pop()!;
  return supertest(fake.fake.app).post(`/_fake/checkout/${sessionId}/pay`).send({ card });
}

/** POSTs an event of the fake to the app's webhook route, freshly signed (as the fake does on each attempt). */
export function deliverTo(app: TestApp['app'], event: object, opts: { secret?: string; at?: number; mutate?: (body: string) => string } = {}) {
  const body = JSON.stringify(event, null, 2);
  const header = signatureHeader(body, opts.secret ?? DEV_STRIPE_WEBHOOK_SECRET, opts.at ?? Math.floor(Date.now() / 1000));
  return supertest(app)
    .post('/api/payments/webhook')
    .set('Content-Type', 'application/json')
    .set('Stripe-Signature', header)
    .send(opts.mutate ? opts.mutate(body) : body);
}

/** Events of the fake about one checkout session (by session id or its payment intent). */
export function eventsOf(fake: RunningFake, sessionId: string): object[] {
  const session = fake.fake.events.find((e) => (e as { data: { object: { id: string } } }).data.object.id === sessionId);
  const pi = (session as { data: { object: { payment_intent?: string } } } | undefined)?.data.object.payment_intent;
  return fake.fake.events.filter((e) => {
    const o = (e as { data: { object: { id: string } } }).data.object;
    return o.id === sessionId || (pi && o.id === pi);
  });
}
