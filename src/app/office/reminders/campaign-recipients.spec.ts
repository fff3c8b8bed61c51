import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { CampaignRecipientEntry, KeysetPage } from '../../../../shared/schemas/campaigns';
import { apiErrors } from '../../core/api-errors';
import { provideIcons } from '../../ui/icons';
import { CampaignRecipients } from './campaign-recipients';

const CAMPAIGN = '00000000-0000-4000-8000-0000000000c1';
const row = (n: number, status: CampaignRecipientEntry['status'], reply: string | null): CampaignRecipientEntry => ({
  sendId: `00000000-0000-4000-8000-00000000000${n}`,
  customerId: `00000000-0000-4000-8000-00000000010${n}`,
  name: `Household ${n}`,
  email: `home${n}@example.test`,
  status,
  reply,
  attempts: 1,
  sentAt: status === 'sent' ? '2026-12-02T15:00:00.000Z' : null,
});

function setup() {
  TestBed.configureTestingModule({ imports: [CampaignRecipients], providers: [provideHttpClient(withInterceptors([apiErrors])), provideHttpClientTesting(), provideIcons()] });
  const fixture = TestBed.createComponent(CampaignRecipients);
  fixture.componentRef.setInput('campaignId', CAMPAIGN);
  return { fixture, http: TestBed.inject(HttpTestingController), el: fixture.nativeElement as HTMLElement };
}

const settle = () => new Promise((r) => setTimeout(r, 0));

/** Requests stay open until the test answers them, so the page is rendered rather than waited on for stability. */
async function answer(s: ReturnType<typeof setup>, page: KeysetPage<CampaignRecipientEntry>, after?: string) {
  await settle();
  s.fixture.detectChanges();
  await settle();
  const req = s.http.expectOne((r) => r.url === `/api/reminders/campaigns/${CAMPAIGN}/recipients`);
  expect(req.request.params.get('after') ?? undefined).toBe(after);
  req.flush(page);
  await settle();
  s.fixture.detectChanges();
  await settle();
}

describe('CampaignRecipients', () => {
  it('shows each household with a status word and the server reply, and follows the cursor both ways', async () => {
    const s = setup();
    await answer(s, { items: [row(1, 'sent', '250 2.0.0 Ok: queued'), row(2, 'failed', '550 mailbox unavailable')], next: 'CURSOR1' });
    const text = s.el.textContent ?? '';
    expect(text).toContain('Sent');
    expect(text).toContain('250 2.0.0 Ok: queued');
    expect(text).toContain('Failed');
    expect(text).toContain('550 mailbox unavailable');
    const [previous, next] = [...s.el.querySelectorAll('nav button')] as HTMLButtonElement[];
    expect(previous!.disabled).toBe(true);
    next!.click();
    await answer(s, { items: [row(3, 'suppressed', 'Unsubscribed: not sent.')], next: null }, 'CURSOR1');
    expect(s.el.textContent).toContain('Unsubscribed');
    expect(s.el.textContent).toContain('Page 2');
    expect(next!.disabled).toBe(true);
    previous!.click();
    await answer(s, { items: [row(1, 'sent', '250 2.0.0 Ok: queued')], next: 'CURSOR1' });
    s.http.verify();
  });
});
