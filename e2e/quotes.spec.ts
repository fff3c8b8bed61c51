import { expect, test, type Page } from '@playwright/test';
import { DEMO, latestMail } from './support/env';
import { signInHomeowner, signInStaff } from './support/sign-in';

// The demo's no-cooling call: a member's indoor blower motor has failed, and the technician's
// truck carries a motor that fits and the run capacitor its horsepower tap needs (server/db/seed).
const SEED = {
  // Today's 13:00–15:00 no-cooling service call, Marcus Bellweather's second stop.
  visitLink: /No cooling.*Oduya household/,
  homeowner: DEMO.homeownerB,
  homeownerName: 'Sam Oduya',
  plan: /Covered: /,
  // The failed motor's nameplate: the demo's MTR-BLW-050-115-4S is 1/2 hp, 115 V, 1 ph, 1075 RPM,
  // 4-speed, reversible, 7.0 A; the failed one reads 7.2 A.
  nameplate: { Horsepower: '1/2', 'Nameplate volts': '115', RPM: '1075', Speeds: '4', 'Speeds used': '2', 'Rated amps': '7.2' },
  motor: 'Indoor blower motor 1/2 hp 115 V 1075 RPM 4-speed',
  // CAP-10-370-R, the 10 µF run capacitor the 1/2 hp tap needs.
  capacitor: 'Run capacitor 10 µF 370 V round',
};

/** On hand of each part on the technician's truck, by name. */
async function truckCounts(page: Page): Promise<Map<string, number>> {
  await page.goto('/field/truck');
  const list = page.getByRole('list', { name: 'Stock on your truck' });
  await expect(list.getByRole('listitem').first()).toBeVisible();
  const counts = new Map<string, number>();
  for (const li of await list.getByRole('listitem').all()) {
    const name = (await li.locator('strong').textContent())!.trim();
    const text = (await li.textContent())!;
    counts.set(name, Number(/(\d+) on hand/.exec(text)![1]));
  }
  return counts;
}

test('a technician finds the replacement motor on the truck, quotes two options, the homeowner approves one, and the invoice and stock follow', async ({ page, browser }) => {
  test.setTimeout(180_000);
  // Phone-sized, as on site.
  await page.setViewportSize({ width: 390, height: 844 });
  await signInStaff(page, DEMO.technician);
  await expect(page).toHaveURL(/\/field$/);
  const before = await truckCounts(page);

  await page.goto('/field');
  await page.getByRole('link', { name: SEED.visitLink }).click();

  // 1. The plan's coverage, at the top of the visit.
  await expect(page.getByRole('heading', { name: SEED.plan })).toBeVisible();
  await expect(page.getByText('Repair discount')).toBeVisible();

  // 2. The failed motor's nameplate finds a motor on this truck, with the capacitor its tap needs.
  const nameplate = page.getByRole('form', { name: 'Failed motor nameplate' });
  for (const [label, value] of Object.entries(SEED.nameplate)) await nameplate.getByLabel(label, { exact: true }).fill(value);
  await nameplate.getByRole('button', { name: 'Find motors that fit' }).click();
  const fits = page.getByRole('list', { name: 'Parts that fit' });
  const first = fits.getByRole('listitem').filter({ hasText: SEED.motor }).first();
  await expect(first.locator('.fit-head').getByText(/On your truck/)).toBeVisible();
  await expect(first.getByText(/Run capacitor for this tap: [\d.]+ µF/)).toBeVisible();
  const motorName = (await first.locator('.fit-head strong').textContent())!.trim();
  expect(motorName).toBe(SEED.motor);

  // 3. Option one: the motor alone. Option two: the motor and its capacitor.
  await page.getByLabel('Option name').fill('Replace the blower motor');
  await first.getByRole('button', { name: `Add ${motorName}`, exact: true }).click();
  await expect(page.getByRole('list', { name: 'Lines of Replace the blower motor' }).getByText(motorName)).toBeVisible();
  await expect(page.getByRole('tab', { name: /Replace the blower motor · \$/ })).toBeVisible();

  await page.getByRole('button', { name: 'Add an option' }).click();
  await page.getByLabel('Option name').fill('Replace the motor and the capacitor');
  await page.getByLabel('Add to').click();
  await page.getByRole('option', { name: 'Replace the motor and the capacitor' }).click();
  const withCap = first.getByRole('button', { name: new RegExp(`^Add ${motorName} with `) }).first();
  const capName = (await withCap.getAttribute('aria-label'))!.replace(`Add ${motorName} with `, '');
  expect(capName).toBe(SEED.capacitor);
  await withCap.click();
  const second = page.getByRole('tabpanel', { name: 'Replace the motor and the capacitor' });
  await expect(second.getByRole('list', { name: /Lines of/ }).getByText(capName)).toBeVisible();
  // The coverage, line by line, with the plan's repair discount on the parts.
  await expect(second.getByText(/Repair discount \d+ %: −\$/).first()).toBeVisible();
  await expect(page.getByRole('tab', { name: /Replace the motor and the capacitor · \$/ })).toBeVisible();

  await page.getByLabel('Note to the homeowner').fill('The blower motor has failed. Its capacitor is weak too; replacing both now saves a second visit.');
  const sentAt = Date.now();
  await page.getByRole('button', { name: 'Send to the homeowner' }).click();
  await expect(page.getByText(/Quote sent to /)).toBeVisible();
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow, 'no sideways scrolling on a phone').toBeLessThanOrEqual(0);

  // 4. The homeowner opens the e-mailed link and approves the second option.
  const quoteMail = await latestMail(SEED.homeowner, { after: sentAt - 1000 });
  const quoteLink = quoteMail.links.find((l) => /\/portal\/quotes\/[0-9a-f-]{36}$/.test(l));
  expect(quoteLink, 'the e-mail links to the quote').toBeTruthy();

  const home = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const hp = await home.newPage();
  await signInHomeowner(hp, SEED.homeowner);

  await hp.goto(new URL(quoteLink!).pathname);
  await expect(hp.getByRole('heading', { name: /^Quote .*Oduya household/ })).toBeVisible();
  await expect(hp).toHaveTitle(/Quote .*Oduya household/);
  const chosen = hp.getByRole('region', { name: /Replace the motor and the capacitor/ });
  await expect(chosen.getByText(/Repair discount \d+ %/).first()).toBeVisible();
  await hp.getByRole('radio', { name: /Replace the motor and the capacitor/ }).check();
  await hp.getByLabel('Type your full name').fill(SEED.homeownerName);
  await hp.getByRole('checkbox', { name: 'I approve this work and its price.' }).check();
  await hp.getByRole('button', { name: /^Approve Replace the motor and the capacitor/ }).click();
  await expect(hp.getByText(/You approved “Replace the motor and the capacitor”/)).toBeVisible();

  // 5. The invoice shows the plan's discount on its lines.
  await hp.getByRole('link', { name: 'See the invoice and pay online' }).click();
  await expect(hp.getByRole('heading', { name: /^Invoice / })).toBeVisible();
  const lines = hp.getByRole('table');
  await expect(lines.getByRole('cell', { name: new RegExp(motorName) })).toContainText(/Plan discount −\$/);
  await expect(lines.getByRole('cell', { name: new RegExp(capName) })).toContainText(/Plan discount −\$/);
  await home.close();

  // The truck carries one motor and one capacitor fewer.
  const after = await truckCounts(page);
  expect(after.get(motorName)).toBe(before.get(motorName)! - 1);
  expect(after.get(capName)).toBe(before.get(capName)! - 1);
  const short = (await page.getByRole('list', { name: 'Stock on your truck' }).getByRole('listitem').filter({ hasText: /short/ }).locator('strong').allTextContents()).map((t) =>
    t.trim(),
  );

  // The office's restock list shows what fell below its minimum on the truck.
  const office = await browser.newContext();
  const op = await office.newPage();
  await signInStaff(op, DEMO.office);
  await op.goto('/office/stock');
  const restock = op.getByRole('table', { name: 'Restock list' });
  await expect(restock).toBeVisible();
  const fellShort = [motorName, capName].filter((n) => short.includes(n));
  expect(fellShort.length, 'the demo truck carries the motor at its minimum, so using one puts it on the restock list').toBeGreaterThan(0);
  for (const name of fellShort) await expect(restock.getByRole('row').filter({ hasText: 'Truck 1' }).filter({ hasText: name })).toBeVisible();
  await office.close();
});
