// Intake, complete (issue 7): a technician hands in a radio for someone at the bench through the
// stepper, adds a condition photo (a PNG made here) with its progress bar, sees the tag number, and
// the "Print intake tag" link answers a PDF. The owner's intake e-mail lists serial and accessories.
import { expect, test } from '@playwright/test';
import sharp from 'sharp';
import { DEMO, SCREENSHOTS, signIn, waitForMail } from './support';

test('a technician hands in a radio for a walk-in owner, with a photo, and prints the intake tag', async ({ page }) => {
  // Six steps, an upload, a PDF and a mail: more than the default minute on a busy 2-core machine.
  test.setTimeout(180_000);
  const run = Date.now().toString(36);
  const ownerEmail = `walk-in-${run}@fenmail.example`;
  await signIn(page, DEMO.technician);
  await page.goto('/hand-in');
  await expect(page.getByRole('heading', { name: /hand in equipment/i })).toBeVisible();
  const next = (step: string) => page.getByTestId(`next-${step}`).click();

  // Owner: someone at the bench, with a name and at least one of e-mail or phone.
  await page.getByRole('radio', { name: 'Someone at the bench' }).check();
  await page.getByLabel("Owner's name").fill('Edmund Rushby');
  await next('owner');
  await expect(page.getByText('Give an e-mail address or a phone number, so the bench can reach the owner.')).toBeVisible();
  await page.getByLabel('E-mail', { exact: true }).fill(ownerEmail);
  await page.getByLabel('Phone', { exact: true }).fill('01632 960417');
  await page.getByLabel('Call sign, if any').fill('Q4ERB');
  await next('owner');

  // Equipment.
  await page.getByLabel('Kind of equipment').click();
  await page.getByRole('option', { name: 'Transceiver' }).click();
  await page.getByLabel('Make and model').fill(`Fenwick Heron 100 (${run})`);
  await page.getByLabel('Serial number').fill('FH100-20931');
  await page.getByLabel('Firmware versions, if known').fill('main 1.04, display 2.11');
  await next('equipment');

  // Fault: symptoms to tick and the owner's words.
  await page.getByRole('checkbox', { name: 'Relay clicks, no display' }).check();
  await page.getByLabel("The fault in the owner's words").fill('Relay clicks at power-on; the display stays dark since a power cut.');
  await next('fault');

  // Accessories handed in.
  await page.getByRole('checkbox', { name: 'Power lead' }).check();
  await page.getByRole('checkbox', { name: 'Microphone' }).check();
  await page.getByLabel('Anything else, and its condition').fill('Mic cord taped near the plug.');
  await next('handedIn');

  // Reflash consent beside its caution, and how the owner wants updates.
  await expect(page.getByRole('note', { name: /a reflash can erase/i })).toBeVisible();
  await page.getByRole('checkbox', { name: /agrees to a reflash/i }).check();
  await page.getByRole('radio', { name: 'By e-mail' }).check();
  await next('consent');

  await expect(page.getByText('Edmund Rushby · ' + ownerEmail + ' · 01632 960417')).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/intake-check.png`, fullPage: true });
  await page.getByRole('button', { name: /hand in and open a ticket/i }).click();

  const tag = (await page.getByTestId('opened-tag').textContent())?.trim() ?? '';
  expect(tag).toMatch(/^RW-\d{4,}$/);

  // A condition photo, made here, through the upload with its progress bar.
  const photo = await sharp({ create: { width: 800, height: 600, channels: 3, background: { r: 16, g: 112, b: 120 } } }).png().toBuffer();
  await page.getByTestId('photo-input').setInputFiles({ name: 'front-panel.png', mimeType: 'image/png', buffer: photo });
  await expect(page.getByRole('img', { name: 'front-panel.png' })).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/intake-tag-and-photos.png`, fullPage: true });

  // The intake tag link answers a PDF for this technician's session.
  const link = page.getByTestId('intake-tag-link');
  await expect(link).toHaveAttribute('href', `/api/tickets/${tag}/intake-tag.pdf`);
  const pdf = await page.request.get(`/api/tickets/${tag}/intake-tag.pdf`);
  expect(pdf.status()).toBe(200);
  expect(pdf.headers()['content-type']).toMatch(/^application\/pdf/);
  expect((await pdf.body()).subarray(0, 5).toString('latin1')).toBe('%PDF-');

  // The owner's intake e-mail lists the equipment, serial and accessories.
  const mail = await waitForMail(ownerEmail, new RegExp(`Ticket ${tag} opened`));
  expect(mail.text).toContain('Serial number: FH100-20931');
  expect(mail.text).toContain('Accessories handed in: Power lead, Microphone');

  // The ticket page shows the intake section, its photo and the print link.
  await page.goto(`/tickets/${tag}`);
  await expect(page.getByText('Relay clicks, no display', { exact: true })).toBeVisible({ timeout: 30_000 });
  await expect(page.getByRole('img', { name: 'front-panel.png' })).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/ticket-intake-section.png`, fullPage: true });

  // Take it on to Diagnosis, so the Intake lane stays as short as the other browser tests expect.
  await page.getByRole('button', { name: 'Move to Diagnosis' }).click();
  await expect(page.locator('.timeline')).toContainText(/moved it\s+from Intake\s+to Diagnosis/, { timeout: 30_000 });
});
