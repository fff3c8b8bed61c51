import { reminderWording, type ReminderKind } from '../../shared/seasonal-reminders';
import type { AppDeps } from '../deps';
import type { CompanyRow } from '../company/company';
import type { OutgoingMail } from '../integrations/mail';
import { renderEmail } from '../integrations/mail-layout';
import { unsubscribeLinks } from '../mail/unsubscribe';

export interface CampaignRecipient {
  id: string;
  customerId: string;
  propertyId: string | null;
  email: string;
  name: string;
  kind: ReminderKind;
}

/** The stable key (and so the Message-ID) of one outbox row's message, whoever sends it. */
export const reminderMessageKey = (sendId: string) => `reminder-${sendId}`;

export const postalAddress = (c: Pick<CompanyRow, 'street' | 'city' | 'state' | 'zip'>) => `${c.street}, ${c.city}, ${c.state} ${c.zip}`;

/** The booking stepper on a tune-up for the household's home (the kind and the home already chosen). */
export function bookingLink(publicUrl: string, propertyId: string | null): string {
  const url = new URL('/portal/booking', publicUrl);
  url.searchParams.set('kind', 'tune_up');
  if (propertyId) url.searchParams.set('property', propertyId);
  return url.toString();
}

/**
 * One household's reminder, as sent: the company as sender, an honest subject, its postal address
 * and a signed one-click opt-out (15 U.S.C. § 7704(a); RFC 2369; RFC 8058).
 */
export function campaignMail(deps: Pick<AppDeps, 'config'>, company: CompanyRow, r: CampaignRecipient): OutgoingMail & { to: string } {
  const words = reminderWording(r.kind, company.name);
  const unsubscribe = unsubscribeLinks(deps, r.customerId, 'reminders', company.email);
  const greeting = r.name.trim() ? `Hello ${r.name.trim().split(/\s+/)[0]},` : 'Hello,';
  const { html, text } = renderEmail({
    title: words.subject,
    paragraphs: [greeting, ...words.paragraphs],
    action: { label: words.action, url: bookingLink(deps.config.publicUrl, r.propertyId) },
    footer: `${company.name} · ${postalAddress(company)}. You get this because your home is on one of our maintenance plans or its equipment record suggests it is due. Choose which reminders you get in the portal, or unsubscribe from reminders: ${unsubscribe.url}`,
  });
  return {
    to: r.email,
    fromName: company.name,
    subject: words.subject,
    text,
    html,
    idempotencyKey: reminderMessageKey(r.id),
    list: { unsubscribeUrl: unsubscribe.url, unsubscribeMailto: unsubscribe.mailto },
  };
}
