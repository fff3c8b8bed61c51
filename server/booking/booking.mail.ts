import type { AppDeps } from '../deps';
import { canChangeOnline, changeCutoff, changeSentence, VISIT_REASON_LABELS, technicianToTell, VISIT_STATE_WORDS } from '../../shared/visits';
import { visitInvitation, visitUid } from '../integrations/calendar';
import type { MailAttachment } from '../integrations/mail';
import { renderEmail } from '../integrations/mail-layout';
import { queueMail, type MailToQueue, type OutboxDeps } from '../mail/outbox';
import type { CompanySettings } from './scheduling-input';
import { addressOf, labelFor, type VisitRow } from './visit-views';
import { formatPhone } from '../../shared/phone';
import { COMPANY_COUNTRY } from '../company/company';

export type VisitMailKind = 'confirmation' | 'assigned' | 'reschedule' | 'cancellation' | 'on_the_way' | 'reminder';

const SUBJECTS: Record<VisitMailKind, string> = {
  // Worded as the state the visit is in (VISIT_STATE_WORDS): a request is not yet confirmed.
  confirmation: 'We have your visit request',
  assigned: 'Your visit is scheduled',
  reschedule: 'Your visit has a new arrival window',
  cancellation: 'Your visit is canceled',
  on_the_way: 'Your technician is on the way',
  reminder: 'Reminder: your visit is tomorrow',
};

const EXPECT =
  'What to expect: the technician arrives within the window and calls if running late. Please clear a path to the indoor and outdoor units, put pets in another room, and have any error codes or thermostat readings handy.';

/** The same cut-off sentence as the confirmation page and the visit page, with where to change it. */
function howToChange(v: VisitRow, c: CompanySettings, link: string, now: Date): string {
  const online = canChangeOnline(v, c, now);
  const sentence = changeSentence(online, changeCutoff(v, c), formatPhone(c.phone, COMPANY_COUNTRY), c.timeZone);
  return online ? `${sentence} Reschedule or cancel at ${link}, or call ${formatPhone(c.phone, COMPANY_COUNTRY)}.` : sentence;
}

/** The e-mail for a visit change, with the calendar invitation attached where the time is set or freed. */
export function composeVisitMail(kind: VisitMailKind, v: VisitRow, c: CompanySettings, publicUrl: string, now: Date) {
  const window = labelFor(v.windowStart, v.windowEnd, c.timeZone);
  const what = `${VISIT_REASON_LABELS[v.reason]} at ${addressOf(v)}`;
  const link = `${publicUrl.replace(/\/$/, '')}/portal/booking/visits/${v.id}`;
  const words = VISIT_STATE_WORDS[v.status];
  // A technician is named only once the office has assigned one.
  const name = technicianToTell(v.status, v.technicianName);
  const tech = name ? `Your technician: ${name}.` : '';
  const change = howToChange(v, c, link, now);
  const paragraphs: Record<VisitMailKind, string[]> = {
    confirmation: [`We have your request: ${what}.`, `Arrival window: ${window}.`, words.meaning, EXPECT, change],
    assigned: [`${what}.`, `Arrival window: ${window}.`, words.meaning, tech, EXPECT, change],
    reschedule: [`${what}.`, `New arrival window: ${window}.`, words.meaning, tech, EXPECT, change],
    cancellation: [
      `Your visit (${what}, ${window}) is canceled.`,
      `To book again, visit ${publicUrl.replace(/\/$/, '')}/portal/booking or call ${formatPhone(c.phone, COMPANY_COUNTRY)}.`,
    ],
    on_the_way: [
      `${v.technicianName ?? 'Your technician'} is driving to you now for ${what}.`,
      `Arrival window: ${window}.`,
      'Please make sure someone over 18 is home and the units can be reached.',
    ],
    reminder: [`A reminder of your visit tomorrow: ${what}.`, `Arrival window: ${window}.`, words.meaning, tech, EXPECT, change],
  };
  const body = renderEmail({
    title: SUBJECTS[kind],
    paragraphs: paragraphs[kind].filter((p) => p !== ''),
    ...(kind === 'cancellation' ? {} : { action: { label: 'See your visit', url: link } }),
    footer: `${c.name} · ${formatPhone(c.phone, COMPANY_COUNTRY)}`,
  });
  const attachments: MailAttachment[] = [];
  if (kind !== 'on_the_way' && v.customerEmail) {
    const method = kind === 'cancellation' ? 'CANCEL' : 'REQUEST';
    attachments.push({
      filename: kind === 'cancellation' ? 'visit-canceled.ics' : 'visit.ics',
      contentType: `text/calendar; method=${method}`,
      content: visitInvitation({
        uid: visitUid(v.id),
        sequence: v.sequence,
        method,
        status: kind === 'cancellation' ? 'CANCELLED' : words.calendarStatus,
        start: v.windowStart.toISOString(),
        end: v.windowEnd.toISOString(),
        timeZone: c.timeZone,
        summary: `${c.name}: ${VISIT_REASON_LABELS[v.reason]}`,
        description: `Arrival window ${window}. ${kind === 'cancellation' ? VISIT_STATE_WORDS.canceled.meaning : words.meaning} ${tech}`.trim(),
        location: addressOf(v),
        organizer: { name: c.name, email: c.email },
        attendee: { name: v.customerName, email: v.customerEmail },
      }),
    });
  }
  return { subject: SUBJECTS[kind], ...body, attachments };
}

/** The visit e-mail ready for the mail queue, or null when the household has no address. */
export function visitMailToQueue(kind: VisitMailKind, v: VisitRow, c: CompanySettings, publicUrl: string, now: Date, key?: string): MailToQueue | null {
  if (!v.customerEmail) return null;
  const mail = composeVisitMail(kind, v, c, publicUrl, now);
  return {
    kind: `visit_${kind}`,
    key,
    message: { to: v.customerEmail, subject: mail.subject, text: mail.text, html: mail.html, attachments: mail.attachments },
  };
}

/**
 * Queues the visit e-mail when the household has an address; the mail queue sends and retries it.
 * A mail problem never undoes the booking. True when queued.
 */
export async function sendVisitMail(deps: Pick<AppDeps, 'config'> & OutboxDeps, kind: VisitMailKind, v: VisitRow, c: CompanySettings): Promise<boolean> {
  try {
    const mail = visitMailToQueue(kind, v, c, deps.config.publicUrl, deps.clock());
    return mail ? await queueMail(deps, mail) : false;
  } catch (err) {
    deps.logger.error({ err, visitId: v.id, kind }, 'visit e-mail was not queued');
    return false;
  }
}
