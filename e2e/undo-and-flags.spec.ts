// Moves, undo and board flags (issue 7) in the browser: a technician moves a card, undoes it from
// the snack bar (the card is back and the owner gets no mail about it), sends a ticket back to
// the lane it came from with a note, marks parts on order (a chip with words) and takes a
// ticket from the card's menu. Screenshots of each step are saved with the others.
import { expect, test, type Page } from '@playwright/test';
import { DEMO, MAIL_URL, SCREENSHOTS, signIn, waitForMail } from './support';

/** Hands a ticket in at the bench through the API, as the signed-in technician of `page`. */
async function handIn(page: Page, makeModel: string, ownerEmail: string, notifyByEmail: boolean): Promise<string> {
  const xsrf = (await page.context().cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  const res = await page.request.post('/api/tickets', {
    headers: { 'X-XSRF-TOKEN': xsrf },
    data: {
      equipmentKind: 'transceiver',
      makeModel,
      units: ['main body'],
      faultReported: 'No transmit on any band.',
      accessories: ['DC lead'],
      reflashConsent: true,
      notifyByEmail,
      owner: { name: 'Wenna Pollard', email: ownerEmail, callSign: 'Q6WP' },
    },
  });
  expect(res.status(), await res.text()).toBe(201);
  return (await res.json()).tag as string;
}

async function mailSubjects(address: string): Promise<string[]> {
  const res = await fetch(`${MAIL_URL}/api/email?to.address=${encodeURIComponent(address)}`);
  return ((await res.json()) as { subject: string }[]).map((m) => m.subject);
}

const card = (page: Page, lane: string, tag: string) => page.locator(`[data-lane="${lane}"] [data-tag="${tag}"]`);

async function menuItem(page: Page, tag: string, name: RegExp) {
  await page.locator(`[data-tag="${tag}"] .card-menu`).click();
  await page.getByRole('menuitem', { name }).click();
}

test('undo a move from the snack bar (no mail), send a ticket back with a note, parts on order, assign to me', async ({ page }) => {
  test.setTimeout(90_000);
  await page.setViewportSize({ width: 1400, height: 900 });
  await signIn(page, DEMO.technician);
  const run = Date.now().toString(36);
  const owner = `wenna.${run}@fenmail.example`;
  const tag = await handIn(page, `Saltmead Curlew ${run}`, owner, true);
  await waitForMail(owner, new RegExp(`Ticket ${tag} opened`));

  await page.goto('/board');
  await expect(page.locator('.live-status')).toContainText('Live');
  await expect(card(page, 'intake', tag)).toBeVisible();

  // Move it, then Undo from the snack bar: the card is back in Intake.
  await menuItem(page, tag, /^Move to Diagnosis$/);
  await expect(card(page, 'diagnosis', tag)).toBeVisible();
  const snack = page.locator('.mat-mdc-snack-bar-container');
  await expect(snack).toContainText(`${tag} moved to Diagnosis.`);
  await page.screenshot({ path: `${SCREENSHOTS}/board-undo-offered.png` });
  await snack.getByRole('button', { name: 'Undo' }).click();
  await expect(card(page, 'intake', tag)).toBeVisible();
  await expect(page.locator('.mat-mdc-snack-bar-container')).toContainText(`Move undone: ${tag} is back in Intake.`);

  // The owner hears nothing of it: past the grace period (10 s) and a few worker sweeps, still no move mail.
  await page.waitForTimeout(14_000);
  expect((await mailSubjects(owner)).filter((s) => s.includes('has moved to'))).toEqual([]);

  // Move it again (it stays), then send it back to Intake with a note.
  await menuItem(page, tag, /^Move to Diagnosis$/);
  await expect(card(page, 'diagnosis', tag)).toBeVisible();
  await menuItem(page, tag, /Send back to Intake/);
  const dialog = page.getByRole('dialog');
  await expect(dialog).toContainText('Say why it goes back to Intake in the note.');
  await dialog.getByLabel('Note for the timeline').fill('Serial number missing from the intake: check the label.');
  await page.screenshot({ path: `${SCREENSHOTS}/board-send-back-note.png` });
  await dialog.getByRole('button', { name: 'Send back to Intake' }).click();
  await expect(card(page, 'intake', tag)).toBeVisible();

  // Parts on order: a chip with words on the card.
  await menuItem(page, tag, /Mark parts on order/);
  await expect(card(page, 'intake', tag).locator('rw-flag-chip[data-flag="parts_on_order"]')).toHaveText(/Parts on order/);

  // Another ticket nobody has taken: assign it to me from its menu.
  const second = await handIn(page, `Saltmead Whimbrel ${run}`, `wenna2.${run}@fenmail.example`, false);
  await expect(card(page, 'intake', second)).toBeVisible();
  await menuItem(page, second, /Assign to me/);
  await expect(card(page, 'intake', second)).toContainText('Technician:');
  await expect(card(page, 'intake', second).locator('.card-tech')).not.toBeEmpty();
  await page.screenshot({ path: `${SCREENSHOTS}/board-flags-and-assignment.png` });

  // The ticket page tells the story: the undone move, the send-back with its note, the flag.
  await page.goto(`/tickets/${tag}`);
  const timeline = page.locator('.timeline');
  await expect(timeline).toContainText('undid the move, back to Intake');
  await expect(timeline).toContainText('Serial number missing from the intake');
  await expect(timeline).toContainText('marked parts on order');
  await expect(page.locator('rw-ticket-bench rw-flag-chip[data-flag="parts_on_order"]')).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/ticket-on-the-bench.png`, fullPage: true });
});
