// Repair, bench test and hand-back, end to end: a technician logs repair work and a part, records a
// failed test sheet (the ticket goes back to Repair), then a passed one (the owner gets the report
// by e-mail), moves the ticket to Return and fills the returned-items checklist. Closing is
// refused while a bench fee is due, and allowed once the treasurer records its payment.
import { expect, test } from '@playwright/test';
import { DEMO, MAIL_URL, SCREENSHOTS, signIn, waitForMail } from './support';

const TREASURER = { email: 'treasurer@kestrelfen.example', password: 'bench-demo-treasurer' };

test('repair log, a failed then a passed test sheet, return and hand-back; Close waits for fees', async ({ page, context, browser }) => {
  test.setTimeout(120_000);
  await signIn(page, DEMO.technician);
  const stamp = Date.now().toString(36);
  const ownerEmail = `ebba.strand.${stamp}@fenmail.example`;

  // A ticket in Repair, made through the API as the bench would.
  const xsrf = async () => (await context.cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  const opened = await page.request.post('/api/tickets', {
    headers: { 'X-XSRF-TOKEN': await xsrf() },
    data: {
      equipmentKind: 'transceiver', makeModel: `Fenwick Heron 100 e2e ${stamp}`, units: ['main body'], faultReported: 'No transmit output after a storm.',
      accessories: ['control cable', 'DC lead'], reflashConsent: false, notifyByEmail: true, owner: { name: 'Ebba Strand', email: ownerEmail },
    },
  });
  expect(opened.status()).toBe(201);
  let ticket = await opened.json();
  for (const to of ['diagnosis', 'repair']) {
    const moved = await page.request.post(`/api/tickets/${ticket.tag}/moves`, { headers: { 'X-XSRF-TOKEN': await xsrf() }, data: { to, version: ticket.version } });
    expect(moved.status()).toBe(200);
    ticket = await moved.json();
  }

  // Repair log: cautions beside the form, one piece of work and one part.
  await page.goto(`/tickets/${ticket.tag}`);
  await expect(page.getByText('Open equipment on the bench')).toBeVisible();
  await expect(page.getByText(/beryllium oxide/)).toBeVisible();
  const work = page.getByRole('form', { name: 'Log work done' });
  await work.getByLabel('What was done').fill('Replaced the driver transistor and checked the bias');
  await work.getByLabel('Time spent').fill('45');
  await work.getByRole('button', { name: 'Log work' }).click();
  await expect(page.getByRole('table', { name: 'Work done' })).toContainText('Replaced the driver transistor');
  const part = page.getByRole('form', { name: 'Record a part used' });
  await part.getByLabel('Part').fill('RF driver transistor');
  await part.getByLabel('Cost per item').fill('24.50');
  await part.getByRole('button', { name: 'Record part' }).click();
  await expect(page.getByRole('table', { name: 'Parts used' })).toContainText('24.50');
  await expect(page.getByText(/1 part at cost 24\.50/)).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/repair-log.png`, fullPage: true });

  // To Bench test, and a sheet that fails on SWR: worked by hand, Pr 9 W of 100 W → Γ 0.3, SWR 1.86:1 > 1.5:1.
  await page.getByRole('button', { name: 'Move to Bench test' }).click();
  await expect(page.getByText('RF power on the bench')).toBeVisible();
  const sheetForm = page.getByRole('form', { name: 'New test sheet' });
  async function fillSheet(reflected: string) {
    await sheetForm.getByLabel('Supply at the radio').fill('13.8');
    await sheetForm.getByLabel('Receive current').fill('1.4');
    await sheetForm.getByLabel('Rated').fill('100');
    await sheetForm.getByLabel('Forward').fill('100');
    await sheetForm.getByLabel('Reflected').fill(reflected);
    await sheetForm.getByLabel('Dialled').fill('14.2');
    await sheetForm.getByLabel('Counter reads').fill('14.200008');
  }
  await fillSheet('9');
  await expect(sheetForm.getByText('This sheet will fail')).toBeVisible();
  await expect(sheetForm.getByText('20 m: SWR: 1.86:1')).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/test-sheet-failing.png`, fullPage: true });
  await sheetForm.getByRole('button', { name: 'Save test sheet' }).click();
  await expect(page.getByText(/Test sheet 1 failed; the ticket went back to Repair/).first()).toBeVisible();
  await expect(page.locator('rw-state-chip').first()).toContainText('Repair');

  // Back to Bench test; Pr 2 W of 100 W → Γ 0.141, SWR 1.33:1: passes.
  await page.getByRole('button', { name: 'Move to Bench test' }).click();
  await fillSheet('2');
  await expect(sheetForm.getByText('this sheet will pass')).toBeVisible();
  await sheetForm.getByRole('button', { name: 'Save test sheet' }).click();
  await expect(page.getByRole('status').filter({ hasText: /Test sheet 2 passed\./ })).toBeVisible();
  await expect(page.getByRole('region', { name: 'Test sheet 2' })).toContainText('Passed');
  await expect(page.getByRole('region', { name: 'Test sheet 1' })).toContainText('Failed');
  await page.screenshot({ path: `${SCREENSHOTS}/test-sheet-passed.png`, fullPage: true });

  // The owner gets the report by e-mail, as a PDF.
  const mail = (await waitForMail(ownerEmail, /Bench test passed/)) as { attachments?: { contentType: string; fileName?: string; generatedFileName?: string }[] };
  expect(mail.attachments?.some((a) => a.contentType === 'application/pdf')).toBe(true);
  expect(MAIL_URL).toBeTruthy();

  // Return, and the returned-items checklist: the DC lead stays with the club's spares box, explained.
  await page.getByRole('button', { name: 'Move to Return' }).click();
  const checklist = page.getByRole('form', { name: 'Returned items' });
  await expect(checklist.getByRole('checkbox', { name: 'control cable' })).toBeChecked();
  await checklist.getByRole('checkbox', { name: 'DC lead' }).uncheck();
  await checklist.getByRole('button', { name: 'Save the hand-back' }).click();
  await expect(checklist.getByText('Say why DC lead does not go back.')).toBeVisible();
  await checklist.getByLabel('Why it does not go back').fill('Owner collected the DC lead earlier in the week.');
  await checklist.getByLabel('Collected by').fill('Ebba Strand');
  await checklist.getByRole('button', { name: 'Save the hand-back' }).click();
  await expect(page.getByText(/Handed back to Ebba Strand/).first()).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/hand-back.png`, fullPage: true });

  // A bench fee is due: Close is refused for fees (the checklist is done), on the page and on the server.
  const fees = await (await page.request.get('/api/fees')).json();
  const diagnosisFee = fees.items.find((i: { code: string }) => i.code === 'diagnosis');
  const charged = await page.request.post(`/api/tickets/${ticket.tag}/ledger/charges`, {
    headers: { 'X-XSRF-TOKEN': await xsrf() },
    data: { feeItemId: diagnosisFee.id, quantity: 1 },
  });
  expect(charged.status()).toBe(201);
  const due = (await charged.json()).balance as number;
  await page.reload();
  await expect(page.getByText(/Fees are not settled yet/).first()).toBeVisible();
  await expect(page.getByRole('button', { name: 'Move to Closed' })).toBeDisabled();
  const current = await (await page.request.get(`/api/tickets/${ticket.tag}`)).json();
  const close = await page.request.post(`/api/tickets/${ticket.tag}/moves`, { headers: { 'X-XSRF-TOKEN': await xsrf() }, data: { to: 'closed', version: current.version } });
  expect(close.status()).toBe(422);
  expect((await close.json()).error.message).toMatch(/Fees are not settled/);

  // The treasurer records the cash the owner paid at the bench; the balance is zero and the ticket closes.
  const treasurer = await browser.newContext();
  const till = await treasurer.newPage();
  await signIn(till, TREASURER);
  const tillXsrf = (await treasurer.cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  const paid = await till.request.post(`/api/tickets/${ticket.tag}/ledger/payments`, {
    headers: { 'X-XSRF-TOKEN': tillXsrf },
    data: { method: 'cash', amount: due, reference: `Cash book ${stamp}` },
  });
  expect(paid.status()).toBe(201);
  await treasurer.close();
  await page.reload();
  await page.getByRole('button', { name: 'Move to Closed' }).click();
  await expect(page.locator('rw-state-chip').first()).toContainText('Closed', { timeout: 30_000 });
});

test('an admin edits a test limit with its source', async ({ page }) => {
  test.setTimeout(120_000);
  await signIn(page, DEMO.admin);
  await page.goto('/admin/test-limits');
  await expect(page.getByRole('heading', { name: 'Test limits' })).toBeVisible();
  const swr = page.locator('mat-card').filter({ hasText: 'Highest SWR into the dummy load' });
  await expect(swr.getByLabel('Source')).toHaveValue(/Common practice: SWR at most 1\.5:1/);
  await page.screenshot({ path: `${SCREENSHOTS}/test-limits.png`, fullPage: true });
  // The same figure, now with the club's own source (the verdicts of other tests do not change).
  await swr.getByLabel('Source').fill('Club rule: SWR at most 1.5:1 into the bench dummy load (committee, 2026)');
  const save = page.getByRole('button', { name: 'Save the limits' });
  await save.scrollIntoViewIfNeeded();
  await save.click();
  await expect(swr.getByText('Set by the club.')).toBeVisible();
  await expect(swr.getByLabel('Source')).toHaveValue(/Club rule/);
});
