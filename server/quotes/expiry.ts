import { and, eq, inArray, lt } from 'drizzle-orm';
import { formatTermDay } from '../../shared/agreement-terms';
import { QUOTE_STATUS_LABELS } from '../../shared/schemas/pricebook';
import type { AppDeps } from '../deps';
import { customers, quoteRevisions, quotes } from '../db/schema';
import { AppError } from '../http/errors';
import { companyRow, localDate } from '../company/company';
import { renderEmail } from '../integrations/mail-layout';
import { recordMail, startSending, type OutboxDeps } from '../mail/outbox';

// A sent quote holds its prices through its valid-until day (the company's local date). After
// that it is expired: the job marks it, and an answer that arrives first is refused all the same.

export const EXPIRE_QUOTES_JOB = 'quotes.expire';

/** The 409 an answer gets once the prices no longer hold. */
export const quoteExpired = (validUntil: string) =>
  new AppError(409, 'quote_expired', `This quote is ${QUOTE_STATUS_LABELS.expired.toLowerCase()}: its prices held through ${formatTermDay(validUntil)}. Ask us for a new quote.`);

/** Has a sent quote's valid-until day passed on `today` (both local ISO dates)? */
export const pastValidUntil = (validUntil: string | null, today: string) => validUntil !== null && validUntil < today;

/**
 * Marks every sent quote whose valid-until day has passed as expired, with its current revision,
 * and tells the household by e-mail, once per revision (the mail's key). Returns how many.
 */
export async function expireQuotes(deps: Pick<AppDeps, 'config'> & OutboxDeps): Promise<number> {
  const { db } = deps.database;
  const now = deps.clock();
  const company = await companyRow(db);
  const today = localDate(now, company.timeZone);
  const { expired, mailIds } = await db.transaction(async (tx) => {
    const rows = await tx
      .update(quotes)
      .set({ status: 'expired', updatedAt: now })
      .where(and(eq(quotes.status, 'sent'), lt(quotes.validUntil, today)))
      .returning({ id: quotes.id, number: quotes.number, revision: quotes.revision, validUntil: quotes.validUntil, customerId: quotes.customerId, sentTo: quotes.sentTo });
    if (!rows.length) return { expired: 0, mailIds: [] as (string | null)[] };
    // Only the current revision can be sent: a new revision starts from a frozen one.
    await tx
      .update(quoteRevisions)
      .set({ status: 'expired' })
      .where(
        and(
          inArray(
            quoteRevisions.quoteId,
            rows.map((r) => r.id),
          ),
          eq(quoteRevisions.status, 'sent'),
        ),
      );
    const names = await tx
      .select({ id: customers.id, name: customers.name, email: customers.email })
      .from(customers)
      .where(inArray(customers.id, [...new Set(rows.map((r) => r.customerId))]));
    const ids: (string | null)[] = [];
    for (const r of rows) {
      const c = names.find((n) => n.id === r.customerId);
      const to = r.sentTo ?? c?.email;
      if (!to) continue;
      const subject = `Your quote #${r.number} from ${company.name}: ${QUOTE_STATUS_LABELS.expired}`;
      const content = renderEmail({
        title: subject,
        paragraphs: [`Hello ${c?.name ?? ''},`, `The prices on this quote held through ${formatTermDay(r.validUntil!)}. Call us or reply to this e-mail for a new quote.`],
        action: { label: 'See the quote', url: `${deps.config.publicUrl}/portal/quotes/${r.id}` },
      });
      ids.push(await recordMail(deps, { kind: 'quote_expired', key: `quote-expired:${r.id}:${r.revision}`, message: { to, subject, html: content.html, text: content.text } }, tx));
    }
    return { expired: rows.length, mailIds: ids };
  });
  await startSending(deps, mailIds);
  return expired;
}

export function registerQuoteJobs(deps: Pick<AppDeps, 'config'> & OutboxDeps): void {
  // Hourly, so a quote expires within the hour after its last day ends, whatever the restarts.
  deps.jobs.register(
    EXPIRE_QUOTES_JOB,
    async () => {
      await expireQuotes(deps);
    },
    { cron: '7 * * * *' },
  );
}
