// The Flasher end to end on the practice unit: a technician opens a ticket in Reflash, starts the
// Flasher from it, stops the simulated unit in its loader, sends the image with a power dip at
// block 4 (recorded as failed at that block), flashes again (recorded as completed), marks it
// verified running after a restart, and moves the ticket on to Bench test.
import { randomBytes } from 'node:crypto';
import { expect, test, type Page } from '@playwright/test';
import { DEMO, SCREENSHOTS, signIn } from './support';

/** Powers the practice unit on and presses the loader key inside its 2 s boot window (tries again after a power-cycle if the key came late). */
async function stopInLoader(page: Page, terminal: ReturnType<Page['getByTestId']>, powerOn: () => Promise<void>) {
  for (let attempt = 0; attempt < 3; attempt++) {
    await powerOn();
    await expect(terminal).toContainText('Press any key within 2 s');
    await page.getByRole('button', { name: 'Stop in loader (space)' }).click();
    try {
      await expect(terminal).toContainText('Stopped in the loader', { timeout: 3000 });
      return;
    } catch {
      // the machine was slow and the unit booted on: power-cycle and try again
    }
  }
  throw new Error('The practice unit never stopped in its loader.');
}

async function eraseAndReceive(page: Page, terminal: ReturnType<Page['getByTestId']>) {
  await page.getByRole('button', { name: 'Erase (E)' }).click();
  await expect(terminal).toContainText('Erasing the application area... done.');
  await page.getByRole('button', { name: 'Receive (R)' }).click();
  await expect(terminal).toContainText('Ready to receive the image by XMODEM');
}

test('flash the practice unit: a power dip fails at its block, the second run completes, verified running, on to Bench test', async ({ page, context }) => {
  test.setTimeout(120_000); // about 10 s of protocol time; the rest is a loaded test machine
  await signIn(page, DEMO.technician);
  const model = `Fenwick Kestrel 7 e2e ${Date.now().toString(36)}`;
  const xsrf = async () => (await context.cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';

  // A ticket with reflash consent in the Reflash lane, and an 8 KiB image for its display head.
  const opened = await page.request.post('/api/tickets', {
    headers: { 'X-XSRF-TOKEN': await xsrf() },
    data: {
      equipmentKind: 'transceiver', makeModel: model, units: ['display head'], faultReported: 'Display stays dark; relay clicks at power-on.',
      accessories: [], reflashConsent: true, notifyByEmail: false, owner: { name: 'Ivo Lindqvist', email: 'ivo.lindqvist@fenmail.example' },
    },
  });
  expect(opened.status()).toBe(201);
  let ticket = await opened.json();
  for (const to of ['diagnosis', 'reflash']) {
    const moved = await page.request.post(`/api/tickets/${ticket.tag}/moves`, { headers: { 'X-XSRF-TOKEN': await xsrf() }, data: { to, version: ticket.version } });
    expect(moved.status()).toBe(200);
    ticket = await moved.json();
  }
  const uploaded = await page.request.post('/api/firmware', {
    headers: { 'X-XSRF-TOKEN': await xsrf() },
    multipart: {
      image: { name: 'kestrel7-head-2.40.bin', mimeType: 'application/octet-stream', buffer: randomBytes(8 * 1024) },
      model, unit: 'display_head', version: '2.40', source: 'Invented for the browser test',
    },
  });
  expect(uploaded.status()).toBe(201);

  // From the ticket page to the Flasher.
  await page.goto(`/tickets/${ticket.tag}`);
  await page.getByRole('link', { name: 'Flash with the Flasher' }).click();
  await expect(page).toHaveURL(new RegExp(`/flasher\\?ticket=${ticket.tag}`));
  await expect(page.getByRole('heading', { name: 'Flasher', level: 1 })).toBeVisible();
  await expect(page.getByText('Before you flash')).toBeVisible();
  await expect(page.getByTestId('flasher-image-2.40')).toBeVisible();
  await expect(page.getByTestId('image-check')).toContainText('matches the library');

  // The practice unit, 1K blocks (8 blocks), a supply dip as block 4 arrives.
  await page.getByRole('radio', { name: /Practice unit/ }).check();
  await page.getByRole('combobox', { name: 'XMODEM block' }).click();
  await page.getByRole('option', { name: '1024 bytes (1K)' }).click();
  // 8 blocks × 1029 bytes + EOT = 8233 bytes on the wire; × 10 / 115200 = 0.71 s → "at least 1 s".
  await expect(page.getByTestId('flasher-plan')).toContainText('8 blocks, 8233 bytes on the wire');
  await page.getByLabel('Power dip at block').fill('4');
  const terminal = page.getByTestId('terminal');
  await stopInLoader(page, terminal, async () => {
    const on = page.getByRole('button', { name: 'Power on the practice unit' });
    if (await on.isVisible()) await on.click();
    else await page.getByRole('button', { name: 'Power-cycle the practice unit' }).click();
  });
  await eraseAndReceive(page, terminal);
  await page.getByRole('button', { name: 'Send the image' }).click();
  await expect(page.getByText('the supply dipped as block 4 arrived')).toBeVisible();
  await expect(terminal).toContainText(/SIMULATED display unit[\s\S]*SIMULATED display unit/);
  await expect(page.getByText('it may have restarted')).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/flasher-power-dip.png`, fullPage: true });
  await page.getByRole('button', { name: 'Cancel the transfer' }).click();
  await expect(page.getByTestId('run-outcome')).toContainText('Transfer failed at block 4 of 8.');
  await expect(page.getByTestId('saved-attempt')).toContainText('Saved as attempt 1');
  await expect(page.getByTestId('saved-attempt')).toContainText('Transfer failed');

  // Supply fixed: clear the fault, power-cycle, and flash again.
  await page.getByLabel('Power dip at block').fill('');
  await stopInLoader(page, terminal, () => page.getByRole('button', { name: 'Power-cycle the practice unit' }).click());
  await eraseAndReceive(page, terminal);
  await page.getByRole('button', { name: 'Send the image' }).click();
  await expect(page.getByTestId('run-outcome')).toContainText('Transfer completed.');
  await expect(page.getByTestId('run-figures')).toContainText('8 of 8');
  await expect(page.getByTestId('saved-attempt')).toContainText('Saved as attempt 2');
  await expect(terminal).toContainText('check passed');

  // The unit starts with the new image; then it is recorded as verified running.
  await page.getByRole('button', { name: 'Boot (B)' }).click();
  await expect(terminal).toContainText('Display unit running firmware 2.40.');
  await page.screenshot({ path: `${SCREENSHOTS}/flasher-completed.png`, fullPage: true });
  await page.getByRole('button', { name: 'Mark verified running' }).click();
  await expect(page.getByText('Attempt 3: verified running.')).toBeVisible();

  // The ticket shows all three attempts, with the serial logs, and may move on.
  await page.getByRole('link', { name: `Open ${ticket.tag}` }).click();
  await expect(page.locator('[data-attempt="1"]')).toContainText('at block 4 of 8');
  await expect(page.locator('[data-attempt="1"]')).toContainText('Serial log');
  await expect(page.locator('[data-attempt="2"]')).toContainText('Transfer completed');
  await expect(page.locator('[data-attempt="3"]')).toContainText('Verified running');
  const log = await page.request.get(`/api/tickets/${ticket.tag}/flash-attempts/1/log`);
  expect(await log.text()).toContain('Stopped in the loader');
  await page.screenshot({ path: `${SCREENSHOTS}/flasher-attempts-on-ticket.png`, fullPage: true });
  const move = page.getByRole('button', { name: 'Move to Bench test' });
  await expect(move).toBeEnabled();
  await move.click();
  await expect(page.locator('.mdc-snackbar__label')).toContainText('moved to Bench test');
});
