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

  // 20 A over 2 m of AWG 12 (NEC Chapter 9 Table 8: 1.98 ohm/kft = 6.496 mOhm/m at 75 °C, corrected
  // to 20 °C with copper's alpha20 = 0.00393/K: 6.496 / 1.21615 = 5.3415 mOhm/m): round trip 4 m ->
  // 21.37 mOhm; drop 20 * 0.02137 = 0.43 V; 13.8 - 0.43 = 13.37 V at the radio, inside 13.8 V ± 15 %
  // (common practice, no published source); 20 A is within AWG 12's 25 A (NEC Table 400.5(A)(1)).
  await page.getByTestId('dc-current').fill('20');
  await page.getByTestId('dc-length').fill('2');
  await page.getByTestId('dc-card').getByLabel('Gauge').click();
  await page.getByRole('option', { name: 'AWG 12' }).click();
  await page.getByTestId('dc-supply').fill('13.8');
  await expect(page.getByTestId('dc-drop')).toHaveText('0.43 V');
  await expect(page.getByTestId('dc-at-radio')).toHaveText('13.37 V');
  await expect(page.getByTestId('dc-tolerance')).toContainText('Within');
  await expect(page.getByTestId('dc-ampacity')).toContainText('Within');
  await expect(page.getByTestId('dc-fuse')).toContainText('25 A');

  // The cautions sit beside the work.
  await expect(page.getByText('Transmit only into a dummy load on the bench')).toBeVisible();
  await expect(page.getByText(/fus/i).first()).toBeVisible();
  await page.screenshot({ path: `${SCREENSHOTS}/bench-calculators.png`, fullPage: true });
});

test('signal level, dummy load, pad, feed-line loss, DC ampacity and discharge from typed values; a decimal comma is a point', async ({ page }) => {
  await signIn(page, DEMO.technician);
  await page.goto('/calculators');

  // −97 dBm on HF: 9 + (−97 + 73) / 6 = S5 (IARU Region 1 R.1: S9 = −73 dBm, 6 dB a unit);
  // at 50 Ω: P = 10^(−12.7) W = 0.1995 pW, V = sqrt(P × 50) = 3.16 µV.
  await page.getByTestId('level-value').fill('-97');
  await expect(page.getByTestId('level-s')).toHaveText('S5');
  await expect(page.getByTestId('level-volts')).toHaveText('3.16 µV');
  await expect(page.getByTestId('level-watts')).toHaveText('200 fW');
  // The same −97 dBm above 30 MHz (S9 = −93 dBm): 9 + (−4)/6 = S8.3.
  await page.getByTestId('level-card').getByLabel('S-meter band').click();
  await page.getByRole('option', { name: /VHF/ }).click();
  await expect(page.getByTestId('level-s')).toHaveText('S8.3');

  // 12,5 W typed with a decimal comma is 12.5 W: into 50 Ω, V_rms = sqrt(625) = 25.00 V,
  // V_peak = 35.36 V, V_pp = 70.7 V, I = sqrt(0.25) = 0.500 A (never 125 W: that would be 79.06 V).
  await page.getByTestId('dummy-watts').fill('12,5');
  await expect(page.getByTestId('dummy-vrms')).toHaveText('25.00 V');
  await expect(page.getByTestId('dummy-vpp')).toHaveText('70.7 V');
  await expect(page.getByTestId('dummy-amps')).toHaveText('0.500 A');
  // "1,000" could be one or a thousand: refused with a message, nothing computed.
  await page.getByTestId('dummy-watts').fill('1,000');
  await expect(page.getByTestId('dummy-card').getByText('Is this 1.000 or 1000?')).toBeVisible();
  await expect(page.getByTestId('dummy-figures')).toHaveCount(0);

  // 20 dB tee pad in 50 Ω, 10 W in: K = 10; arms 50 × 9/11 = 40.9 Ω, shunt 50 × 20/99 = 10.1 Ω
  // (the ARRL Handbook's 50 Ω tee table, from memory); E24 39 Ω (−4.7 %) and 10 Ω (−1.0 %);
  // the input arm takes 10 W × 40.91 / 50 = 8.18 W.
  await page.getByTestId('pad-db').fill('20');
  await page.getByTestId('pad-card').getByLabel('Shape').click();
  await page.getByRole('option', { name: /Tee/ }).click();
  await page.getByTestId('pad-input-w').fill('10');
  await expect(page.getByTestId('pad-series')).toHaveText('40.9 Ω');
  await expect(page.getByTestId('pad-shunt')).toHaveText('10.1 Ω');
  await expect(page.getByTestId('pad-series-e24')).toHaveText('39.0 Ω −4.7 %');
  await expect(page.getByTestId('pad-shunt-e24')).toHaveText('10.0 Ω −1.0 %');
  await expect(page.getByTestId('pad-first-w')).toHaveText('8.18 W');

  // 30 m of LMR-400 at 145 MHz (Times Microwave datasheet: 0.12229 sqrt(F) + 0.00026 F dB/100 ft
  // = 1.5103 dB/100 ft = 4.955 dB/100 m) = 1.49 dB matched; SWR 2 at the antenna:
  // total 10 log10[(a² − 1/9)/(a (8/9))] with a = 10^0.14865 → 1.75 dB; the radio sees 1.62:1.
  await page.getByTestId('line-length').fill('30');
  await page.getByTestId('line-mhz').fill('145');
  await page.getByTestId('line-swr').fill('2');
  await expect(page.getByTestId('line-matched-loss')).toHaveText('1.49 dB');
  await expect(page.getByTestId('line-total')).toHaveText('1.75 dB');
  await expect(page.getByTestId('line-swr-in')).toHaveText('1.62:1');
  await expect(page.getByTestId('line-source')).toContainText('Times Microwave Systems LMR-400 datasheet');

  // 25 A through 0.5 m of AWG 18 from 13.8 V: drop 25 × 1 m × 21.45 mOhm/m = 0.54 V, 13.26 V at
  // the radio (within the band) but far past AWG 18's 10 A; fuse 25 × 1.25 = 31.25 -> 35 A.
  await page.getByTestId('dc-current').fill('25');
  await page.getByTestId('dc-length').fill('0,5');
  await page.getByTestId('dc-card').getByLabel('Gauge').click();
  await page.getByRole('option', { name: 'AWG 18' }).click();
  await expect(page.getByTestId('dc-at-radio')).toHaveText('13.26 V');
  await expect(page.getByTestId('dc-tolerance')).toContainText('Within');
  await expect(page.getByTestId('dc-ampacity')).toContainText('Over: the lead will overheat');
  await expect(page.getByTestId('dc-fuse')).toContainText('35 A');

  // 400 V on 470 µF through 100 kΩ: RC = 47 s; 47 ln(400/60) = 89.2 s = 1:29 to 60 V;
  // ½ × 470 µF × 400² = 37.6 J; 400² / 100 kΩ = 1.60 W at first.
  await page.getByTestId('discharge-volts').fill('400');
  await page.getByTestId('discharge-uf').fill('470');
  await page.getByTestId('discharge-kohm').fill('100');
  await expect(page.getByTestId('discharge-time')).toHaveText('1:29 (89.2 s)');
  await expect(page.getByTestId('discharge-joules')).toHaveText('37.6 J');
  await expect(page.getByTestId('discharge-watts')).toHaveText('1.60 W');
  await expect(page.getByTestId('discharge-caution')).toContainText('Mains and stored charge can kill');
  await page.screenshot({ path: `${SCREENSHOTS}/bench-calculators-more.png`, fullPage: true });
});
