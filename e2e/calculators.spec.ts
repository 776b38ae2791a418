// Bench calculators: each figure computed from typed inputs, through the real API.
// Expected values are worked by hand beside each check (sources as in api/src/domain/*.test.ts).
import { expect, test } from '@playwright/test';
import { DEMO, SCREENSHOTS, signIn } from './support';

test('the Bench calculators compute XMODEM time, RF figures and DC lead drop as you type', async ({ page }) => {
  await signIn(page, DEMO.member);
  await page.goto('/calculators');
  await expect(page.getByRole('heading', { name: 'Bench calculators' })).toBeVisible();

  // XMODEM-1K with CRC-16 at 115200 baud, 8N1 (Forsberg 1988 packet layout: STX, block, ~block,
  // 1024 data bytes, 2 CRC bytes). 1,000,000 bytes -> ceil(1e6/1024) = 977 blocks;
  // padding 977*1024 - 1e6 = 448; wire 977*1029 + 1 EOT = 1,005,334 bytes;
  // time 1,005,334 * 10 / 115200 = 87.27 s = 1:27.
  await page.getByTestId('xmodem-bytes').fill('1000000');
  await expect(page.getByTestId('xmodem-blocks')).toHaveText('977');
  await expect(page.getByTestId('xmodem-padding')).toHaveText('448 bytes');
  await expect(page.getByTestId('xmodem-wire')).toHaveText('1,005,334 bytes');
  await expect(page.getByTestId('xmodem-time')).toContainText('1:27');

  // 100 W forward, 1 W reflected: |Γ| = sqrt(1/100) = 0.100; SWR = 1.1/0.9 = 1.22:1;
  // return loss = -20 log10 0.1 = 20.00 dB; mismatch loss = -10 log10(1 - 0.01) = 0.04 dB;
  // 100 W = 10 log10(100 000 mW) = 50.0 dBm.
  await page.getByTestId('rf-forward').fill('100');
  await page.getByTestId('rf-reflected').fill('1');
  await expect(page.getByTestId('rf-gamma')).toHaveText('0.100');
  await expect(page.getByTestId('rf-swr')).toHaveText('1.22:1');
  await expect(page.getByTestId('rf-return-loss')).toContainText('20.00 dB');
  await expect(page.getByTestId('rf-mismatch-loss')).toHaveText('0.04 dB');
  await expect(page.getByTestId('rf-dbm')).toHaveText('50.0 dBm');

  // Reflected above forward is refused with a message on the field.
  await page.getByTestId('rf-reflected').fill('150');
  await expect(page.getByTestId('rf-reflected-error')).toBeVisible();

  // 20 A over 2 m of AWG 12 (NEC Chapter 9 Table 8: 1.98 ohm/kft = 6.496 mOhm/m at 75 °C):
  // round trip 4 m -> 25.98 mOhm; drop 20 * 0.02598 = 0.52 V; 13.8 - 0.52 = 13.28 V at the radio,
  // inside 13.8 V ± 15 % (common practice, no published source).
  await page.getByTestId('dc-current').fill('20');
  await page.getByTestId('dc-length').fill('2');
  await page.getByTestId('dc-card').getByLabel('Gauge').click();
  await page.getByRole('option', { name: 'AWG 12' }).click();
  await page.getByTestId('dc-supply').fill('13.8');
  await expect(page.getByTestId('dc-drop')).toHaveText('0.52 V');
  await expect(page.getByTestId('dc-at-radio')).toHaveText('13.28 V');
  await expect(page.getByTestId('dc-tolerance')).toContainText('Within');

  // The cautions sit beside the work.
  await expect(page.getByText('Transmit only into a dummy load on the bench')).toBeVisible();
  await expect(page.getByText(/fus/i).first()).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/bench-calculators.png`, fullPage: true });
});
