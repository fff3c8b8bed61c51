import { expect, test } from '@playwright/test';
import { DEMO } from './support/env';
import { accountMenuReturnsFocus, tabAndType, tabTo } from './support/keyboard';
import { signInHomeowner, signInStaff } from './support/sign-in';

// One keyboard-only journey per area: Tab, Shift+Tab, Enter and Space (Escape to close a menu),
// focus drawn at every stop (WCAG 2.1 SC 2.1.1 Keyboard, 2.4.7 Focus Visible), and a menu
// opened from the keyboard gives focus back to the button that opened it.

// Every stop is checked in the page, one Tab at a time.
test.beforeEach(() => test.setTimeout(300_000));

test('office: a new household from the keyboard alone', async ({ page }) => {
  await signInStaff(page, DEMO.office);
  await page.goto('/office/customers/new');
  await expect(page.getByRole('heading', { name: 'New household' })).toBeVisible();
  await accountMenuReturnsFocus(page);

  const name = `Keyboard ${Date.now().toString(36)} household`;
  await tabAndType(page, page.getByLabel('Household name'), name);
  await tabAndType(page, page.getByLabel('E-mail'), `kb.${Date.now().toString(36)}@example.test`);
  await tabAndType(page, page.getByLabel('Street address'), '415 Cattail Lane');
  await tabAndType(page, page.getByLabel('City'), 'Larkspur Bend');
  await tabAndType(page, page.getByLabel('ZIP code'), '64790');
  // Back up to the street and correct it.
  await tabAndType(page, page.getByLabel('Street address'), '417 Cattail Lane', { back: true });
  await tabTo(page, page.getByRole('button', { name: 'Save household' }));
  await page.keyboard.press('Enter');
  await expect(page.getByRole('heading', { name })).toBeVisible();
  await expect(page.getByText('417 Cattail Lane').first()).toBeVisible();
});

test('admin: the company settings saved from the keyboard alone', async ({ page }) => {
  await signInStaff(page, DEMO.owner);
  await page.goto('/admin/company');
  const company = page.getByLabel('Company name');
  await expect(company).not.toHaveValue('');
  const original = await company.inputValue();
  await accountMenuReturnsFocus(page);

  await tabAndType(page, company, `${original} `);
  await tabAndType(page, page.getByLabel('Diagnostic fee ($)'), '89');
  await tabAndType(page, company, original, { back: true });
  await tabTo(page, page.getByRole('button', { name: 'Save settings' }));
  await page.keyboard.press('Enter');
  await expect(page.getByText('Saved. New bookings use these hours and rules from now on.')).toBeVisible();
  await page.reload();
  await expect(page.getByLabel('Diagnostic fee ($)')).toHaveValue('89');
  await expect(page.getByLabel('Company name')).toHaveValue(original);
});

test('field: readings saved from the keyboard alone', async ({ page }) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await signInStaff(page, DEMO.technician);
  const res = await page.request.get('/api/field/visits/today');
  const { visits } = (await res.json()) as { visits: { id: string; customerName: string }[] };
  // Not the household the field journey records, so the two can run in one server.
  const visit = visits.find((v) => !/Whitfield/.test(v.customerName)) ?? visits[0]!;
  await page.goto(`/field/visits/${visit.id}`);
  await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
  await accountMenuReturnsFocus(page);

  await tabTo(page, page.getByRole('radiogroup', { name: 'Operating mode' }).getByRole('radio', { name: /Cooling/ }));
  await page.keyboard.press('Space');
  await tabAndType(page, page.getByLabel('Return air dry bulb'), '75');
  await tabAndType(page, page.getByLabel('Supply air dry bulb'), '56');
  await tabAndType(page, page.getByLabel('Return air wet bulb'), '61');
  await expect(page.getByRole('list', { name: 'Air temperatures results' }).getByText('Temperature split', { exact: true })).toBeVisible();
  await tabTo(page, page.getByRole('button', { name: 'Save readings' }));
  await page.keyboard.press('Enter');
  await expect(page.getByText(/Saved .*checked again by the office system/)).toBeVisible();
});

test('portal: a visit requested from the keyboard alone', async ({ page }) => {
  await signInHomeowner(page, DEMO.homeownerB);
  await page.goto('/portal/booking');
  await expect(page.getByRole('heading', { name: 'Request a visit' })).toBeVisible();
  await accountMenuReturnsFocus(page);
  // The step left behind folds away with an animation: each Next is looked up in its own step.
  const step = (name: string) => page.getByRole('region', { name, exact: true });

  await tabTo(page, page.getByRole('button', { name: 'No, none of these' }));
  await page.keyboard.press('Enter');
  const property = page.getByRole('radiogroup', { name: 'Property' }).getByRole('radio').first();
  await tabTo(page, property);
  await page.keyboard.press('Space');
  await expect(property).toBeChecked();
  await tabTo(page, step('Property').getByRole('button', { name: 'Next' }));
  await page.keyboard.press('Enter');

  const reason = page.getByRole('radiogroup', { name: 'Reason for the visit' }).getByRole('radio').first();
  await tabTo(page, reason);
  await page.keyboard.press('Space');
  await expect(reason).toBeChecked();
  await tabTo(page, step('Reason').getByRole('button', { name: 'Next' }));
  await page.keyboard.press('Enter');

  await tabAndType(page, page.getByLabel('Notes for the technician'), 'Gate code 2468.');
  await tabTo(page, step('What is happening').getByRole('button', { name: 'Next' }));
  await page.keyboard.press('Enter');

  const window = page.getByRole('radiogroup', { name: 'Arrival window' }).getByRole('radio').first();
  await tabTo(page, window);
  await page.keyboard.press('Space');
  await expect(window).toBeChecked();
  await tabTo(page, step('Arrival window').getByRole('button', { name: 'Next' }));
  await page.keyboard.press('Enter');

  await tabTo(page, page.getByRole('button', { name: 'Confirm visit' }));
  await page.keyboard.press('Enter');
  await expect(page.getByText('An e-mail with a calendar invitation is on its way.')).toBeVisible();
});
