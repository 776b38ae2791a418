// Runs the local fake of the payment provider on its own port (the start and test commands start
// it). Settings from the environment:
//   RW_PAY_PORT (4310), RW_PAY_HOST (127.0.0.1), RW_PAY_WEBHOOK_URL (the app's webhook route),
//   RW_STRIPE_WEBHOOK_SECRET (shared with the app), RW_PAY_RETRY_BASE_MS (1000).
// Once a day (at the first check after midnight UTC) it pays out the available balance, as the
// provider's automatic daily payouts do; POST /_fake/payouts does it at once.
import { createPaymentsFake } from './fake';
import { DEV_STRIPE_WEBHOOK_SECRET } from '../api/src/config';

const port = Number(process.env.RW_PAY_PORT ?? 4310);
const host = process.env.RW_PAY_HOST ?? '127.0.0.1';
const fake = createPaymentsFake({
  publicUrl: `http://${host}:${port}`,
  webhookUrl: process.env.RW_PAY_WEBHOOK_URL || undefined,
  webhookSecret: process.env.RW_STRIPE_WEBHOOK_SECRET ?? DEV_STRIPE_WEBHOOK_SECRET,
  retryBaseMs: Number(process.env.RW_PAY_RETRY_BASE_MS ?? 1000),
});

const server = fake.app.listen(port, host, () => {
  console.log(`Payments fake listening on http://${host}:${port} (webhooks to ${process.env.RW_PAY_WEBHOOK_URL || 'nowhere'})`);
});
server.on('error', (err) => {
  console.error(`Payments fake cannot listen on ${host}:${port}: ${err.message}`);
  process.exit(1);
});

let lastPayoutDay = new Date().toISOString().slice(0, 10);
const timer = setInterval(() => {
  const today = new Date().toISOString().slice(0, 10);
  if (today !== lastPayoutDay) {
    lastPayoutDay = today;
    fake.runPayouts();
  }
}, 60_000);

for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    clearInterval(timer);
    server.close();
    server.closeAllConnections();
    process.exit(0);
  });
}
