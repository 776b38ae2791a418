// Shared steps for the browser tests.
import { expect, type Page } from '@playwright/test';

export const MAIL_URL = process.env.RW_E2E_MAIL_URL ?? 'http://127.0.0.1:1280';
export const SCREENSHOTS = 'test-results/screenshots';

export const DEMO = {
  member: { email: 'member@kestrelfen.example', password: 'bench-demo-member' },
  technician: { email: 'tech@kestrelfen.example', password: 'bench-demo-tech' },
  admin: { email: 'admin@kestrelfen.example', password: 'bench-demo-admin' },
};

export async function signIn(page: Page, who: { email: string; password: string }) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(who.email);
  await page.getByLabel('Password', { exact: true }).fill(who.password);
  await page.getByRole('button', { name: /sign in/i }).click();
  await expect(page).not.toHaveURL(/sign-in/);
}

interface MaildevMail {
  subject: string;
  to: { address: string }[];
  text?: string;
}

/** Polls maildev's REST API until a mail to `address` whose subject matches arrives. */
export async function waitForMail(address: string, subject: RegExp, timeoutMs = 20_000): Promise<MaildevMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await fetch(`${MAIL_URL}/api/email?to.address=${encodeURIComponent(address)}`);
    const mails = (await res.json()) as MaildevMail[];
    const found = mails.find((m) => subject.test(m.subject));
    if (found) return found;
    if (Date.now() > deadline) {
      throw new Error(`No mail to ${address} matching ${subject} within ${timeoutMs} ms; got: ${mails.map((m) => m.subject).join(' | ')}`);
    }
    await new Promise((r) => setTimeout(r, 500));
  }
}

/** CDK drag in a real browser: press, move in steps, release, then wait for the preview to go. */
export async function dragTo(page: Page, from: ReturnType<Page['locator']>, to: ReturnType<Page['locator']>) {
  await from.scrollIntoViewIfNeeded();
  const a = await from.boundingBox();
  const b = await to.boundingBox();
  const viewport = page.viewportSize();
  if (!a || !b || !viewport) throw new Error('drag source or target is not visible');
  // Aim at a point of the target lane that is inside the viewport.
  const targetX = b.x + b.width / 2;
  const targetY = Math.min(Math.max(b.y + 40, 80), Math.min(b.y + b.height - 10, viewport.height - 20));
  await page.mouse.move(a.x + a.width / 2, a.y + a.height / 2);
  await page.mouse.down();
  await page.mouse.move(a.x + a.width / 2 + 10, a.y + a.height / 2 + 10, { steps: 5 });
  await page.mouse.move(targetX, targetY, { steps: 20 });
  await page.mouse.move(targetX, targetY + 5, { steps: 5 });
  await page.mouse.up();
  await expect(page.locator('.cdk-drag-preview')).toHaveCount(0);
}
