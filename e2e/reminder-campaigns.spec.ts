import { expect, test, type Page } from '@playwright/test';
import { DEMO, MAILBOX_URL, latestMail } from './support/env';

async function signInOffice(page: Page) {
  await page.goto('/staff/sign-in');
  await page.getByLabel('E-mail address').fill(DEMO.office);
  await page.getByLabel('Password').fill(DEMO.staffPassword);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
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

// In the demo's December every plan member already had the fall heating tune-up, so the journey
// sends the coming season's cooling tune-up; the heating campaign is the same path.
test('the office sends a seasonal tune-up campaign; one homeowner books from it, another unsubscribes and gets no more', async ({ page, browser }) => {
  // Three campaigns and a booking: more than one journey's usual time.
  test.setTimeout(240_000);
  await signInOffice(page);
  const started = Date.now();
  const count = await sendToPlanMembers(page, /Spring cooling tune-up/);
  expect(count).toBeGreaterThan(1);

  // Two plan members' messages, from the test mailbox.
  const res = await fetch(`${MAILBOX_URL}/api/messages`);
  const list = (await res.json()) as { id: string; to: string[]; subject: string; receivedAt: string }[];
  const tuneUps = list.filter((m) => m.subject === 'Time to book your spring cooling tune-up' && new Date(m.receivedAt).getTime() > started - 1000);
  expect(tuneUps.length).toBeGreaterThan(1);
  const booker = tuneUps.find((m) => m.to.includes(DEMO.homeownerB)) ?? tuneUps[0]!;

  // The homeowner signs in and follows the message's button: the stepper opens on a tune-up at their home.
  const mail = await latestMail(booker.to[0]!, { after: started - 1000 });
  const link = mail.links.find((l) => /\/portal\/booking\?kind=tune_up&property=[0-9a-f-]{36}$/.test(l))!;
  expect(link).toBeTruthy();
  const home = await (await browser.newContext()).newPage();
  await home.goto('/portal/booking');
  const asked = Date.now();
  await home.getByLabel('E-mail address').fill(booker.to[0]!);
  await home.getByRole('button', { name: 'Send me a sign-in link' }).click();
  const signIn = await latestMail(booker.to[0]!, { after: asked - 1000 });
  await home.goto(signIn.links.find((l) => l.includes('/sign-in/confirm?token='))!);
  await home.getByRole('button', { name: 'Sign me in' }).click();
  await expect(home).toHaveURL(/\/portal/);
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
  await expect(home.getByRole('heading', { name: 'Visit requested' })).toBeVisible();

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
});
