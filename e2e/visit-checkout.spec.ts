import { expect, test } from '@playwright/test';
import { signInStaff } from './support/sign-in';
import { DEMO, STRIPE_URL } from './support/env';

// Today's 15:00 tune-up of the demo technician (server/db/seed/seed.ts): the other journeys record
// readings there but neither quote nor complete it.
const VISIT = /Tune-up.*Calloway household/;
// MTR-BLW-MHP-230-4S: in the demo shop's stock and on no truck (server/db/seed/pricebook.ts).
const SHOP_MOTOR = 'Indoor blower motor 1/3–3/4 hp 208-230 V 1075 RPM 4-speed';
const nextYear = String((new Date().getUTCFullYear() + 2) % 100).padStart(2, '0');

test('approved on the technician’s phone, paid on it through the payment page, and the part to order shows under parts to load', async ({ page }) => {
  test.setTimeout(150_000);
  await page.setViewportSize({ width: 390, height: 844 });
  await signInStaff(page, DEMO.technician);
  await expect(page).toHaveURL(/\/field$/);
  await expect(page.getByRole('region', { name: 'Parts to load' })).toBeVisible();
  await expect(page.getByRole('list', { name: 'Parts to load' }).getByText(SHOP_MOTOR)).toHaveCount(0);

  await page.getByRole('link', { name: VISIT }).click();
  await expect(page).toHaveURL(/\/field\/visits\/[0-9a-f-]{36}$/);
  const visitUrl = page.url();

  // A one-option quote with a motor from the price book: the shop has it, this truck does not.
  const quote = page.getByRole('region', { name: /^Quote/ });
  // The household's heat pump, whose parts warranty runs for years yet (server/db/seed/seed.ts).
  await quote.getByLabel('System').click();
  await page
    .getByRole('listbox', { name: 'System' })
    .getByRole('option', { name: /^Heat pump/ })
    .click();
  await quote.getByLabel('Option name').fill('Replace the blower motor');
  await quote.getByLabel('Search the price book').first().fill('MHP-230-4S');
  await quote
    .getByRole('button', { name: `Add ${SHOP_MOTOR}`, exact: true })
    .first()
    .click();
  await expect(quote.getByRole('list', { name: 'Lines of Replace the blower motor' }).getByText(SHOP_MOTOR)).toBeVisible();
  // The system is under its parts warranty, so the motor itself is free; the labor is charged.
  await quote.getByLabel('Search the price book').first().fill('LAB-REPAIR-MOTOR');
  await quote.getByRole('button', { name: 'Add Labor to replace a blower motor', exact: true }).first().click();
  // LAB-REPAIR-MOTOR is $185.00 (server/db/seed/pricebook.ts); the household has no agreement.
  await expect(quote.getByRole('tab', { name: 'Replace the blower motor · $185.00' })).toBeVisible();
  await quote.getByRole('button', { name: 'Send to the homeowner' }).click();
  await expect(page.getByText(/Quote sent to /)).toBeVisible();

  // The homeowner approves on this phone.
  await quote.getByRole('radio', { name: /Replace the blower motor/ }).check();
  await quote.getByLabel('Type your full name').fill('Avery Homeowner');
  await quote.getByRole('checkbox', { name: 'I approve this work and its price.' }).check();
  await quote.getByRole('button', { name: /^Approve Replace the blower motor/ }).click();
  await expect(quote.getByText(/Approved by Avery Homeowner on this phone/)).toBeVisible();

  // Pay now on this device: the processor's page, then back to the visit, which shows it paid.
  const payment = page.getByRole('region', { name: 'Payment' });
  await payment.getByRole('button', { name: 'Pay now on this device' }).click();
  await expect(page).toHaveURL(new RegExp(`^${STRIPE_URL.replace(/[.]/g, '\\.')}/checkout/cs_`));
  // 4242 4242 4242 4242: the processor's documented test card that succeeds.
  await page.getByLabel('Card number').fill('4242 4242 4242 4242');
  await page.getByLabel('Expiry (MM/YY)').fill(`12/${nextYear}`);
  await page.getByLabel('CVC').fill('123');
  await page.getByRole('button', { name: 'Pay' }).click();
  await expect(page).toHaveURL(visitUrl);
  await expect(page.getByText('Paid on this device. The receipt is on its way to the homeowner by e-mail.')).toBeVisible();
  await expect(payment.getByRole('listitem').filter({ hasText: 'Paid' })).toContainText('$185.00');
  await expect(payment.getByRole('button', { name: 'Pay now on this device' })).toHaveCount(0);

  // Home: the approved motor is not on the truck, and the shop has it.
  await page.goto('/field');
  const load = page.getByRole('list', { name: 'Parts to load' });
  const motor = load.getByRole('listitem').filter({ hasText: SHOP_MOTOR });
  await expect(motor).toBeVisible();
  await expect(motor).toContainText(/1 × /);
  await expect(motor).toContainText(/Load from .*Shop \(\d+\)/);
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow, 'no sideways scrolling on a phone').toBeLessThanOrEqual(0);
});
