import { expect, test } from '@playwright/test';
import { DEMO, latestMail } from './support/env';

test('the office sends seasonal tune-up reminders and each household gets one e-mail', async ({ page }) => {
  await page.goto('/staff/sign-in');
  await page.getByLabel('E-mail').fill(DEMO.office);
  await page.getByLabel('Password').fill(DEMO.staffPassword);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).toHaveURL(/\/office/);

  await page.getByRole('link', { name: 'Reminders' }).first().click();
  await expect(page.getByRole('heading', { name: 'Seasonal reminders' })).toBeVisible();
  await page.getByRole('button', { name: /Spring cooling tune-up/ }).click();

  // The audience is listed, with why each household is due, before anything is sent.
  const audience = page.getByRole('table', { name: /Households that will receive this reminder/ });
  const row = audience.getByRole('row').filter({ hasText: DEMO.homeownerA });
  await expect(row).toContainText('cooling tune-up');
  const startedAt = Date.now();
  const send = page.getByRole('button', { name: /^Send to \d+ households/ });
  const count = Number((await send.innerText()).match(/\d+/)![0]);
  expect(count).toBeGreaterThan(0);
  await send.click();
  await expect(page.getByRole('group')).toContainText(`${count} households`);
  await page.getByRole('button', { name: 'Send now' }).click();

  await expect(page.getByText(`${count} sent`).first()).toBeVisible({ timeout: 30_000 });
  const mail = await latestMail(DEMO.homeownerA, { after: startedAt - 1000, subject: /tune-up/ });
  expect(mail.subject).toBe('Time to book your spring cooling tune-up');
  // The button opens the booking stepper with the tune-up and the home already chosen.
  expect(mail.links.some((l) => /\/portal\/booking\?kind=tune_up&property=[0-9a-f-]{36}$/.test(l))).toBe(true);

  // Sent once: the household is no longer in the list of who is due, and the delivery log has it sent.
  await expect(audience.getByRole('row').filter({ hasText: DEMO.homeownerA })).toHaveCount(0);
  await expect(page.getByRole('table', { name: 'Households in this campaign' }).getByRole('row').filter({ hasText: DEMO.homeownerA })).toContainText('Sent');
});
