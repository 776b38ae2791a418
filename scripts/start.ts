// The start command (npm start): MariaDB, migrations, the demo club, maildev, the client build
// and the API, each reused when already running. Ctrl-C stops what this command started.
import path from 'node:path';
import { ensureDatabase, ensureLocalMariaDb } from '../db/local-mariadb';
import { ROOT, buildClientIfStale, mailInboxUrl, runTs, startApi, startMaildev, startPaymentsFake, type Service } from './services';
import { localSecret } from './local-secret';

const PORT = process.env.RW_PORT ?? '4300';
const SMTP_PORT = process.env.RW_SMTP_PORT ?? '1025';
const MAIL_WEB_PORT = process.env.RW_MAIL_WEB_PORT ?? '1080';
const DB_PORT = process.env.RW_DB_PORT ?? '3407';
const DB_NAME = process.env.RW_DB_NAME ?? 'rigwright';
// The local fake of the payment provider: the SDK's host and port (RW_STRIPE_*) point at it.
const PAY_PORT = process.env.RW_PAY_PORT ?? '4310';

const started: Service[] = [];
let stopping = false;
async function stopAll(code: number) {
  if (stopping) return;
  stopping = true;
  for (const service of started.reverse()) await service.stop().catch(() => {});
  process.exit(code);
}
process.on('SIGINT', () => void stopAll(0));
process.on('SIGTERM', () => void stopAll(0));

try {
  const db = await ensureLocalMariaDb({ dir: path.join(ROOT, '.local', 'mariadb'), port: Number(DB_PORT) });
  started.push({ name: 'mariadb', startedHere: db.startedHere, stop: db.stop });
  ensureDatabase(db, DB_NAME);

  const env = {
    RW_DB_PORT: DB_PORT,
    RW_DB_NAME: DB_NAME,
    RW_PORT: PORT,
    RW_PUBLIC_URL: process.env.RW_PUBLIC_URL ?? `http://127.0.0.1:${PORT}`,
    RW_SMTP_PORT: SMTP_PORT,
    // Not the repository's default: made once for this checkout, kept in .local/ (mode 0600).
    RW_JWT_SECRET: process.env.RW_JWT_SECRET ?? localSecret(path.join(ROOT, '.local', 'jwt-secret')),
    RW_STRIPE_HOST: process.env.RW_STRIPE_HOST ?? '127.0.0.1',
    RW_STRIPE_PORT: process.env.RW_STRIPE_PORT ?? PAY_PORT,
    RW_STRIPE_PROTOCOL: process.env.RW_STRIPE_PROTOCOL ?? 'http',
  };
  runTs('db/migrate.ts', ['up'], env);
  runTs('db/seed.ts', [], env);

  started.push(await startMaildev(Number(SMTP_PORT), Number(MAIL_WEB_PORT)));
  const inbox = await mailInboxUrl(Number(MAIL_WEB_PORT));
  // Only when the SDK points at this machine: with the real provider's host nothing is faked.
  if (env.RW_STRIPE_HOST === '127.0.0.1' && env.RW_STRIPE_PORT === PAY_PORT) {
    started.push(await startPaymentsFake(Number(PAY_PORT), `${env.RW_PUBLIC_URL.replace(/\/$/, '')}/api/payments/webhook`));
  }
  buildClientIfStale();
  const api = await startApi(env);
  started.push(api);
  if (!api.startedHere) console.log(`An API is already answering on port ${PORT}; reusing it.`);

  console.log(`
  Rigwright is running.
    Open:        http://127.0.0.1:${PORT}/
    Mail inbox:  ${inbox}   (open it in a browser: every e-mail the app sends lands here)
    Payments:    local test double of the payment provider on 127.0.0.1:${PAY_PORT}; test card 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined
    Demo sign-ins (Kestrel Fen Radio Society, invented):
      admin       admin@kestrelfen.example       bench-demo-admin
      technician  tech@kestrelfen.example        bench-demo-tech
      treasurer   treasurer@kestrelfen.example   bench-demo-treasurer
      member      member@kestrelfen.example      bench-demo-member
  Ctrl-C stops what this command started.
`);
  if (!started.some((s) => s.startedHere)) {
    console.log('Everything was already running; nothing for this command to keep alive.');
    process.exit(0);
  }
  setInterval(() => {}, 1 << 30);
} catch (err) {
  console.error(`\nStart failed: ${(err as Error).message}`);
  await stopAll(1);
}
