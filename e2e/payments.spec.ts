// Paying a ticket's balance, end to end: a member hands in equipment, the bench adds a charge, the
// member pays the balance on the local payment fake's test checkout page with the published test
// card, comes back to the ticket and sees it paid (the fake's signed webhook reached the API); the
// payout runs; the treasurer sees the payment matched in the month and downloads the CSV.
import { readFileSync } from 'node:fs';
import { expect, request, test, type APIRequestContext } from '@playwright/test';
import { DEMO, SCREENSHOTS, signIn } from './support';

const PAY_URL = process.env.RW_E2E_PAY_URL ?? 'http://127.0.0.1:4311';
const TREASURER = { email: 'treasurer@kestrelfen.example', password: 'bench-demo-treasurer' };

/** An API client signed in as `who`, sending the anti-forgery header on every change. */
async function apiAs(baseURL: string, who: { email: string; password: string }) {
  const api: APIRequestContext = await request.newContext({ baseURL });
  const token = async () => (await api.storageState()).cookies.find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  await api.get('/api/auth/session');
  const signedIn = await api.post('/api/auth/sign-in', { headers: { 'X-XSRF-TOKEN': await token() }, data: who });
  expect(signedIn.status()).toBe(200);
  return { api, post: async (url: string, data: object) => api.post(url, { headers: { 'X-XSRF-TOKEN': await token() }, data }) };
}

test('a member pays a ticket\'s balance on the test checkout page; the treasurer sees it matched and exports the month', async ({ page, browser, baseURL }) => {
  // The member's ticket, and a diagnosis charge added by the bench.
  const member = await apiAs(baseURL!, DEMO.member);
  const opened = await member.post('/api/tickets', {
    equipmentKind: 'transceiver', makeModel: `Fenwick Snipe 7 e2e ${Date.now().toString(36)}`, units: ['main body'],
    faultReported: 'No receive on 2 m after a lightning storm.', accessories: ['DC lead'], reflashConsent: false, notifyByEmail: true,
  });
  expect(opened.status()).toBe(201);
  const { tag } = await opened.json();
  const tech = await apiAs(baseURL!, DEMO.technician);
  const fees = await (await tech.api.get('/api/fees')).json();
  const diagnosis = fees.items.find((i: { code: string }) => i.code === 'diagnosis');
  const charged = await tech.post(`/api/tickets/${tag}/ledger/charges`, { feeItemId: diagnosis.id, quantity: 1 });
  expect(charged.status()).toBe(201);
  const due = (await charged.json()).balance as number;
  expect(due).toBe(diagnosis.current.memberPrice); // the member rate of the seeded schedule (500 pence)

  // The member pays on the provider's (fake) hosted page with the published success card.
  await signIn(page, DEMO.member);
  await page.goto(`/tickets/${tag}`);
  await expect(page.getByTestId('balance')).toContainText('Balance due: £5.00');
  await page.screenshot({ path: `${SCREENSHOTS}/payments-balance-due.png`, fullPage: true });
  await page.getByRole('button', { name: 'Pay £5.00 online' }).click();
  await expect(page).toHaveURL(new RegExp(`^${PAY_URL}/checkout/cs_test_`));
  await expect(page.getByTestId('amount')).toHaveText('£5.00');
  await page.getByLabel('Card number').fill('4242 4242 4242 4242');
  await page.screenshot({ path: `${SCREENSHOTS}/payments-test-checkout.png`, fullPage: true });
  await page.getByRole('button', { name: 'Pay £5.00' }).click();

  // Back on the ticket: paid once the signed webhook has arrived.
  await expect(page).toHaveURL(new RegExp(`/tickets/${tag}\\?payment=done`));
  await expect(page.getByTestId('balance')).toContainText('Paid: nothing is owed', { timeout: 30_000 });
  await expect(page.getByTestId('payment')).toHaveCount(1);
  await expect(page.getByTestId('payment')).toContainText('£5.00 Card');
  await expect(page.getByRole('link', { name: 'Receipt (PDF)' })).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/payments-paid.png`, fullPage: true });

  // The provider's daily payout (run now), then the treasurer's month.
  const payouts = await fetch(`${PAY_URL}/_fake/payouts`, { method: 'POST' });
  expect(payouts.status).toBe(200);
  const context = await browser.newContext();
  const desk = await context.newPage();
  await signIn(desk, TREASURER);
  await desk.goto('/treasurer/month');
  await expect(desk.getByRole('heading', { name: 'Reconciliation' })).toBeVisible();
  const row = desk.getByTestId('payments').getByRole('row').filter({ hasText: tag });
  await expect(row).toContainText('Matched');
  await expect(row).toContainText('£5.00');
  await expect(row).toContainText('po_test_');
  await desk.screenshot({ path: `${SCREENSHOTS}/payments-reconciliation.png`, fullPage: true });

  const [download] = await Promise.all([desk.waitForEvent('download'), desk.getByTestId('csv').click()]);
  expect(download.suggestedFilename()).toMatch(/^rigwright-\d{4}-\d{2}\.csv$/);
  const csv = readFileSync((await download.path())!, 'utf8');
  const line = csv.split('\r\n').find((l) => l.startsWith('payment,') && l.includes(tag));
  expect(line, csv).toBeTruthy();
  expect(line).toContain(',card,');
  expect(line).toContain(',5.00,0.28,4.72,'); // 500 × 1.5% = 7.5 → 8, + 20 = 28 pence fee (the fake's published-style rate)
  expect(line).toMatch(/,yes,/);
  await context.close();
  await member.api.dispose();
  await tech.api.dispose();
});
