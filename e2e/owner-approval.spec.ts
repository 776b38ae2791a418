// Issue 7: a technician records a diagnosis and a quote above the club's threshold; the owner opens
// the approval link from the mail in the mail catcher (no account), approves; the hold clears; the
// owner opens the status page at phone size.
import { expect, test, type BrowserContext } from '@playwright/test';
import { DEMO, SCREENSHOTS, signIn, waitForMail } from './support';

async function api(ctx: BrowserContext, method: 'GET' | 'POST', url: string, data?: unknown) {
  const xsrf = (await ctx.cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  const res = await ctx.request.fetch(url, { method, data, headers: { 'X-XSRF-TOKEN': xsrf } });
  expect(res.ok(), `${method} ${url}: ${res.status()} ${await res.text()}`).toBe(true);
  return res.json();
}

/** The link's path (the mail carries the public URL of the run). */
const pathOf = (url: string) => new URL(url).pathname;

test('diagnosis and a quote above the threshold; the owner approves from the e-mailed link and follows the status page', async ({ browser }) => {
  // Two roles, two pages and a mail round trip: longer than the default minute on a busy machine.
  test.setTimeout(240_000);
  const techContext = await browser.newContext({ viewport: { width: 1400, height: 900 } });
  const tech = await techContext.newPage();
  await signIn(tech, DEMO.technician);
  const model = `Fenwick Heron 90 quote ${Date.now().toString(36)}`;
  const opened = await api(techContext, 'POST', '/api/tickets', {
    owner: { name: 'Perrin Sallow', email: DEMO.member.email },
    equipmentKind: 'transceiver',
    makeModel: model,
    units: ['main body'],
    faultReported: 'Shuts down on transmit; display flickers.',
    accessories: ['DC lead'],
    reflashConsent: false,
    notifyByEmail: true,
  });
  const tag: string = opened.tag;
  await api(techContext, 'POST', `/api/tickets/${tag}/moves`, { to: 'diagnosis', version: opened.version });

  await tech.goto(`/tickets/${tag}`);
  const diagnosis = tech.getByTestId('diagnosis-section');
  await expect(diagnosis).toBeVisible();
  await diagnosis.getByTestId('check-cableOut').click();
  await diagnosis.getByTestId('check-poweredCableOut').click();
  await diagnosis.getByTestId('check-result-poweredCableOut').fill('shuts down on transmit');
  await diagnosis.getByTestId('supply-at-radio').fill('11.1');
  await diagnosis.getByTestId('transmit-current').fill('20');
  await diagnosis.getByTestId('lead-length').fill('3');
  await diagnosis.getByTestId('lead-gauge').click();
  await tech.getByRole('option', { name: 'AWG 18' }).click();
  // 3 m of AWG 18 at 20 A drops about 2.4 V: the lead explains the low voltage.
  await expect(diagnosis.getByTestId('lead-verdict')).toContainText('This lead explains a “low voltage” fault');
  await diagnosis.getByTestId('findings').fill('Supply sags at the radio on transmit: thin DC lead. Replace lead and check the PA.');
  await diagnosis.getByTestId('decision-repair').click();
  await diagnosis.getByTestId('save-diagnosis').click();
  await expect(diagnosis).toContainText(/Saved .* by Tobin Marsh/);

  const quote = tech.getByTestId('quote-section');
  await quote.getByTestId('line-desc-0').fill('New DC lead, AWG 10, fused');
  await quote.getByTestId('line-qty-0').fill('1');
  await quote.getByTestId('line-price-0').fill('24.50');
  await quote.getByTestId('add-line').click();
  await quote.getByTestId('line-desc-1').fill('Labour (hours)');
  await quote.getByTestId('line-qty-1').fill('1.5');
  await quote.getByTestId('line-price-1').fill('18.00');
  await expect(quote.getByTestId('new-quote-total')).toHaveText('£51.50');
  await tech.screenshot({ path: `${SCREENSHOTS}/ticket-diagnosis-quote.png`, fullPage: true });
  await quote.getByTestId('save-quote').click();
  await expect(quote.getByTestId('latest-quote')).toContainText('Owner to approve');
  let detail = await api(techContext, 'GET', `/api/tickets/${tag}`);
  expect(detail.awaitingApproval).toBe(true);

  // The owner: the approval mail in the mail catcher, opened without an account.
  const mail = await waitForMail(DEMO.member.email, new RegExp(`Quote for .*${tag}`));
  const approveUrl = /https?:\/\/\S+\/owner\/approve\/\S+/.exec(mail.text ?? '')?.[0];
  const statusUrl = /https?:\/\/\S+\/owner\/status\/\S+/.exec(mail.text ?? '')?.[0];
  expect(approveUrl && statusUrl, 'the mail carries both links').toBeTruthy();

  const ownerContext = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await owner.goto(pathOf(approveUrl!));
  await expect(owner.getByTestId('approval-total')).toHaveText('£51.50');
  await expect(owner.getByRole('note', { name: /Caution: Before you approve/ })).toBeVisible();
  await owner.screenshot({ path: `${SCREENSHOTS}/owner-approval.png`, fullPage: true });
  await owner.getByTestId('approve').click();
  await expect(owner.getByTestId('decision-done')).toContainText('Approved by the owner');

  detail = await api(techContext, 'GET', `/api/tickets/${tag}`);
  expect(detail.awaitingApproval).toBe(false);
  await tech.reload();
  await expect(tech.getByTestId('latest-quote')).toContainText('Approved by the owner');

  await owner.goto(pathOf(statusUrl!));
  await expect(owner.getByRole('heading', { name: new RegExp(tag) })).toBeVisible();
  await expect(owner.getByTestId('owner-timeline')).toContainText('You approved the quote.');
  await expect(owner.getByTestId('owner-timeline')).not.toContainText('Diagnosis saved');
  await owner.screenshot({ path: `${SCREENSHOTS}/owner-status-phone.png`, fullPage: true });
  // Reused after the decision: refused in plain words.
  await owner.goto(pathOf(approveUrl!));
  await expect(owner.getByTestId('decision-done')).toBeVisible();
});
