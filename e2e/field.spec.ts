import { expect, test } from '@playwright/test';
import sharp from 'sharp';
import { SIGN_IN_SUBJECT, signInStaff } from './support/sign-in';
import { DEMO, latestMail } from './support/env';

test('a technician records a tune-up with an out-of-range reading and completes it; the homeowner sees the summary and chart', async ({ page, browser }) => {
  // Phone-sized, as on site.
  await page.setViewportSize({ width: 390, height: 844 });
  await signInStaff(page, DEMO.technician);
  await expect(page).toHaveURL(/\/field$/);

  await expect(page.getByRole('heading', { name: "Today's visits" })).toBeVisible();
  await page.getByRole('link', { name: /Tune-up.*Whitfield household/ }).click();
  await expect(page.getByRole('heading', { name: /Tune-up · Whitfield household/ })).toBeVisible();

  // The household's agreement as it applies today.
  await expect(page.getByRole('heading', { name: /Covered: Priority Comfort/ })).toBeVisible();
  await expect(page.getByText('Repair discount')).toBeVisible();

  // Readings, checked as they are typed.
  await page.getByRole('radiogroup', { name: 'Operating mode' }).getByText('Cooling').click();
  await page.getByLabel('Return air dry bulb').fill('75');
  await page.getByLabel('Supply air dry bulb').fill('55');
  await page.getByLabel('Return air wet bulb').fill('61');
  const air = page.getByRole('list', { name: 'Air temperatures results' });
  await expect(air.getByText('Temperature split', { exact: true })).toBeVisible();
  await expect(air.getByText('In range')).toBeVisible();

  await expect(page.getByRole('note', { name: /Disconnect power and discharge capacitors/ })).toBeVisible();
  await page.getByLabel('Compressor capacitor rating').fill('7.5');
  await page.getByLabel('Compressor capacitor measured').fill('6.9');
  const electrical = page.getByRole('list', { name: 'Electrical results' });
  await expect(electrical.getByText('Out of range')).toBeVisible();
  await expect(page.getByRole('alert').filter({ hasText: '1 reading out of range.' })).toBeVisible();

  await page.getByRole('button', { name: 'Save readings' }).click();
  await expect(page.getByText(/Saved .*checked again by the office system/)).toBeVisible();

  // A photo of what was found, filed against the visit.
  const photo = await sharp({ create: { width: 80, height: 60, channels: 3, background: { r: 90, g: 110, b: 70 } } })
    .png()
    .toBuffer();
  await page.getByLabel('Caption').fill('Weak run capacitor');
  await page.getByLabel('Take or add photos').setInputFiles({ name: 'capacitor.png', mimeType: 'image/png', buffer: photo });
  await expect(page.getByText('1 photo added.')).toBeVisible();
  // The thumbnail's link says what it opens.
  await expect(page.getByRole('link', { name: 'Open photo: Weak run capacitor (opens in a new tab)' })).toBeVisible();

  // Only a visit the technician has started can be completed: on the way, then on site.
  await page.getByRole('button', { name: 'On my way' }).click();
  await expect(page.getByText('Status: On the way.')).toBeVisible();
  await page.getByRole('button', { name: 'Arrived on site' }).click();
  await expect(page.getByText('Status: On site.')).toBeVisible();

  const completedAt = Date.now();
  await page.getByLabel('Findings', { exact: true }).fill('Cleaned the condensate drain and tightened connections. Compressor run capacitor is weak.');
  await page.getByLabel('Recommendations', { exact: true }).fill('Replace the compressor run capacitor. Coil cleaning recommended.');
  await page.getByRole('button', { name: 'Complete visit' }).click();
  // Completing asks first: the unticked checklist items and why, and the homeowner's signature for the repair.
  const confirm = page.getByRole('dialog', { name: 'Complete this visit?' });
  await expect(confirm.getByRole('list', { name: /Not ticked on the checklist/ })).toBeVisible();
  await expect(confirm.getByRole('button', { name: 'Complete visit' })).toBeDisabled();
  await confirm.getByLabel('Why were these skipped?').fill('Homeowner asked us to skip the attic today.');
  await confirm.getByLabel('A repair was done on this visit').check();
  await expect(confirm.getByText('Ask the homeowner to sign for the repair.')).toBeVisible();
  const padArea = confirm.getByRole('img', { name: "Homeowner's signature for the repair" });
  await padArea.scrollIntoViewIfNeeded();
  const pad = (await padArea.boundingBox())!;
  await page.mouse.move(pad.x + 20, pad.y + pad.height / 2);
  await page.mouse.down();
  await page.mouse.move(pad.x + pad.width / 2, pad.y + 20, { steps: 8 });
  await page.mouse.move(pad.x + pad.width - 20, pad.y + pad.height - 20, { steps: 8 });
  await page.mouse.up();
  await confirm.getByRole('button', { name: 'Complete visit' }).click();
  await expect(page.getByText('Visit completed. The homeowner has been sent a summary.')).toBeVisible();
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow, 'no sideways scrolling on a phone').toBeLessThanOrEqual(0);

  // The plain-words summary reaches the homeowner.
  const summaryMail = await latestMail(DEMO.homeownerA, { after: completedAt - 1000, subject: /visit summary/i });
  expect(summaryMail.subject).toMatch(/tune-up visit summary/i);
  expect(summaryMail.text).toContain('Coil cleaning recommended.');
  const summaryLink = summaryMail.links.find((l) => /\/portal\/visits\/[0-9a-f-]{36}$/.test(l));
  expect(summaryLink, 'the e-mail links to the summary page').toBeTruthy();

  // The homeowner signs in with a link and opens the summary.
  const home = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const hp = await home.newPage();
  await hp.goto('/sign-in');
  const asked = Date.now();
  await hp.getByLabel('E-mail address').fill(DEMO.homeownerA);
  await hp.getByRole('button', { name: 'Send me a sign-in link' }).click();
  const signIn = await latestMail(DEMO.homeownerA, { after: asked - 500, subject: SIGN_IN_SUBJECT });
  const link = signIn.links.find((l) => l.includes('/sign-in/confirm?token='));
  await hp.goto(link!);
  await hp.getByRole('button', { name: 'Sign me in' }).click();
  await expect(hp).toHaveURL(/\/portal$/);

  await hp.goto(new URL(summaryLink!).pathname);
  await expect(hp.getByRole('heading', { name: 'Your tune-up visit' })).toBeVisible();
  await expect(hp.getByText('Replace the compressor run capacitor. Coil cleaning recommended.')).toBeVisible();
  await expect(hp.getByText(/Cooling check: the air leaving your system is 20 °F cooler than the air going in, in the normal range\./)).toBeVisible();
  await expect(hp.getByText(/capacitor that helps the compressor start and run is outside the normal range/)).toBeVisible();

  await expect(hp.getByRole('img', { name: 'Weak run capacitor' })).toBeVisible();

  await expect(hp.getByRole('heading', { name: 'Your system readings' })).toBeVisible();
  // Earlier tune-ups from the demo history come first; today's reading is the latest point.
  await expect(hp.getByRole('img', { name: /Temperature split over \d+ visits?; latest 20 °F/ })).toBeVisible();
  await expect(hp.getByRole('cell', { name: '16.9–22.9' }).last()).toBeVisible();
  await home.close();
});

test('readings typed on a no-cooling call survive a reload and a dropped signal until the server has them', async ({ page, context }) => {
  await page.setViewportSize({ width: 360, height: 740 });
  await signInStaff(page, DEMO.technician);
  await page.getByRole('link', { name: /No cooling.*Oduya household/ }).click();
  await expect(page.getByRole('heading', { name: 'No cooling: troubleshooting' })).toBeVisible();

  await page.getByRole('button', { name: 'On my way' }).click();
  await expect(page.getByText('Status: On the way.')).toBeVisible();

  // The structured record of the call.
  await page.getByRole('radiogroup', { name: 'Did a condensate overflow switch trip?' }).getByText('Yes').click();
  await page.getByLabel('Cause found').fill('Clogged condensate line tripped the overflow switch.');
  await page.getByRole('button', { name: 'Save troubleshooting' }).click();
  await expect(page.getByText('Troubleshooting saved.')).toBeVisible();

  await page.getByLabel('Control voltage R–C').fill('18');
  await expect(page.getByRole('list', { name: 'Electrical results' }).getByText('Out of range')).toBeVisible();

  // Not saved yet: a reload keeps it on the phone.
  await page.reload();
  await expect(page.getByText('Unsaved readings restored from this phone.')).toBeVisible();
  await expect(page.getByLabel('Control voltage R–C')).toHaveValue('18');

  // The signal drops mid-save: the readings stay on the phone and go when it is back.
  await context.setOffline(true);
  await page.getByRole('button', { name: 'Save readings' }).click();
  await expect(page.getByText(/No connection: the readings are kept on this phone/)).toBeVisible();
  await context.setOffline(false);
  await expect(page.getByText(/Saved .*checked again by the office system/)).toBeVisible();

  await page.reload();
  await expect(page.getByLabel('Control voltage R–C')).toHaveValue('18');
  await expect(page.getByText('Unsaved readings restored from this phone.')).toHaveCount(0);
  await expect(page.getByLabel('Cause found')).toHaveValue('Clogged condensate line tripped the overflow switch.');
});

test('a technician records a variable-speed tune-up at forced full capacity; the charge is judged only in test mode', async ({ page }) => {
  await page.setViewportSize({ width: 360, height: 740 });
  await signInStaff(page, DEMO.technician);
  await page.getByRole('link', { name: /Tune-up.*Calloway household/ }).click();
  await expect(page.getByRole('heading', { name: /Tune-up · Calloway household/ })).toBeVisible();

  // Choose the system outright: other journeys may have saved readings against another one of this home's systems.
  await page.locator('form.readings').getByRole('combobox', { name: 'System' }).selectOption({ label: 'Heat pump · VS36-1' });
  await page.getByRole('radiogroup', { name: 'Operating mode' }).getByText('Cooling').click();
  // The model's maximum comes from the equipment record; the percent is worked out from it.
  await expect(page.getByLabel('Model maximum frequency')).toHaveValue('110');
  await page.getByLabel('Compressor frequency').fill('44');
  await expect(page.getByText('Running at 40 % of full capacity (44 of 110 Hz).')).toBeVisible();

  await page.getByLabel('Refrigerant', { exact: true }).selectOption('R-410A');
  await page.getByLabel('Suction pressure').fill('118');
  await page.getByLabel('Suction line temperature').fill('50');
  const refrigerant = page.getByRole('list', { name: 'Refrigerant circuit results' });
  const superheat = refrigerant.getByRole('listitem').filter({ hasText: 'Superheat' });
  // Below full capacity: the readings show, the verdict waits for the test mode.
  await expect(page.getByRole('note').filter({ hasText: 'Put the system in its full-capacity test mode to judge the charge.' })).toBeVisible();
  await expect(superheat.getByText(/to judge the charge/)).toBeVisible();
  await expect(superheat.getByText('In range')).toHaveCount(0);

  await page.getByLabel('Forced to full capacity (test or charge mode)').check();
  await expect(page.getByText('Forced to full capacity (test mode): 100 %.')).toBeVisible();
  await expect(page.getByRole('note').filter({ hasText: 'Put the system in its full-capacity test mode' })).toHaveCount(0);
  // 118 psig R-410A is about 40 °F saturated; a 50 °F suction line is 10 °F of superheat.
  await expect(superheat.getByText('In range')).toBeVisible();
  await expect(superheat.getByText(/to judge the charge/)).toHaveCount(0);

  await page.getByRole('button', { name: 'Save readings' }).click();
  await expect(page.getByText(/Saved .*checked again by the office system/)).toBeVisible();
  await page.reload();
  await page.locator('form.readings').getByRole('combobox', { name: 'System' }).selectOption({ label: 'Heat pump · VS36-1' });
  await expect(page.getByLabel('Forced to full capacity (test or charge mode)')).toBeChecked();
  await expect(superheat.getByText('In range')).toBeVisible();
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow, 'no sideways scrolling on a phone').toBeLessThanOrEqual(0);
});
