// Bench slots in the browser: a member picks a club evening in the Material datepicker, books a
// free slot on a bench, sees it as theirs, the confirmation mail arrives; a technician sees the
// evening's list with that booking; the member cancels and the slot is free again.
import { expect, test, type Page } from '@playwright/test';
import { DateTime } from 'luxon';
import { DEMO, SCREENSHOTS, signIn, waitForMail } from './support';

// The demo club's evenings are Tuesdays and Thursdays 19:00-22:00 in Europe/London (seeder 020);
// take one at least three days ahead (clear of the cancellation cut-off) and inside the 28-day horizon.
function clubEvening(): DateTime {
  let d = DateTime.now().setZone('Europe/London').startOf('day').plus({ days: 3 });
  while (d.weekday !== 2 && d.weekday !== 4) d = d.plus({ days: 1 });
  return d;
}

/** Opens the datepicker and picks `day` (moving a month on when needed). */
async function pickDay(page: Page, day: DateTime) {
  await page.getByRole('button', { name: 'Open calendar' }).click();
  const label = day.setLocale('en-US').toFormat('MMMM d, yyyy'); // the native adapter's accessible label
  const cell = page.locator(`.mat-calendar-body-cell[aria-label="${label}"]`);
  for (let i = 0; i < 2 && !(await cell.isVisible()); i++) await page.getByRole('button', { name: 'Next month' }).click();
  await cell.click();
  await expect(page.locator('mat-calendar')).toHaveCount(0);
}

test('a member books a slot on a date, sees it taken by them and cancels it; a technician sees the evening', async ({ browser }) => {
  const evening = clubEvening();
  const member = await browser.newPage();
  await signIn(member, DEMO.member);
  await member.getByRole('link', { name: 'Bench slots' }).click();
  await member.getByRole('link', { name: 'Book a bench slot' }).click();
  await expect(member.getByRole('heading', { name: 'Book a bench slot' })).toBeVisible();
  await pickDay(member, evening);

  const heron = member.locator('article', { has: member.getByRole('heading', { name: 'Heron bench' }) });
  const slot = heron.getByRole('button', { name: /21:30–22:00/ });
  await expect(slot).toContainText('Free');
  await slot.click();
  await expect(slot).toContainText('Chosen');
  await expect(member.getByRole('heading', { name: /Heron bench, .* 21:30–22:00 \(1 slot\)/ })).toBeVisible();

  // The form says what is missing before anything is sent.
  await member.getByRole('button', { name: 'Book this slot' }).click();
  await expect(member.getByText('Enter what the slot is for.')).toBeVisible();
  await member.getByLabel('What for').click();
  await member.getByRole('option', { name: 'Self-service work' }).click();
  await member.getByLabel('Note for the technicians (optional)').fill('Checking the PA bias on the Heron 100');
  await member.getByRole('button', { name: 'Book this slot' }).click();

  await expect(slot).toContainText('Yours');
  await expect(slot).toBeDisabled();
  await expect(member.getByRole('heading', { name: 'Your bookings this day' })).toBeVisible();
  await member.screenshot({ path: `${SCREENSHOTS}/bench-slot-booked.png`, fullPage: true });
  const mail = await waitForMail(DEMO.member.email, /^Bench slot booked: Heron bench/);
  expect(mail.text).toContain('21:30');

  const tech = await browser.newPage();
  await signIn(tech, DEMO.technician);
  await tech.getByRole('link', { name: 'Tonight at the bench' }).click();
  await expect(tech.getByRole('heading', { name: 'Tonight at the bench' })).toBeVisible();
  await pickDay(tech, evening);
  const entry = tech.getByRole('listitem').filter({ hasText: 'Perrin Sallow' }).filter({ hasText: '21:30–22:00' });
  await expect(entry).toContainText('Heron bench · Self-service work');
  await expect(entry).toContainText('Checking the PA bias');
  await expect(entry.getByRole('button', { name: 'Mark no-show' })).toBeDisabled(); // not started yet
  await tech.screenshot({ path: `${SCREENSHOTS}/tonight-at-the-bench.png`, fullPage: true });

  await member.getByRole('button', { name: 'Cancel this booking' }).click();
  await expect(slot).toContainText('Free');
  await expect(slot).toBeEnabled();
  await tech.getByRole('button', { name: 'Refresh' }).click();
  await expect(tech.getByRole('listitem').filter({ hasText: 'Perrin Sallow' }).filter({ hasText: '21:30–22:00' })).toHaveCount(0);
});
