// The first real flow, end to end: a member hands equipment in, a technician drags the card from
// Intake to Diagnosis, the move survives a reload, and the owner's e-mail reaches the mail catcher.
import { expect, test } from '@playwright/test';
import { DEMO, SCREENSHOTS, dragTo, signIn, waitForMail } from './support';

test('hand in equipment, move it on the Bench board, owner is e-mailed', async ({ browser }) => {
  // The intake is a six-step stepper now: more than the default minute on a busy 2-core machine.
  test.setTimeout(180_000);
  const memberPage = await (await browser.newContext()).newPage();
  await signIn(memberPage, DEMO.member);
  await memberPage.goto('/hand-in');
  await expect(memberPage.getByRole('heading', { name: /hand in equipment/i })).toBeVisible();

  const model = `Fenwick Heron 90 test ${Date.now().toString(36)}`;
  const next = (step: string) => memberPage.getByTestId(`next-${step}`).click();
  await next('owner'); // the owner: the member handing it in
  await memberPage.getByLabel('Kind of equipment').click();
  await memberPage.getByRole('option', { name: /transceiver/i }).click();
  await memberPage.getByLabel('Make and model').fill(model);
  await memberPage.getByLabel('Serial number').fill('QX-40417');
  await next('equipment');
  await memberPage.getByRole('checkbox', { name: 'Relay clicks, no display' }).check();
  await memberPage.getByLabel(/fault in the owner's words/i).fill('Relay clicks at power-on but the display stays dark.');
  await next('fault');
  await memberPage.getByRole('checkbox', { name: /control cable/i }).check();
  await next('handedIn');
  await memberPage.getByRole('checkbox', { name: /agrees to a reflash/i }).check();
  await memberPage.getByRole('radio', { name: 'By e-mail' }).check();
  await next('consent');
  await memberPage.screenshot({ path: `${SCREENSHOTS}/intake-form.png`, fullPage: true });
  await memberPage.getByRole('button', { name: /hand in and open a ticket/i }).click();

  const tagText = await memberPage.getByTestId('opened-tag').textContent();
  const tag = /RW-\d{4,}/.exec(tagText ?? '')?.[0];
  expect(tag, 'the confirmation shows the tag number').toBeTruthy();
  await waitForMail(DEMO.member.email, new RegExp(`${tag}`));

  const techPage = await (await browser.newContext()).newPage();
  await signIn(techPage, DEMO.technician);
  await techPage.goto('/board');
  const card = techPage.locator(`[data-lane="intake"] [data-tag="${tag}"]`);
  await expect(card).toBeVisible();
  await dragTo(techPage, card, techPage.locator('[data-lane="diagnosis"]'));
  await expect(techPage.locator(`[data-lane="diagnosis"] [data-tag="${tag}"]`)).toBeVisible();

  // The move reached the server: it survives a reload.
  await techPage.reload();
  await expect(techPage.locator(`[data-lane="diagnosis"] [data-tag="${tag}"]`)).toBeVisible();
  await expect(techPage.locator(`[data-lane="intake"] [data-tag="${tag}"]`)).toHaveCount(0);
  await techPage.screenshot({ path: `${SCREENSHOTS}/bench-board.png`, fullPage: true });

  const mail = await waitForMail(DEMO.member.email, new RegExp(`${tag}.*Diagnosis|Diagnosis.*${tag}`));
  expect(mail.subject).toContain(tag!);

  // The member's ticket page shows the move as its own timeline row: who moved it, from where, to where.
  await memberPage.goto(`/tickets/${tag}`);
  const rows = memberPage.locator('.timeline').getByRole('listitem');
  await expect(rows).toHaveCount(2);
  await expect(rows.nth(0)).toContainText(/Perrin Sallow\s+opened the ticket/);
  await expect(rows.nth(1)).toContainText(/Tobin Marsh\s+moved it\s+from Intake\s+to Diagnosis/);
});

test('a refused move puts the card back and says why', async ({ page }) => {
  await signIn(page, DEMO.technician);
  await page.goto('/board');
  const card = page.locator('[data-lane="intake"] [data-tag]').first();
  await expect(card).toBeVisible();
  const tag = await card.getAttribute('data-tag');
  // Intake → Return is not an allowed move.
  await dragTo(page, card, page.locator('[data-lane="return"]'));
  await expect(page.locator(`[data-lane="intake"] [data-tag="${tag}"]`)).toBeVisible();
  await expect(page.locator(`[data-lane="return"] [data-tag="${tag}"]`)).toHaveCount(0);
  await expect(page.locator('.mdc-snackbar__label')).toContainText('cannot go from Intake to Return');
});

test('a member cannot open the Bench board data', async ({ page }) => {
  await signIn(page, DEMO.member);
  const status = await page.evaluate(async () => (await fetch('/api/board')).status);
  expect(status).toBe(403);
});
