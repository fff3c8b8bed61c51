import { expect, test, type Page } from '@playwright/test';
import { DEMO, latestMail } from './support/env';
import { SIGN_IN_SUBJECT } from './support/sign-in';

// Each role's first screen answers its first question with numbers that match the API. The run
// saves screenshots under e2e/screenshots/ (git-ignored) for review.
const SHOTS = 'e2e/screenshots';

async function signInStaff(page: Page, email: string) {
  await page.goto('/staff/sign-in');
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill(DEMO.staffPassword);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
}

test('the homeowner home shows the plan, the tune-ups left, the next visit and what is owed, at phone width', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const page = await context.newPage();
  await page.goto('/sign-in');
  const asked = Date.now();
  await page.getByLabel('E-mail address').fill(DEMO.homeownerA);
  await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
  const mail = await latestMail(DEMO.homeownerA, { after: asked - 1000, subject: SIGN_IN_SUBJECT });
  await page.goto(mail.links.find((l) => l.includes('/sign-in/confirm?token='))!);
  await page.getByRole('button', { name: 'Sign me in' }).click();
  await expect(page).toHaveURL(/\/portal$/);
  await expect(page.getByRole('heading', { name: 'Your home', level: 1 })).toBeVisible();

  const summary = (await (await page.request.get('/api/my-home/summary')).json()) as {
    agreements: { planName: string; lastDayLabel: string; left: number; included: number; canRenew: boolean }[];
    invoicesDue: { count: number };
    nextVisit: { dayLabel: string } | null;
  };
  const a = summary.agreements[0]!;
  const plan = page.getByRole('region', { name: 'Your plan' });
  await expect(plan).toContainText(a.planName);
  await expect(plan).toContainText(a.lastDayLabel);
  if (a.included) await expect(plan).toContainText(`${a.left} of ${a.included}`);
  // Dana's plan ends in 20 days (demo data): the renewal window is open.
  await expect(plan.getByRole('link', { name: 'Renew my plan' })).toBeVisible();
  if (summary.nextVisit) await expect(page.getByRole('region', { name: 'Next visit' })).toContainText(summary.nextVisit.dayLabel);
  const pay = page.getByRole('region', { name: 'Invoices to pay' });
  await expect(pay).toContainText(summary.invoicesDue.count ? `${summary.invoicesDue.count} invoice` : 'Nothing to pay');
  await expect(page.getByRole('region', { name: 'Your systems' }).getByRole('listitem').first()).toBeVisible();
  await expect(page.getByRole('link', { name: 'Request a visit' })).toBeVisible();
  // No sideways scrolling at 390 px (common practice for phone layouts; our design brief asks for 360).
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
  await page.screenshot({ path: `${SHOTS}/homeowner-home-390.png`, fullPage: true });
  await context.close();
});

test('the office home counts match the API and each opens its filtered table', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 900 });
  await signInStaff(page, DEMO.office);
  await expect(page).toHaveURL(/\/office$/);
  const home = (await (await page.request.get('/api/office-home')).json()) as {
    unassigned: number;
    renewalsDue30: { count: number };
    pastDue: { count: number };
    visitsToday: Record<string, number>;
  };
  const count = (title: string) => page.getByLabel(`${title}: `, { exact: false }).first();
  const today = Object.values(home.visitsToday).reduce((s, n) => s + n, 0);
  await expect(count("Today's visits")).toHaveText(String(today));
  await expect(count('Unassigned queue')).toHaveText(String(home.unassigned));
  await expect(count('Renewals due in 30 days')).toHaveText(String(home.renewalsDue30.count));
  await expect(count('Past-due agreements')).toHaveText(String(home.pastDue.count));
  await page.screenshot({ path: `${SHOTS}/office-home.png`, fullPage: true });

  await page.getByRole('link', { name: 'Follow them up' }).click();
  await expect(page).toHaveURL(/\/office\/renewals\?view=past_due$/);
  await expect(page.getByRole('button', { name: /Past due/, pressed: true })).toBeVisible();

  await page.goto('/office/reports?from=2025-12-01&to=2026-11-30');
  await expect(page.getByRole('heading', { name: 'Reports', level: 1 })).toBeVisible();
  for (const title of ['Agreements', 'Revenue', 'Visits', 'Technician utilisation']) {
    await expect(page.getByRole('img', { name: new RegExp(`^${title} chart`) })).toBeVisible();
  }
  await expect(page.getByRole('link', { name: 'Download CSV' }).first()).toHaveAttribute('href', '/api/reports/agreements/export.csv?from=2025-12-01&to=2026-11-30');
  const csv = await page.request.get('/api/reports/agreements/export.csv?from=2025-12-01&to=2026-11-30');
  expect((await csv.text()).split('\r\n')[0]).toBe('month,active,new,due,renewed,lapsed,renewal_rate');
  await page.screenshot({ path: `${SHOTS}/report-agreements.png`, fullPage: true });
});

test('the technician home starts with the first stop and a maps link', async ({ page }) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await signInStaff(page, DEMO.technician);
  await expect(page).toHaveURL(/\/field$/);
  const today = (await (await page.request.get('/api/field/visits/today')).json()) as { visits: { address: string; status: string }[] };
  const first = today.visits.find((v) => !['done', 'canceled', 'no_show'].includes(v.status));
  expect(first, 'the demo gives Marcus visits today').toBeTruthy();
  const stop = page.getByRole('region', { name: 'First stop' });
  await expect(stop).toContainText(first!.address);
  await expect(stop.getByRole('link', { name: 'Open in maps' })).toHaveAttribute('href', `geo:0,0?q=${encodeURIComponent(first!.address)}`);
});
