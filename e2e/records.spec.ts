import { expect, test } from '@playwright/test';
import sharp from 'sharp';
import { signInStaff } from './support/sign-in';
import { DEMO, latestMail } from './support/env';

test('the office records a household, its home and a heat pump with a nameplate photo; the homeowner sees them in My home', async ({ page, browser }) => {
  const tag = Date.now().toString(36);
  const email = `linden.${tag}@example.test`;
  const household = `Linden ${tag} household`;

  await signInStaff(page, DEMO.office);
  await expect(page).toHaveURL(/\/office/);

  await page.getByRole('link', { name: 'Households' }).first().click();
  await expect(page.getByRole('heading', { name: 'Households' })).toBeVisible();
  await page.getByRole('link', { name: 'New household' }).click();

  // The shared schema refuses a bad ZIP before anything is sent.
  await page.getByLabel('Household name').fill(household);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Phone').fill('(816) 555-0188');
  await expect(page.getByText('Saved as +18165550188')).toBeVisible();
  await page.getByLabel('Street address').fill('1208 Redbud Terrace');
  await page.getByLabel('City').fill('Larkspur Bend');
  await page.getByLabel('ZIP code').fill('6479');
  await page.getByRole('button', { name: 'Save household' }).click();
  await expect(page.getByText('ZIP code has 5 digits, or ZIP+4 like 64790-1234.')).toBeVisible();
  await page.getByLabel('ZIP code').fill('64790');
  await page.getByRole('button', { name: 'Save household' }).click();

  await expect(page.getByRole('heading', { name: household })).toBeVisible();
  await page.getByRole('button', { name: 'Add equipment' }).click();
  await page.getByRole('combobox', { name: 'Kind of equipment' }).click();
  await page.getByRole('option', { name: 'Heat pump', exact: true }).click();
  await page.getByLabel('Make').fill('Ardenvale Air');
  await page.getByLabel('Model').fill('HP36-4');
  await page.getByLabel('Serial').fill(`AA${tag}`);
  await page.getByLabel('Install date').fill('2013-05-20');
  await page.getByLabel('Nominal capacity').fill('3');
  await page.getByLabel('Filter size').fill('20 x 25 x 1');
  await page.getByLabel('Warranty ends').fill('2023-05-20');
  await page.getByRole('button', { name: 'Save equipment' }).click();
  const equipment = page.getByRole('list', { name: 'Equipment at 1208 Redbud Terrace' });
  await expect(equipment.getByText('Heat pump')).toBeVisible();
  await expect(equipment.getByText('3 tons (36000 Btu/h)')).toBeVisible();
  await expect(equipment.getByText('Filter 20x25x1')).toBeVisible();
  // 12+ years of a typical 15 (ASHRAE median service life, from memory): flagged with an icon and words.
  await expect(equipment.getByText(/Nearing end of service life|Past typical service life/)).toBeVisible();

  // A nameplate photo taken on a phone: carries GPS that must not survive the upload.
  const photo = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#6d7f8c' } })
    .jpeg()
    .withExif({ IFD0: { Make: 'PhoneCam' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '39/1 5/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '94/1 34/1 0/1' } })
    .toBuffer();
  await equipment.getByLabel('Add nameplate photo').setInputFiles({ name: 'nameplate.jpg', mimeType: 'image/jpeg', buffer: photo });
  await expect(equipment.getByRole('status').filter({ hasText: 'Uploaded 1 file.' })).toBeVisible();
  await expect(page.getByRole('link', { name: 'Open photo: Nameplate photo (opens in a new tab)' })).toBeVisible();

  // Open the household's portal and sign in as the homeowner from the invitation e-mail.
  await page.goto('/office/invite');
  const asked = Date.now();
  await page.getByLabel('E-mail address').fill(email);
  await page.getByRole('button', { name: 'Send invitation' }).click();
  await expect(page.getByRole('status')).toContainText(`Invitation sent to ${email}`);
  const mail = await latestMail(email, { after: asked - 1000 });
  const link = mail.links.find((l) => l.includes('/sign-in/confirm?token='));
  expect(link, 'the invitation carries a sign-in link').toBeTruthy();

  const home = await browser.newPage({ viewport: { width: 360, height: 800 } });
  await home.goto(link!);
  await home.getByRole('button', { name: 'Sign me in' }).click();
  await expect(home).toHaveURL(/\/portal/);
  // On a phone the header's links fold into one labelled Menu.
  await home.getByRole('button', { name: 'Menu', exact: true }).click();
  await home.getByRole('menuitem', { name: 'My home' }).click();
  await expect(home.getByRole('heading', { name: 'My home', exact: true })).toBeVisible();
  await expect(home.getByRole('heading', { name: '1208 Redbud Terrace' })).toBeVisible();
  await expect(home.getByText('Heat pump', { exact: true })).toBeVisible();
  await expect(home.getByText('Ardenvale Air HP36-4')).toBeVisible();
  await expect(home.getByText('20x25x1')).toBeVisible();
  await expect(home.getByText('Warranty ended')).toBeVisible();
  await expect(home.getByText(/^\d+ years/).first()).toBeVisible();
  await expect(home.getByRole('link', { name: 'Open photo: Nameplate photo (opens in a new tab)' })).toBeVisible();
  // Readings appear after a visit; until then the chart says so.
  await expect(home.getByText(/No readings yet/)).toBeVisible();
  // Phone first: nothing scrolls sideways at 360 px.
  const overflow = await home.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow).toBeLessThanOrEqual(0);
  await home.close();
});
