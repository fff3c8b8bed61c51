import { mkdirSync } from 'node:fs';
import { expect, test, type Browser, type Page } from '@playwright/test';
import { DEMO, latestMail } from './support/env';
import { SIGN_IN_SUBJECT } from './support/sign-in';
import { CLS_GOOD, readVitals, watchVitals } from './support/vitals';

// Pages served by the compiled server hold still while their data arrives: CLS under web.dev's
// "good" threshold of 0.1 (web.dev, "Cumulative Layout Shift"). Headers fit one row with words
// on every menu item (our design brief). Screenshots land in e2e/screenshots/ (not in git).
const PHONE = { width: 390, height: 844 };
const DESK = { width: 1366, height: 768 };
const SHOTS = 'e2e/screenshots';

async function staff(browser: Browser, email: string, viewport = DESK): Promise<Page> {
  const page = await (await browser.newContext({ viewport })).newPage();
  await page.goto('/staff/sign-in');
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill(DEMO.staffPassword);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await expect(page.getByRole('button', { name: 'Account menu' })).toBeVisible();
  return page;
}

async function homeowner(browser: Browser, email: string, viewport = PHONE): Promise<Page> {
  const page = await (await browser.newContext({ viewport })).newPage();
  await page.goto('/sign-in');
  const asked = Date.now();
  await page.getByLabel('E-mail address').fill(email);
  await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
  const mail = await latestMail(email, { after: asked - 1000, subject: SIGN_IN_SUBJECT });
  await page.goto(mail.links.find((l) => l.includes('/sign-in/confirm?token='))!);
  await page.getByRole('button', { name: 'Sign me in' }).click();
  await expect(page).toHaveURL(/\/portal/);
  return page;
}

/** Opens `path` as a fresh page load, waits for `ready` and for the network to settle, and reads CLS. */
async function clsOf(page: Page, path: string, ready: (p: Page) => Promise<void>) {
  await watchVitals(page);
  await page.goto(path);
  await ready(page);
  await page.waitForLoadState('networkidle');
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
  const vitals = await readVitals(page);
  test.info().annotations.push({ type: 'vitals', description: `${path}: CLS ${vitals.cls.toFixed(3)}, LCP ${vitals.lcpMs === null ? '—' : Math.round(vitals.lcpMs)} ms` });
  return vitals;
}

/** The header holds one row: every visible item sits on the same line, and the bar is one item tall. */
async function headerRows(page: Page) {
  return page.getByRole('banner').evaluate((bar) => {
    const items = [...bar.querySelectorAll<HTMLElement>(':scope > *')].filter((el) => el.offsetWidth > 0 && el.offsetHeight > 0 && getComputedStyle(el).position !== 'absolute');
    const tops = items.map((el) => Math.round(el.getBoundingClientRect().top + el.getBoundingClientRect().height / 2));
    const tallest = Math.max(...items.map((el) => el.getBoundingClientRect().height));
    return { spread: Math.max(...tops) - Math.min(...tops), height: bar.getBoundingClientRect().height, tallest, overflow: bar.scrollWidth - bar.clientWidth };
  });
}

async function expectOneRow(page: Page) {
  const rows = await headerRows(page);
  expect.soft(rows.spread, 'every header item on one line').toBeLessThanOrEqual(4);
  // One row: the bar is its tallest item plus its own padding (8 px above and below), never two rows.
  expect.soft(rows.height).toBeLessThan(rows.tallest * 2);
  // Nothing runs past the edge (the account name stays whole).
  expect.soft(rows.overflow, 'header content past the right edge, px').toBeLessThanOrEqual(0);
}

test("the homeowner's header is one row at 390 px with a labelled menu; My home and a visit summary hold still", async ({ browser }) => {
  mkdirSync(SHOTS, { recursive: true });
  const page = await homeowner(browser, DEMO.homeownerA);
  await expectOneRow(page);
  await page.getByRole('banner').screenshot({ path: `${SHOTS}/homeowner-header-390.png` });
  await page.getByRole('button', { name: 'Menu', exact: true }).click();
  for (const name of ['My home', 'My plan', 'Invoices', 'Book a visit']) await expect(page.getByRole('menuitem', { name })).toBeVisible();
  await page.keyboard.press('Escape');

  const home = await clsOf(page, '/portal/home', async (p) => {
    await expect(p.getByRole('heading', { name: 'Service history' })).toBeVisible();
    await expect(p.getByRole('list', { name: 'Past visits' }).getByRole('listitem').first()).toBeVisible();
  });
  expect.soft(home.cls, `My home layout shifts: ${JSON.stringify(home.shifts)}`).toBeLessThan(CLS_GOOD);

  const mine = (await (await page.request.get('/api/my-home')).json()) as { past: { id: string; status: string }[] };
  const done = mine.past.find((v) => v.status === 'done');
  expect(done, 'the demo household has a finished visit').toBeTruthy();
  const summary = await clsOf(page, `/portal/visits/${done!.id}`, async (p) => {
    await expect(p.getByRole('heading', { level: 1 })).toBeVisible();
  });
  expect.soft(summary.cls, `visit summary layout shifts: ${JSON.stringify(summary.shifts)}`).toBeLessThan(CLS_GOOD);
});

test("the technician's header is one row at 390 px with a labelled menu; a visit holds still while its parts load", async ({ browser }) => {
  mkdirSync(SHOTS, { recursive: true });
  const page = await staff(browser, DEMO.technician, PHONE);
  await expectOneRow(page);
  await page.getByRole('banner').screenshot({ path: `${SHOTS}/technician-header-390.png` });
  await page.getByRole('button', { name: 'Menu', exact: true }).click();
  for (const name of ['Today', 'My week']) await expect(page.getByRole('menuitem', { name })).toBeVisible();
  await page.keyboard.press('Escape');

  // The visit page draws its header first; the quote, checklist, readings and notes load once it is idle.
  const today = (await (await page.request.get('/api/field/visits/today')).json()) as { visits: { id: string }[] };
  expect(today.visits.length, 'the demo technician has visits today').toBeGreaterThan(0);
  for (const viewport of [PHONE, DESK]) {
    await page.setViewportSize(viewport);
    const visit = await clsOf(page, `/field/visits/${today.visits[0]!.id}`, async (p) => {
      await expect(p.getByRole('heading', { level: 1 })).toBeVisible();
      await expect(p.getByRole('heading', { name: /^Quote/ }).first()).toBeVisible();
      await expect(p.getByRole('heading', { name: 'Readings' })).toBeVisible();
      await expect(p.getByRole('heading', { name: 'Findings and recommendations' })).toBeVisible();
    });
    expect.soft(visit.cls, `visit page at ${viewport.width} px layout shifts: ${JSON.stringify(visit.shifts)}`).toBeLessThan(CLS_GOOD);
  }
});

test('the office header fits one row at 1280 and 1366 px, with its links in the bar and the account name whole', async ({ browser }) => {
  for (const width of [1280, 1366]) {
    const page = await staff(browser, DEMO.office, { width, height: 768 });
    await expectOneRow(page);
    // A laptop keeps the links themselves; the labelled Menu is for narrower screens.
    for (const name of ['Households', 'Dispatch', 'Reminders']) await expect(page.getByRole('banner').getByRole('link', { name })).toBeVisible();
    await page.getByRole('banner').screenshot({ path: `${SHOTS}/office-header-${width}.png` });
    await page.context().close();
  }
});

test("the owner's header is one row at 1366 px; the households table and the access log hold still", async ({ browser }) => {
  const page = await staff(browser, DEMO.owner, DESK);
  await expectOneRow(page);

  const households = await clsOf(page, '/office/customers', async (p) => {
    await expect(p.getByRole('heading', { name: 'Households' })).toBeVisible();
    await expect(p.getByRole('row').nth(5)).toBeVisible();
  });
  expect.soft(households.cls, `households layout shifts: ${JSON.stringify(households.shifts)}`).toBeLessThan(CLS_GOOD);

  const audit = await clsOf(page, '/admin/audit', async (p) => {
    await expect(p.getByRole('heading', { name: 'Access log' })).toBeVisible();
    await expect(p.getByRole('row').nth(1)).toBeVisible();
  });
  expect.soft(audit.cls, `access log layout shifts: ${JSON.stringify(audit.shifts)}`).toBeLessThan(CLS_GOOD);

  // The household page names the household in the tab, and keeps equipment kind and model apart.
  const found = (await (await page.request.get('/api/customers?q=Whitfield&pageSize=5')).json()) as { items: { id: string; name: string }[] };
  await page.goto(`/office/customers/${found.items.find((c) => c.name === 'Whitfield household')!.id}`);
  await expect(page.getByRole('heading', { level: 1, name: 'Whitfield household' })).toBeVisible();
  await expect(page).toHaveTitle('Whitfield household · Seasonwell');
  const kinds = await page.locator('.eq-head').allInnerTexts();
  expect(kinds.length).toBeGreaterThan(0);
  for (const k of kinds) expect(k, 'kind and model read apart').not.toMatch(/[a-z][A-Z]/);
  // Phone numbers read in the national format and call when tapped.
  const tel = page.getByRole('link', { name: /^\(\d{3}\) \d{3}-\d{4}$/ }).first();
  await expect(tel).toHaveAttribute('href', /^tel:\+1\d{10}$/);
  await expect(page.getByText(/\+1\d{10}/)).toHaveCount(0);

  // The two settings tiles open two pages.
  await page.goto('/admin');
  await page.getByRole('link', { name: 'Hours and booking rules' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Hours and booking rules' })).toBeVisible();
  await expect(page.getByRole('group', { name: 'Business hours' })).toBeVisible();
  await page.goto('/admin');
  await page.getByRole('link', { name: 'Company', exact: true }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Company details' })).toBeVisible();
  // The company's name shows whole in its field.
  const name = page.getByLabel('Company name');
  await expect(name).toHaveValue('Bluestem Comfort Heating & Air');
  const fits = await name.evaluate((el: HTMLInputElement) => el.scrollWidth <= el.clientWidth);
  expect(fits, 'the company name is not cut off').toBe(true);
});
