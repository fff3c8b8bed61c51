import { expect, test } from '@playwright/test';
import { DEMO, latestMail } from './support/env';
import { SIGN_IN_SUBJECT } from './support/sign-in';

test('a homeowner asks for a link, opens it from the e-mail, confirms and lands in the portal', async ({ page }) => {
  await page.goto('/portal');
  // Signed out: sent to the homeowner sign-in with the way back remembered.
  await expect(page).toHaveURL(/\/sign-in\?returnUrl=%2Fportal/);
  const asked = Date.now();
  await page.getByLabel('E-mail address').fill(DEMO.homeownerA);
  await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
  await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();

  const mail = await latestMail(DEMO.homeownerA, { after: asked - 1000, subject: SIGN_IN_SUBJECT });
  const link = mail.links.find((l) => l.includes('/sign-in/confirm?token='));
  expect(link, 'the e-mail carries a confirm link').toBeTruthy();

  const landing = await page.goto(link!);
  expect(landing?.headers()['referrer-policy']).toBe('no-referrer');
  // Opening the link alone signs nobody in; the button does.
  await expect(page.getByRole('button', { name: 'Sign me in' })).toBeVisible();
  await page.getByRole('button', { name: 'Sign me in' }).click();
  await expect(page).toHaveURL(/\/portal$/);
  await expect(page.getByRole('button', { name: 'Account menu' })).toBeVisible();

  // The same link a second time is refused in plain words.
  await page.goto(link!);
  await page.getByRole('button', { name: 'Sign me in' }).click();
  await expect(page.getByRole('alert')).toContainText('already been used');
});

test('a staff member signs in with a password; a wrong one is explained next to the field', async ({ page }) => {
  await page.goto('/admin');
  await expect(page).toHaveURL(/\/staff\/sign-in\?returnUrl=%2Fadmin/);
  await page.getByLabel('E-mail address').fill(DEMO.owner);
  await page.getByLabel('Password').fill('not the right password');
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await expect(page.getByText('That e-mail address and password do not match an account.')).toBeVisible();

  await page.getByLabel('Password').fill(DEMO.staffPassword);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await expect(page).toHaveURL(/\/admin$/);
  await page.getByRole('link', { name: 'Access log' }).click();
  await expect(page.getByRole('heading', { name: 'Sign-in and access log' })).toBeVisible();
  await expect(page.getByRole('cell', { name: 'Signed in' }).first()).toBeVisible();
});

test('a technician who opens the owner settings is sent to the field area', async ({ page }) => {
  await page.goto('/staff/sign-in');
  await page.getByLabel('E-mail address').fill(DEMO.technician);
  await page.getByLabel('Password').fill(DEMO.staffPassword);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await expect(page).toHaveURL(/\/field$/);
  await page.goto('/admin');
  await expect(page).toHaveURL(/\/field$/);
});
