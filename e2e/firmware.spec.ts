// Firmware library and flash attempts, end to end: a technician uploads an image (progress bar,
// then its checksums), opens a ticket in Reflash, sees the transfer plan, records a failed and then
// a verified attempt with a serial log, and moves the ticket on to Bench test.
import { createHash, randomBytes } from 'node:crypto';
import { expect, test } from '@playwright/test';
import { DEMO, SCREENSHOTS, signIn } from './support';

test('upload an image, record a failed then a verified flash attempt, move the ticket to Bench test', async ({ page, context }) => {
  await signIn(page, DEMO.technician);
  const model = `Fenwick Heron 90 e2e ${Date.now().toString(36)}`;

  // A ticket of that model in the Reflash lane, made through the API as the bench would.
  const xsrf = async () => (await context.cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  const opened = await page.request.post('/api/tickets', {
    headers: { 'X-XSRF-TOKEN': await xsrf() },
    data: {
      equipmentKind: 'transceiver', makeModel: model, units: ['main body'], faultReported: 'Dark display after a power cut.',
      accessories: [], reflashConsent: true, notifyByEmail: false, owner: { name: 'Ebba Strand', email: 'ebba.strand@fenmail.example' },
    },
  });
  expect(opened.status()).toBe(201);
  let ticket = await opened.json();
  for (const to of ['diagnosis', 'reflash']) {
    const moved = await page.request.post(`/api/tickets/${ticket.tag}/moves`, { headers: { 'X-XSRF-TOKEN': await xsrf() }, data: { to, version: ticket.version } });
    expect(moved.status()).toBe(200);
    ticket = await moved.json();
  }

  // Upload: the progress bar shows while the bytes go up (the answer is held back a moment so it can be seen).
  const bytes = randomBytes(300 * 1024);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  await page.route('**/api/firmware', async (route) => {
    if (route.request().method() !== 'POST') return route.continue();
    await new Promise((r) => setTimeout(r, 1200));
    await route.continue();
  });
  await page.goto('/firmware');
  await expect(page.getByRole('heading', { name: 'Firmware library' })).toBeVisible();
  await page.getByText('Upload an image').click();
  const form = page.getByRole('region', { name: 'Upload an image' });
  await page.locator('#firmware-file').setInputFiles({ name: 'heron90-main-3.02.bin', mimeType: 'application/octet-stream', buffer: bytes });
  await form.getByLabel('Equipment model').fill(model);
  await form.getByRole('combobox', { name: 'Unit' }).click();
  await page.getByRole('option', { name: 'Main board' }).click();
  await form.getByLabel('Version').fill('3.02');
  await form.getByLabel('Where the file came from').fill('Invented for the browser test');
  await form.getByRole('button', { name: /upload to the library/i }).click();
  await expect(page.getByRole('progressbar', { name: 'Upload progress' })).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/firmware-upload-progress.png`, fullPage: true });
  await expect(page.getByTestId('sha256')).toHaveText(sha256);
  await expect(page.getByTestId('upload-result')).toContainText('CRC-16/XMODEM');
  await page.screenshot({ path: `${SCREENSHOTS}/firmware-uploaded.png`, fullPage: true });
  await page.unroute('**/api/firmware');

  // The ticket in Reflash: cautions, the image that fits, and the transfer plan.
  await page.goto(`/tickets/${ticket.tag}`);
  await expect(page.getByText('Before you flash')).toBeVisible();
  await expect(page.getByTestId('image-3.02')).toBeVisible();
  // 307,200 bytes: 2400 blocks of 128; 2400 × 133 + 1 = 319,201 bytes on the wire; × 10 / 115200 = 27.7 s → "at least 28 s".
  await expect(page.getByTestId('transfer-plan')).toContainText('at least 28 s');
  await expect(page.getByRole('button', { name: 'Move to Bench test' })).toBeDisabled();

  await page.getByLabel('Port').fill('/dev/ttyUSB0');
  await page.getByRole('radio', { name: 'Transfer failed', exact: true }).check();
  await page.getByLabel('Failed at block').fill('1201');
  await expect(page.getByText('of 2400: 50 % of the image sent')).toBeVisible();
  await page.getByRole('textbox', { name: 'Notes', exact: true }).fill('Supply dipped when the fan started.');
  await page.locator('#serial-log-file').setInputFiles({ name: 'minicom.txt', mimeType: 'text/plain', buffer: Buffer.from('Erase OK\nC\nBlock 1201 NAK\nTimeout, transfer aborted\n') });
  await page.getByRole('button', { name: 'Record attempt 1' }).click();
  await expect(page.getByText('Attempt 1 recorded: Transfer failed.')).toBeVisible();
  await expect(page.locator('[data-attempt="1"]')).toContainText('at block 1201 of 2400 (50 % sent)');

  await page.getByRole('radio', { name: 'Verified running', exact: true }).check();
  await page.locator('#serial-log-file').setInputFiles({ name: 'minicom-2.txt', mimeType: 'text/plain', buffer: Buffer.from('Erase OK\nC\nTransfer complete\nBooting 3.02\n') });
  await page.getByRole('button', { name: 'Record attempt 2' }).click();
  await expect(page.getByText('Attempt 2 recorded: Verified running.')).toBeVisible();
  await expect(page.getByText('Firmware now:')).toBeVisible();

  // The log is searchable on the ticket.
  await page.getByLabel('Search notes and serial logs').fill('NAK');
  await expect(page.locator('[data-attempt]')).toHaveCount(1);
  await expect(page.locator('[data-attempt="1"] .matches')).toContainText('Block 1201 NAK');
  await expect(page.getByRole('button', { name: 'Record attempt 3' })).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/flash-attempts.png`, fullPage: true });

  // The verified attempt releases the guard.
  const move = page.getByRole('button', { name: 'Move to Bench test' });
  await expect(move).toBeEnabled();
  await move.click();
  await expect(page.locator('.mdc-snackbar__label')).toContainText('moved to Bench test');
});

test('a member cannot reach the Firmware library', async ({ page }) => {
  await signIn(page, DEMO.member);
  await expect(page.getByRole('link', { name: 'Firmware library' })).toHaveCount(0);
  const status = await page.evaluate(async () => (await fetch('/api/firmware')).status);
  expect(status).toBe(403);
});
