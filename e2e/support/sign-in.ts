import { expect, type Page } from '@playwright/test';
import { DEMO, latestMail } from './env';

/** Signs a staff member in at /staff/sign-in with the demo password. */
export async function signInStaff(page: Page, email: string): Promise<void> {
  await page.goto('/staff/sign-in');
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill(DEMO.staffPassword);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await expect(page).not.toHaveURL(/\/staff\/sign-in/);
}

/** The sign-in mail's subject: a quote or reminder sent a moment before must not be taken for it. */
export const SIGN_IN_SUBJECT = /^Your sign-in link$/;

/**
 * Signs a homeowner in by the e-mailed link, read from the test mailbox. `from` is the page that
 * asks for the link (a portal page sends the homeowner back to itself afterwards).
 */
export async function signInHomeowner(page: Page, email: string, { from = '/sign-in' }: { from?: string } = {}): Promise<void> {
  await page.goto(from);
  const asked = Date.now();
  await page.getByLabel('E-mail address').fill(email);
  await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
  const mail = await latestMail(email, { after: asked - 1000, subject: SIGN_IN_SUBJECT });
  const link = mail.links.find((l) => l.includes('/sign-in/confirm?token='));
  expect(link, 'the e-mail carries a sign-in link').toBeTruthy();
  await page.goto(link!);
  await page.getByRole('button', { name: 'Sign me in' }).click();
  await expect(page).toHaveURL(/\/portal/);
}
