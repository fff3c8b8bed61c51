import { expect, test, type Browser, type Locator, type Page } from '@playwright/test';
import { DEMO, MAILBOX_URL, latestMail } from './support/env';
import { signInHomeowner, signInStaff } from './support/sign-in';

async function signIn(page: Page, email: string) {
  await signInStaff(page, email);
  await expect(page.getByRole('button', { name: 'Account menu' })).toBeVisible();
}

// One ZIP of the demo town, so the reminders journey's households in the other keep their own.
const ZIP = '64790';

/** Builds a campaign for plan members (or households without a plan) in ZIP, previews it, sends it and waits for 100 %. */
async function sendToPlanMembers(page: Page, kind: RegExp, plan = 'Plan members'): Promise<number> {
  await page.goto('/office/reminders');
  await page.getByRole('button', { name: kind }).click();
  await page.getByLabel('Plan').click();
  await page.getByRole('option', { name: plan, exact: true }).click();
  await page.getByLabel('ZIP code or town').fill(ZIP);
  const send = page.getByRole('button', { name: /^Send to \d+ households/ });
  await expect(send).toBeVisible();
  await page.getByRole('button', { name: 'Preview messages' }).click();
  await expect(page.getByRole('tab').first()).toBeVisible();
  await expect(page.getByTitle(/^E-mail to /).first()).toBeVisible();
  const count = Number((await send.innerText()).match(/\d+/)![0]);
  await send.click();
  await page.getByRole('button', { name: 'Send now' }).click();
  await expect(page.getByText('100 %')).toBeVisible({ timeout: 60_000 });
  return count;
}

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

/** The owner's season table: sets both months and returns the ones it replaced. */
async function setSeasons(page: Page, seasons: { cooling: string; heating: string }): Promise<{ cooling: string; heating: string }> {
  await page.goto('/admin/hours');
  const cooling = page.getByLabel('Cooling season starts');
  const heating = page.getByLabel('Heating season starts');
  await expect(page.getByRole('button', { name: 'Save settings' })).toBeEnabled();
  const chosen = (select: Locator) => select.evaluate((el: HTMLSelectElement) => el.options[el.selectedIndex]?.text.trim() ?? '', undefined, { timeout: 10_000 });
  const before = { cooling: await chosen(cooling), heating: await chosen(heating) };
  expect(MONTHS).toContain(before.heating);
  await cooling.selectOption({ label: seasons.cooling });
  await heating.selectOption({ label: seasons.heating });
  await page.getByRole('button', { name: 'Save settings' }).click();
  await expect(page.getByText('Saved. New bookings use these hours and rules from now on.')).toBeVisible();
  return before;
}

// The demo's plan members all had a tune-up 40 to 65 days ago, which is this heating season's from
// September to February. So that the journey runs on any date, the owner first has the heating
// season start next month (cooling six months later): then every plan member is due for the fall
// heating tune-up ahead, except those with one already booked. The table is put back at the end.
test('the office sends a fall heating tune-up campaign; one homeowner books from it, another unsubscribes and gets no more', async ({ page, browser }) => {
  // Three campaigns and a booking: more than one journey's usual time.
  test.setTimeout(240_000);
  const owner = await (await browser.newContext()).newPage();
  await signIn(owner, DEMO.owner);
  // The month in the company's zone (America/Chicago), as the server counts it.
  const month = Number(new Intl.DateTimeFormat('en-US', { timeZone: 'America/Chicago', month: 'numeric' }).format(new Date()));
  const original = await setSeasons(owner, { cooling: MONTHS[(month + 6) % 12]!, heating: MONTHS[month % 12]! });
  try {
    await heatingJourney(page, browser);
  } finally {
    await setSeasons(owner, original);
  }
});

async function heatingJourney(page: Page, browser: Browser) {
  await signIn(page, DEMO.office);
  const started = Date.now();
  const count = await sendToPlanMembers(page, /Fall heating tune-up/);
  expect(count).toBeGreaterThan(1);
  // The delivery log lists each household with the mail server's reply.
  const log = page.getByRole('table', { name: 'Households in this campaign' });
  await expect(log.getByText('Sent', { exact: true }).first()).toBeVisible();
  await expect(log.getByText(/^250 /).first()).toBeVisible();

  // Two plan members' messages, from the test mailbox.
  const res = await fetch(`${MAILBOX_URL}/api/messages`);
  const list = (await res.json()) as { id: string; to: string[]; subject: string; receivedAt: string }[];
  const tuneUps = list.filter((m) => m.subject === 'Time to book your fall heating tune-up' && new Date(m.receivedAt).getTime() > started - 1000);
  expect(tuneUps.length).toBeGreaterThan(1);
  const booker = tuneUps.find((m) => m.to.includes(DEMO.homeownerB)) ?? tuneUps[0]!;

  // The homeowner signs in and follows the message's button: the stepper opens on a tune-up at their home.
  const mail = await latestMail(booker.to[0]!, { after: started - 1000 });
  const link = mail.links.find((l) => /\/portal\/booking\?kind=tune_up&property=[0-9a-f-]{36}$/.test(l))!;
  expect(link).toBeTruthy();
  const home = await (await browser.newContext()).newPage();
  await signInHomeowner(home, booker.to[0]!, { from: '/portal/booking' });
  await home.goto(new URL(link).pathname + new URL(link).search);
  await home.getByRole('button', { name: 'No, none of these' }).click();
  const propertyId = new URL(link).searchParams.get('property')!;
  await expect(home.getByRole('radiogroup', { name: 'Property' }).locator(`input[value="${propertyId}"]`)).toBeChecked();
  await home.getByRole('region', { name: 'Property' }).getByRole('button', { name: 'Next' }).click();
  await expect(home.getByRole('radio', { name: /Tune-up/ })).toBeChecked();
  await home.getByRole('region', { name: 'Reason' }).getByRole('button', { name: 'Next' }).click();
  await home.getByRole('region', { name: 'What is happening' }).getByRole('button', { name: 'Next' }).click();
  const windows = home.getByRole('radiogroup', { name: 'Arrival window' });
  await windows.getByRole('radio').first().check();
  await home.getByRole('region', { name: 'Arrival window' }).getByRole('button', { name: 'Next' }).click();
  await home.getByRole('button', { name: 'Confirm visit' }).click();
  // A refusal shows as an alert: report its words rather than a missing heading.
  const done = home.getByRole('heading', { name: 'Visit requested' });
  await expect(done.or(home.getByRole('alert'))).toBeVisible();
  expect(await home.getByRole('alert').allTextContents(), 'the booking is not refused').toEqual([]);
  await expect(done).toBeVisible();

  // Households without a plan get a filter reminder; one of them opts out from its mail program.
  const filterSent = Date.now();
  await sendToPlanMembers(page, /Filter change/, 'No plan');
  const filterMails = ((await (await fetch(`${MAILBOX_URL}/api/messages`)).json()) as typeof list).filter(
    (m) => m.subject === 'A reminder to change your air filter' && new Date(m.receivedAt).getTime() > filterSent - 1000,
  );
  const leaver = filterMails[0]!;
  expect(leaver).toBeTruthy();

  // The one-click opt-out: no sign-in, no cookie.
  const full = (await (await fetch(`${MAILBOX_URL}/api/messages/${leaver.id}`)).json()) as { headers: Record<string, string> };
  const target = /<(https?:[^>]+)>/.exec(full.headers['list-unsubscribe'] ?? '')?.[1];
  expect(target).toBeTruthy();
  const unsubscribed = await fetch(target!, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: 'List-Unsubscribe=One-Click',
    redirect: 'manual',
  });
  expect(unsubscribed.status).toBe(200);

  // The next campaign counts them as unsubscribed and sends them nothing.
  const second = Date.now();
  await sendToPlanMembers(page, /Outdoor coil cleaning/, 'No plan');
  await expect(page.getByText(/[1-9]\d* unsubscribed/).first()).toBeVisible();
  await expect(latestMail(leaver.to[0]!, { after: second - 500, timeoutMs: 3000 })).rejects.toThrow(/no mail/);
  await page.getByLabel('Show').click();
  await page.getByRole('option', { name: 'Unsubscribed' }).click();
  await expect(page.getByRole('table', { name: 'Households in this campaign' }).getByText(leaver.to[0]!)).toBeVisible();
}
