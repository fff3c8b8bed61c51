import { expect, test, type Browser } from '@playwright/test';
import ICAL from 'ical.js';
import { SIGN_IN_SUBJECT, signInStaff } from './support/sign-in';
import { DEMO, MAILBOX_URL, latestMail } from './support/env';

// Sam Oduya's household holds a plan agreement in the demo data, so the portal offers priority windows.
const HOMEOWNER = DEMO.homeownerB;

async function calendarPart(mail: Awaited<ReturnType<typeof latestMail>>) {
  const part = mail.attachments.find((a) => a.contentType.startsWith('text/calendar'));
  expect(part, 'the e-mail carries a calendar invitation').toBeTruthy();
  const res = await fetch(`${MAILBOX_URL}/api/messages/${mail.id}/attachments/${part!.index}`);
  const text = await res.text();
  const cal = new ICAL.Component(ICAL.parse(text));
  for (const z of cal.getAllSubcomponents('vtimezone')) ICAL.TimezoneService.register(z);
  return { text, cal, event: new ICAL.Event(cal.getFirstSubcomponent('vevent')!) };
}

async function officePage(browser: Browser) {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signInStaff(page, DEMO.office);
  await expect(page.getByRole('button', { name: 'Account menu' })).toBeVisible();
  return page;
}

test('a plan member books a no-cooling visit, the office assigns it, and the homeowner hears both', async ({ page, browser }) => {
  await page.goto('/portal/booking');
  const asked = Date.now();
  await page.getByLabel('E-mail address').fill(HOMEOWNER);
  await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
  const signInMail = await latestMail(HOMEOWNER, { after: asked - 1000, subject: SIGN_IN_SUBJECT });
  const link = signInMail.links.find((l) => l.includes('/sign-in/confirm?token='));
  await page.goto(link!);
  await page.getByRole('button', { name: 'Sign me in' }).click();
  await expect(page).toHaveURL(/\/portal/);
  await page.getByRole('link', { name: 'Book a visit' }).first().click();
  await expect(page).toHaveURL(/\/portal\/booking$/);

  // The emergency message comes before any booking step.
  await expect(page.getByRole('heading', { name: 'Is this an emergency?' })).toBeVisible();
  await expect(page.getByText('I smell gas (rotten eggs)')).toBeVisible();
  await page.getByRole('button', { name: 'Yes, one of these' }).click();
  await expect(page.getByRole('alert')).toContainText('Leave the building now');
  await page.getByRole('button', { name: 'No, none of these' }).click();

  await expect(page.getByRole('radiogroup', { name: 'Property' })).toBeVisible();
  await expect(page.getByText(/Plan member:/)).toBeVisible();
  await page.getByRole('region', { name: 'Property' }).getByRole('button', { name: 'Next' }).click();

  // Next with no reason chosen says what is missing.
  await page.getByRole('region', { name: 'Reason' }).getByRole('button', { name: 'Next' }).click();
  await expect(page.getByRole('alert').filter({ hasText: 'Choose what the visit is for' })).toBeVisible();
  await page.getByRole('radio', { name: /No cooling/ }).check();
  await expect(page.getByText('Choose what the visit is for')).toHaveCount(0);
  await page.getByRole('region', { name: 'Reason' }).getByRole('button', { name: 'Next' }).click();

  await page.getByRole('checkbox', { name: 'Fan runs but air is warm' }).check();
  await page.getByLabel('Notes for the technician').fill('House is at 84 °F; outdoor fan spins, air inside is not cold.');
  await page.getByRole('region', { name: 'What is happening' }).getByRole('button', { name: 'Next' }).click();

  const windows = page.getByRole('radiogroup', { name: 'Arrival window' });
  await expect(windows.getByRole('radio').first()).toBeVisible();
  const promise = page.getByText(/Your plan promises a visit within \d+ hours/);
  await expect(promise).toBeVisible();
  // The note promises marked windows only when some are marked; otherwise it gives the number to call.
  if (/marked Priority/.test(await promise.innerText())) await expect(windows.getByRole('radio', { name: /, priority$/ }).first()).toBeVisible();
  else await expect(promise.getByRole('link', { name: /^\(\d{3}\) \d{3}-\d{4}$/ })).toHaveAttribute('href', /^tel:\+1/);
  await windows.getByRole('radio').first().check();
  await page.getByRole('region', { name: 'Arrival window' }).getByRole('button', { name: 'Next' }).click();

  const confirmed = Date.now();
  await page.getByRole('button', { name: 'Confirm visit' }).click();
  await expect(page.getByRole('heading', { name: 'Visit requested' })).toBeVisible();
  await expect(page).toHaveTitle('Visit requested · Seasonwell');
  await expect(page.getByText(/the office has not yet confirmed this window or assigned a technician/)).toBeVisible();
  // The real cut-off for this visit, and the office's number as a tap-to-call link.
  await expect(page.getByText(/You can change this visit online until \w{3} \d{1,2} \w{3}, \d{1,2}:\d{2} [AP]M\.|Changes to this visit are by phone:/)).toBeVisible();
  await expect(page.locator('.change-notice a[href^="tel:"]')).toBeVisible();

  const booking = await latestMail(HOMEOWNER, { after: confirmed - 1000, subject: /visit request/ });
  expect(booking.subject).toBe('We have your visit request');
  const first = await calendarPart(booking);
  expect(first.cal.getFirstPropertyValue('method')).toBe('REQUEST'); // RFC 5546 §3.2.2
  expect(first.event.startDate.zone.tzid).toBe('America/Chicago');
  expect(first.event.sequence).toBe(0);
  const visitDate = first.event.startDate.toString().slice(0, 10);

  // The office finds it in the queue for that day and assigns the technician it is held for.
  const office = await officePage(browser);
  await office.goto('/office/dispatch');
  await office.getByLabel('Date').fill(visitDate);
  const queue = office.getByRole('region', { name: /Unassigned and to confirm/ });
  const card = queue.getByRole('article', { name: 'No cooling for Oduya household' });
  await expect(card).toBeVisible();
  const held = ((await card.getByText(/^Held for /).textContent()) ?? '').replace('Held for ', '').trim();
  expect(held).not.toBe('');
  await card.getByRole('button', { name: 'Actions for Oduya household' }).click();
  const assigned = Date.now();
  await office.getByRole('menuitem', { name: `Assign to ${held}` }).click();
  await expect(office.getByText(`Assigned to ${held}.`)).toBeVisible();
  await expect(office.getByRole('region', { name: held }).getByRole('article', { name: 'No cooling for Oduya household' })).toBeVisible();
  // The next look at the board (a reload, another office screen) reads the board the server keeps:
  // the visit is still assigned, and no longer waits in the queue.
  await office.reload();
  await office.getByLabel('Date').fill(visitDate);
  await expect(office.getByRole('region', { name: held }).getByRole('article', { name: 'No cooling for Oduya household' })).toBeVisible();
  await expect(queue.getByRole('article', { name: 'No cooling for Oduya household' })).toHaveCount(0);

  const update = await latestMail(HOMEOWNER, { after: assigned - 1000, subject: /scheduled/ });
  expect(update.subject).toBe('Your visit is scheduled');
  expect(update.text).toContain(held);
  const second = await calendarPart(update);
  expect(second.event.uid).toBe(first.event.uid); // RFC 5545: same UID updates the same event
  expect(second.event.sequence).toBe(1); // RFC 5546 §2.1.4: SEQUENCE rises with each revision

  // The homeowner's page now names the technician.
  await page.getByRole('link', { name: 'See your visit' }).click();
  await expect(page.getByText(held)).toBeVisible();
});
