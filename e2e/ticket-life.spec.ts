// One ticket's whole life on the bench (issue 7), by the right roles: a technician hands a radio in
// through the stepper with a condition photo; diagnoses it and writes a quote above the club's
// threshold; the owner approves from the e-mailed link (no account) and follows the status page at
// phone size; the technician repairs, records a passed test sheet, checks the returned items and
// closes the ticket; the owner's status page then says it is closed.
import { expect, test, type Page } from '@playwright/test';
import sharp from 'sharp';
import { DEMO, SCREENSHOTS, signIn, waitForMail } from './support';

const pathOf = (url: string) => new URL(url).pathname;
const shot = (page: Page, name: string) => page.screenshot({ path: `${SCREENSHOTS}/life-${name}.png`, fullPage: true });

test('a ticket from hand-in to hand-back, with the owner approving the quote by e-mail', async ({ browser }) => {
  // Six screens, two roles and three mail round trips: several minutes on a busy 2-core machine.
  test.setTimeout(420_000);
  const run = Date.now().toString(36);
  const ownerEmail = `hester.vane.${run}@fenmail.example`;
  const techContext = await browser.newContext({ viewport: { width: 1400, height: 900 } });
  const page = await techContext.newPage();
  await signIn(page, DEMO.technician);

  // Intake, through the stepper, for someone at the bench.
  await page.goto('/hand-in');
  const next = (step: string) => page.getByTestId(`next-${step}`).click();
  await page.getByRole('radio', { name: 'Someone at the bench' }).check();
  await page.getByLabel("Owner's name").fill('Hester Vane');
  await page.getByLabel('E-mail', { exact: true }).fill(ownerEmail);
  await next('owner');
  await page.getByLabel('Kind of equipment').click();
  await page.getByRole('option', { name: 'Transceiver' }).click();
  await page.getByLabel('Make and model').fill(`Fenwick Heron 90 life ${run}`);
  await page.getByLabel('Serial number').fill('FH90-07731');
  await next('equipment');
  await page.getByRole('checkbox', { name: 'No transmit' }).check();
  await page.getByLabel("The fault in the owner's words").fill('Shuts down when transmitting; receive is fine.');
  await next('fault');
  await page.getByRole('checkbox', { name: 'Power lead' }).check();
  await next('handedIn');
  await page.getByRole('radio', { name: 'By e-mail' }).check();
  await next('consent');
  await shot(page, '01-intake-check');
  await page.getByRole('button', { name: /hand in and open a ticket/i }).click();
  const tag = (await page.getByTestId('opened-tag').textContent())?.trim() ?? '';
  expect(tag).toMatch(/^RW-\d{4,}$/);
  const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: { r: 120, g: 64, b: 16 } } }).png().toBuffer();
  await page.getByTestId('photo-input').setInputFiles({ name: 'rear-panel.png', mimeType: 'image/png', buffer: photo });
  await expect(page.getByRole('img', { name: 'rear-panel.png' })).toBeVisible();
  await shot(page, '02-intake-tag-photo');
  const opened = await waitForMail(ownerEmail, new RegExp(`Ticket ${tag} opened`));
  expect(opened.text).toContain('Serial number: FH90-07731');

  // Diagnosis: the checks, the DC lead that explains the fault, and the decision.
  await page.goto(`/tickets/${tag}`);
  await page.getByRole('button', { name: 'Move to Diagnosis' }).click();
  const diagnosis = page.getByTestId('diagnosis-section');
  await expect(diagnosis).toBeVisible({ timeout: 30_000 });
  await diagnosis.getByTestId('check-cableOut').click();
  await diagnosis.getByTestId('check-poweredCableOut').click();
  await diagnosis.getByTestId('supply-at-radio').fill('11.2');
  await diagnosis.getByTestId('transmit-current').fill('20');
  await diagnosis.getByTestId('lead-length').fill('3');
  await diagnosis.getByTestId('lead-gauge').click();
  await page.getByRole('option', { name: 'AWG 18' }).click();
  await expect(diagnosis.getByTestId('lead-verdict')).toContainText('This lead explains a “low voltage” fault');
  await diagnosis.getByTestId('findings').fill('Thin DC lead drops over 2 V on transmit; the radio shuts down. Fit a proper lead.');
  await diagnosis.getByTestId('decision-repair').click();
  await diagnosis.getByTestId('save-diagnosis').click();
  await expect(diagnosis).toContainText(/Saved .* by Tobin Marsh/);

  // A quote above the threshold holds the ticket until the owner decides.
  const quote = page.getByTestId('quote-section');
  await quote.getByTestId('line-desc-0').fill('New DC lead, AWG 10, fused');
  await quote.getByTestId('line-qty-0').fill('1');
  await quote.getByTestId('line-price-0').fill('24.50');
  await quote.getByTestId('add-line').click();
  await quote.getByTestId('line-desc-1').fill('Labour (hours)');
  await quote.getByTestId('line-qty-1').fill('2');
  await quote.getByTestId('line-price-1').fill('18.00');
  await expect(quote.getByTestId('new-quote-total')).toHaveText('£60.50');
  await quote.getByTestId('save-quote').click();
  await expect(quote.getByTestId('latest-quote')).toContainText('Owner to approve');
  await shot(page, '03-diagnosis-quote');

  // The owner, on a phone, from the mail in the catcher: approves, then follows the status page.
  const quoteMail = await waitForMail(ownerEmail, new RegExp(`Quote for .*${tag}`));
  const approveUrl = /https?:\/\/\S+\/owner\/approve\/\S+/.exec(quoteMail.text ?? '')?.[0];
  const statusUrl = /https?:\/\/\S+\/owner\/status\/\S+/.exec(quoteMail.text ?? '')?.[0];
  expect(approveUrl && statusUrl, 'the quote mail carries both links').toBeTruthy();
  const ownerContext = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await owner.goto(pathOf(approveUrl!));
  await expect(owner.getByTestId('approval-total')).toHaveText('£60.50');
  await shot(owner, '04-owner-approval-phone');
  await owner.getByTestId('approve').click();
  await expect(owner.getByTestId('decision-done')).toContainText('Approved by the owner');
  await owner.goto(pathOf(statusUrl!));
  await expect(owner.getByRole('heading', { name: new RegExp(tag) })).toBeVisible();
  await expect(owner.getByTestId('owner-timeline')).toContainText('You approved the quote.');
  await expect(owner.getByTestId('owner-timeline')).not.toContainText('Thin DC lead');
  await shot(owner, '05-owner-status-phone');

  // Repair: the work log beside its cautions.
  await page.reload();
  await page.getByRole('button', { name: 'Move to Repair' }).click();
  const work = page.getByRole('form', { name: 'Log work done' });
  await expect(work).toBeVisible({ timeout: 30_000 });
  await work.getByLabel('What was done').fill('Fitted a fused AWG 10 DC lead; checked transmit at full power');
  await work.getByLabel('Time spent').fill('50');
  await work.getByRole('button', { name: 'Log work' }).click();
  await expect(page.getByRole('table', { name: 'Work done' })).toContainText('Fitted a fused AWG 10 DC lead');
  await shot(page, '06-repair-log');

  // Bench test: a sheet that passes (Pr 2 W of 100 W: SWR 1.33:1, worked by hand).
  await page.getByRole('button', { name: 'Move to Bench test' }).click();
  const sheetForm = page.getByRole('form', { name: 'New test sheet' });
  await sheetForm.getByLabel('Supply at the radio').fill('13.8');
  await sheetForm.getByLabel('Receive current').fill('1.2');
  await sheetForm.getByLabel('Rated').fill('100');
  await sheetForm.getByLabel('Forward').fill('100');
  await sheetForm.getByLabel('Reflected').fill('2');
  await sheetForm.getByLabel('Dialled').fill('14.2');
  await sheetForm.getByLabel('Counter reads').fill('14.200008');
  await expect(sheetForm.getByText('this sheet will pass')).toBeVisible();
  await sheetForm.getByRole('button', { name: 'Save test sheet' }).click();
  await expect(page.getByRole('status').filter({ hasText: /Test sheet 1 passed\./ })).toBeVisible();
  await shot(page, '07-test-sheet');

  // Return: the returned items match what was handed in; then Closed (nothing is owed).
  await page.getByRole('button', { name: 'Move to Return' }).click();
  const checklist = page.getByRole('form', { name: 'Returned items' });
  await expect(checklist.getByRole('checkbox', { name: 'Power lead' })).toBeChecked();
  await checklist.getByLabel('Collected by').fill('Hester Vane');
  await checklist.getByRole('button', { name: 'Save the hand-back' }).click();
  await expect(page.getByText(/Handed back to Hester Vane/).first()).toBeVisible();
  await shot(page, '08-hand-back');
  await page.getByRole('button', { name: 'Move to Closed' }).click();
  await expect(page.locator('rw-state-chip').first()).toContainText('Closed', { timeout: 30_000 });
  await shot(page, '09-closed');

  // Closed tickets leave the board and stay searchable.
  const list = await (await page.request.get(`/api/tickets?q=${encodeURIComponent(tag)}`)).json();
  expect(JSON.stringify(list)).toContain(tag);

  // The owner's status page says so.
  await owner.reload();
  await expect(owner.locator('rw-state-chip').first()).toContainText('Closed');
  await shot(owner, '10-owner-status-closed');
  await ownerContext.close();
  await techContext.close();
});
