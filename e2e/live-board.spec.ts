// The live Bench board: two technicians on one club night, each with the board open. One moves a
// card (by keyboard, from its menu); the other sees it move within a few seconds without
// reloading. A card being dragged is not yanked away by such a refresh.
import { expect, test, type Browser, type BrowserContext, type Page } from '@playwright/test';
import { DEMO, SCREENSHOTS, signIn } from './support';

const TECH2 = { email: 'tech2@kestrelfen.example', password: 'bench-demo-tech2' };

/** Contexts opened by a test: closed after it, so no open board keeps listening into the next test. */
const opened: BrowserContext[] = [];
test.afterEach(async () => {
  await Promise.all(opened.splice(0).map((c) => c.close()));
});

async function openBoard(browser: Browser, who: { email: string; password: string }): Promise<Page> {
  const context = await browser.newContext();
  opened.push(context);
  const page = await context.newPage();
  await signIn(page, who);
  await page.goto('/board');
  await expect(page.locator('.live-status')).toContainText('Live');
  // Marks this document: a reload or navigation would lose it.
  await page.evaluate(() => ((globalThis as unknown as { rwNoReload: boolean }).rwNoReload = true));
  return page;
}

async function stillSameDocument(page: Page) {
  expect(await page.evaluate(() => (globalThis as unknown as { rwNoReload?: boolean }).rwNoReload)).toBe(true);
}

/** Hands a ticket in at the bench through the API, as the signed-in technician of `page`. */
async function handIn(page: Page, makeModel: string): Promise<string> {
  const xsrf = (await page.context().cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  const res = await page.request.post('/api/tickets', {
    headers: { 'X-XSRF-TOKEN': xsrf },
    data: {
      equipmentKind: 'transceiver',
      makeModel,
      units: ['main body'],
      faultReported: 'Display stays dark after a power cut.',
      accessories: ['DC lead'],
      reflashConsent: true,
      notifyByEmail: false,
      owner: { name: 'Edmund Rushby', email: 'edmund.rushby@fenmail.example', callSign: 'Q4ERB' },
    },
  });
  expect(res.status(), await res.text()).toBe(201);
  return (await res.json()).tag as string;
}

test('a move on one technician’s board shows on another’s within a few seconds, without reloading', async ({ browser }) => {
  const tobin = await openBoard(browser, DEMO.technician);
  const ysolde = await openBoard(browser, TECH2);

  const tag = await handIn(tobin, `Saltmead Bittern live ${Date.now().toString(36)}`);
  // The new ticket itself reaches both open boards through the stream.
  await expect(tobin.locator(`[data-lane="intake"] [data-tag="${tag}"]`)).toBeVisible({ timeout: 5_000 });
  await expect(ysolde.locator(`[data-lane="intake"] [data-tag="${tag}"]`)).toBeVisible({ timeout: 5_000 });

  // Tobin moves it with the keyboard: focus the card's menu button, open, choose Diagnosis.
  const menuButton = tobin.locator(`[data-tag="${tag}"] .card-menu`);
  await menuButton.focus();
  await tobin.keyboard.press('Enter');
  await expect(tobin.getByRole('menuitem', { name: 'Move to Diagnosis' })).toBeFocused();
  await tobin.keyboard.press('Enter');
  await expect(tobin.locator(`[data-lane="diagnosis"] [data-tag="${tag}"]`)).toBeVisible();
  // Focus came back to the moved card's menu button, in its new lane.
  await expect(tobin.locator(`[data-lane="diagnosis"] [data-tag="${tag}"] .card-menu`)).toBeFocused();

  const started = Date.now();
  await expect(ysolde.locator(`[data-lane="diagnosis"] [data-tag="${tag}"]`)).toBeVisible({ timeout: 5_000 });
  await expect(ysolde.locator(`[data-lane="intake"] [data-tag="${tag}"]`)).toHaveCount(0);
  const seenAfterMs = Date.now() - started;
  expect(seenAfterMs).toBeLessThan(5_000);
  await stillSameDocument(ysolde);
  // The other board took it from the stream, with the technician who took it.
  await expect(ysolde.locator(`[data-tag="${tag}"] .card-tech`)).toContainText('Tobin Marsh');
  await expect(ysolde.locator('.live-status')).toContainText(/Live.*Updated \d\d:\d\d:\d\d/);
  await ysolde.screenshot({ path: `${SCREENSHOTS}/live-board-second-technician.png` });
});

test('a refresh waits while a card is being dragged, then catches up when it is dropped', async ({ browser }) => {
  const tobin = await openBoard(browser, DEMO.technician);
  const ysolde = await openBoard(browser, TECH2);
  const held = await handIn(tobin, `Marram PS-30 held ${Date.now().toString(36)}`);
  const moved = await handIn(tobin, `Fenwick Reedling moved ${Date.now().toString(36)}`);
  const heldCard = ysolde.locator(`[data-lane="intake"] [data-tag="${held}"]`);
  await expect(heldCard).toBeVisible({ timeout: 5_000 });
  await expect(ysolde.locator(`[data-lane="intake"] [data-tag="${moved}"]`)).toBeVisible({ timeout: 5_000 });

  // Ysolde picks a card up and keeps holding it.
  await heldCard.scrollIntoViewIfNeeded();
  const box = (await heldCard.boundingBox())!;
  await ysolde.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
  await ysolde.mouse.down();
  await ysolde.mouse.move(box.x + box.width / 2 + 12, box.y + box.height / 2 + 12, { steps: 5 });
  await expect(ysolde.locator('.cdk-drag-preview')).toHaveCount(1);

  // Meanwhile Tobin moves the other card.
  await tobin.locator(`[data-tag="${moved}"] .card-menu`).click();
  await tobin.getByRole('menuitem', { name: 'Move to Diagnosis' }).click();
  await expect(tobin.locator(`[data-lane="diagnosis"] [data-tag="${moved}"]`)).toBeVisible();

  // Ysolde's board heard about it (it says so) but does not redraw under her hand.
  await expect(ysolde.locator('.live-status')).toContainText('Changes come in when you drop the card', { timeout: 5_000 });
  await expect(ysolde.locator('.cdk-drag-preview')).toHaveCount(1);
  await expect(ysolde.locator(`[data-lane="intake"] [data-tag="${moved}"]`)).toHaveCount(1);

  // She lets go where she picked it up; now the board catches up.
  await ysolde.mouse.move(box.x + box.width / 2, box.y + box.height / 2, { steps: 5 });
  await ysolde.mouse.up();
  await expect(ysolde.locator('.cdk-drag-preview')).toHaveCount(0);
  await expect(ysolde.locator(`[data-lane="diagnosis"] [data-tag="${moved}"]`)).toBeVisible({ timeout: 5_000 });
  await expect(ysolde.locator(`[data-lane="intake"] [data-tag="${held}"]`)).toBeVisible();
  await expect(ysolde.locator('.live-status')).not.toContainText('Changes come in');
  await stillSameDocument(ysolde);
});
