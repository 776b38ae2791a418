// Accounts from a person's side: register as a member, sign out, reset a forgotten password by the
// e-mailed single-use link, and sign in with the new one.
import { expect, test } from '@playwright/test';
import { SCREENSHOTS, signIn, waitForMail } from './support';

test('register, forget the password, reset it by the e-mailed link (once), sign in again', async ({ page }) => {
  const email = `newcomer.${Date.now().toString(36)}@kestrelfen.example`;
  await page.goto('/register');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Name').fill('Wren Halloway');
  await page.getByLabel(/call sign/i).fill('Q9WHY');
  await page.getByLabel('Password', { exact: true }).fill('marsh lantern antenna');
  await page.screenshot({ path: `${SCREENSHOTS}/register.png` });
  await page.getByRole('button', { name: 'Register' }).click();
  await expect(page).toHaveURL(/\/tickets/);
  await expect(page.getByText('Wren Halloway')).toBeVisible();

  // Sign out from the account menu.
  await page.getByText('Wren Halloway').click();
  await page.getByRole('menuitem', { name: /sign out/i }).click();
  await expect(page).toHaveURL(/sign-in/);

  await page.goto('/forgot-password');
  await page.getByLabel('E-mail').fill(email);
  await page.getByRole('button', { name: 'Send the link' }).click();
  const mail = await waitForMail(email, /reset/i);
  const link = /https?:\/\/\S+\/reset-password\?token=[\w-]+/.exec(mail.text ?? '')?.[0];
  expect(link, 'the mail carries a reset link').toBeTruthy();
  const path = new URL(link!).pathname + new URL(link!).search;

  await page.goto(path);
  await page.getByLabel('New password').fill('reed bed receiver 7');
  await page.getByRole('button', { name: 'Save the new password' }).click();
  await expect(page.getByText(/password is changed/i)).toBeVisible();

  // The link works once.
  await page.goto(path);
  await page.getByLabel('New password').fill('another fresh passphrase');
  await page.getByRole('button', { name: 'Save the new password' }).click();
  await expect(page.getByRole('alert')).toContainText('This link has expired or was already used.');
  await expect(page.getByRole('link', { name: 'Ask for a new link' })).toBeVisible();
  await expect(page.getByText(/password is changed/i)).toHaveCount(0);

  await signIn(page, { email, password: 'reed bed receiver 7' });
  await expect(page).toHaveURL(/\/tickets/);
});

test('the reset page opened without the e-mailed token says so before any form', async ({ page }) => {
  await page.goto('/reset-password');
  await expect(page.getByRole('alert')).toContainText('this address has no token in it');
  await expect(page.getByLabel('New password')).toHaveCount(0);
  await page.getByRole('link', { name: 'Ask for a new link' }).click();
  await expect(page).toHaveURL(/\/forgot-password/);
});

test('a wrong password is refused with a message and no session', async ({ page }) => {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill('member@kestrelfen.example');
  await page.getByLabel('Password', { exact: true }).fill('not the right one at all');
  await page.getByRole('button', { name: /sign in/i }).click();
  await expect(page.getByText(/e-mail address and password do not match/i)).toBeVisible();
  await expect(page).toHaveURL(/sign-in/);
  const status = await page.evaluate(async () => (await fetch('/api/tickets')).status);
  expect(status).toBe(401);
});
