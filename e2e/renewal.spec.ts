import { expect, test, type Page } from '@playwright/test';
import { DEMO, latestMail, STRIPE_URL } from './support/env';
import { signInHomeowner, signInStaff } from './support/sign-in';

// Dana's Priority Comfort agreement ends in 20 days (demo data): the renewal window is open.
test.describe.configure({ mode: 'serial' });

const nextYear = String((new Date().getFullYear() + 2) % 100).padStart(2, '0');

async function signInAsDana(page: Page) {
  await signInHomeowner(page, DEMO.homeownerA);
  await page.getByRole('link', { name: 'My plan' }).first().click();
  await expect(page).toHaveURL(/\/portal\/plan$/);
}

async function payOnHostedPage(page: Page, card: string) {
  await expect(page).toHaveURL(new RegExp(`^${STRIPE_URL.replace(/[.]/g, '\\.')}/checkout/cs_`));
  await page.getByLabel('Card number').fill(card);
  await page.getByLabel('Expiry (MM/YY)').fill(`12/${nextYear}`);
  await page.getByLabel('CVC').fill('123');
  await page.getByRole('button', { name: 'Pay' }).click();
}

const coveredThrough = (page: Page) => page.getByTestId('covered-through').first();

test('a declined card shows a clear message and leaves the agreement as it was', async ({ page }) => {
  await signInAsDana(page);
  await expect(page.getByText('Renewal due')).toBeVisible();
  const before = (await coveredThrough(page).textContent())!.trim();

  await page.getByRole('button', { name: 'Renew' }).click();
  // 4000 0000 0000 0002: Stripe's documented generic decline test card
  await payOnHostedPage(page, '4000 0000 0000 0002');
  await expect(page.getByRole('alert')).toContainText('Your card was declined.');
  await page.getByRole('link', { name: 'Cancel' }).click();

  await expect(page.getByRole('status')).toContainText('Nothing was charged and your agreement is unchanged');
  await expect(page.getByText('Renewal due')).toBeVisible();
  await expect(coveredThrough(page)).toHaveText(before);
});

test('renewing online with 4242 extends the agreement a year and e-mails the receipt', async ({ page }) => {
  await signInAsDana(page);
  const before = (await coveredThrough(page).textContent())!.trim();
  const year = Number(/(\d{4})$/.exec(before)![1]);
  const paidAt = Date.now();

  await page.getByRole('button', { name: 'Renew' }).click();
  // 4242 4242 4242 4242: Stripe's documented test card that succeeds
  await payOnHostedPage(page, '4242 4242 4242 4242');

  await expect(page).toHaveURL(/\/portal\/plan/);
  await expect(page.getByRole('status')).toContainText('Payment received');
  // A 12-month term: the last covered day moves to the same date next year (shared/renewals.ts termEnd).
  await expect(coveredThrough(page)).toHaveText(before.replace(String(year), String(year + 1)));
  await expect(page.getByText('Active', { exact: true })).toBeVisible();
  await expect(page.getByRole('button', { name: 'Renew' })).toHaveCount(0);

  const receipt = await latestMail(DEMO.homeownerA, { after: paidAt, subject: /^Receipt/ });
  expect(receipt.subject).toMatch(/^Receipt for invoice \d+/);
  expect(receipt.attachments.some((a) => a.contentType === 'application/pdf')).toBe(true);

  await page.getByRole('link', { name: 'Invoices' }).first().click();
  await expect(page.getByRole('link', { name: /Plan renewal/ })).toBeVisible();
});

test("after renewing early the current term stays in force: the technician sees today's visit covered, the office sees both terms", async ({ page, browser }) => {
  await signInAsDana(page);
  const through = (await coveredThrough(page).textContent())!.trim();
  // The term that was in force before renewing is still shown, ending a year before the new last day.
  const year = Number(/(\d{4})$/.exec(through)![1]);
  const currentLastDay = through.replace(String(year), String(year - 1));
  await expect(page.getByTestId('current-term').first()).toContainText(`to ${currentLastDay}`);

  const tech = await browser.newPage();
  await signInStaff(tech, DEMO.technician);
  await tech.getByRole('link', { name: /Tune-up.*Whitfield household/ }).click();
  await expect(tech.getByRole('heading', { name: /Covered: Priority Comfort/ })).toBeVisible();
  // The term in force is the current one; covered through the last paid day, the new term's.
  await expect(tech.getByText(`to ${currentLastDay} · Covered through ${through}`)).toBeVisible();
  await tech.close();

  const office = await browser.newPage();
  await signInStaff(office, DEMO.office);
  await expect(office).toHaveURL(/\/office$/);
  await office.goto('/office/customers');
  await office.getByLabel('Search households').fill('Whitfield');
  await office
    .getByRole('link', { name: /Whitfield/ })
    .first()
    .click();
  await expect(office).toHaveURL(/\/office\/customers\/[0-9a-f-]{36}$/);
  const terms = office.getByRole('table', { name: /Terms of the Priority Comfort agreement/ });
  await expect(terms.getByRole('row')).toHaveCount(3);
  await expect(terms.getByRole('row').nth(1)).toContainText(`to ${currentLastDay}`);
  await expect(terms.getByRole('row').nth(1)).toContainText('In force');
  await expect(terms.getByRole('row').nth(2)).toContainText(`to ${through}`);
  await expect(terms.getByRole('row').nth(2)).toContainText(/Invoice \d+, \$[\d,.]+ paid/);
  await office.close();
});
