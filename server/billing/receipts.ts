import { eq } from 'drizzle-orm';
import { coveredThroughLabel, termRangeLabel } from '../../shared/agreement-terms';
import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import { dateTimeFormat } from '../../shared/date-formats';
import { formatUsd } from '../../shared/money';
import { INVOICE_STATUS_LABELS, type InvoiceView, type PaymentView } from '../../shared/schemas/billing';
import type { AppDeps } from '../deps';
import { agreementTerms, customers, payments } from '../db/schema';
import { renderEmail } from '../integrations/mail-layout';
import { queueMail, type OutboxDeps } from '../mail/outbox';
import { invoiceView } from './invoices';
import { companyRow, type CompanyRow } from '../company/company';

export const RECEIPT_JOB = 'billing-receipt';

const require = createRequire(import.meta.url);
// pdfkit reads TTF, OTF and WOFF (not WOFF2); @fontsource ships Nunito as WOFF.
const NUNITO = require.resolve('@fontsource/nunito/files/nunito-latin-400-normal.woff');
const NUNITO_BOLD = require.resolve('@fontsource/nunito/files/nunito-latin-700-normal.woff');

const METHOD_LABEL = { card: 'Card', check: 'Check', cash: 'Cash' } as const;

function dateText(isoTime: string | null, timeZone: string): string {
  if (!isoTime) return '';
  return dateTimeFormat('en-US', { dateStyle: 'medium', timeZone }).format(new Date(isoTime));
}

/** The invoice with its receipt (payments so far) as one PDF, Nunito embedded. */
export function renderInvoicePdf(view: InvoiceView, company: CompanyRow, forPayment?: PaymentView): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'LETTER', margin: 54, info: { Title: `Invoice ${view.number ?? 'draft'}`, Author: company.name } });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.registerFont('body', NUNITO);
    doc.registerFont('bold', NUNITO_BOLD);

    const left = doc.page.margins.left;
    const right = doc.page.width - doc.page.margins.right;
    const width = right - left;

    doc.font('bold').fontSize(18).text(company.name, left, 54);
    doc.font('body').fontSize(10).fillColor('#444').text(`${company.street}, ${company.city}, ${company.state} ${company.zip}`).text(`${company.phone}  ·  ${company.email}`);
    doc.moveDown(1.2).fillColor('#000');
    doc
      .font('bold')
      .fontSize(14)
      .text(forPayment ? `Receipt for invoice ${view.number}` : `Invoice ${view.number ?? '(draft)'}`);
    doc.font('body').fontSize(10);
    doc.text(`Billed to: ${view.customerName}`);
    if (view.issuedAt) doc.text(`Issued: ${dateText(view.issuedAt, company.timeZone)}`);
    doc.text(`Status: ${INVOICE_STATUS_LABELS[view.status]}`);
    doc.moveDown();

    const cols = [left, left + width * 0.52, left + width * 0.64, left + width * 0.82];
    const row = (cells: string[], bold = false) => {
      const y = doc.y;
      doc.font(bold ? 'bold' : 'body').fontSize(10);
      doc.text(cells[0] ?? '', cols[0]!, y, { width: width * 0.5 });
      const h = doc.y;
      doc.text(cells[1] ?? '', cols[1]!, y, { width: width * 0.1, align: 'right' });
      doc.text(cells[2] ?? '', cols[2]!, y, { width: width * 0.16, align: 'right' });
      doc.text(cells[3] ?? '', cols[3]!, y, { width: width * 0.18, align: 'right' });
      doc.y = Math.max(h, doc.y);
      doc.moveDown(0.3);
    };
    row(['Description', 'Qty', 'Unit', 'Amount'], true);
    doc.moveTo(left, doc.y).lineTo(right, doc.y).strokeColor('#999').stroke();
    doc.moveDown(0.3);
    for (const l of view.lines) {
      row([`${l.description}${l.taxable ? ' (taxable)' : ''}`, String(l.quantity), formatUsd(l.unitCents), formatUsd(l.grossCents)]);
      if (l.discountCents > 0) row([`   Plan discount`, '', '', `-${formatUsd(l.discountCents)}`]);
    }
    doc.moveTo(left, doc.y).lineTo(right, doc.y).stroke();
    doc.moveDown(0.3);
    row(['Subtotal', '', '', formatUsd(view.subtotalCents)]);
    if (view.discountCents > 0) row([`Plan discount (${(view.discountBps / 100).toFixed(2)} %)`, '', '', `-${formatUsd(view.discountCents)}`]);
    row([`Sales tax (${(view.taxRateBps / 100).toFixed(3).replace(/0+$/, '').replace(/\.$/, '')} %)`, '', '', formatUsd(view.taxCents)]);
    row(['Total', '', '', formatUsd(view.totalCents)], true);

    if (view.payments.length) {
      doc.moveDown();
      doc.font('bold').fontSize(12).text('Payments', left);
      for (const p of view.payments) {
        row([`${METHOD_LABEL[p.method]}${p.reference ? ` · ${p.reference}` : ''} · ${dateText(p.succeededAt, company.timeZone)}`, '', '', formatUsd(p.amountCents)]);
        if (p.refundedCents > 0) row(['   Refunded', '', '', `-${formatUsd(p.refundedCents)}`]);
      }
      row(['Balance due', '', '', formatUsd(view.balanceCents)], true);
    }
    if (view.notes) {
      doc.moveDown();
      doc.font('body').fontSize(9).fillColor('#444').text(view.notes, left, doc.y, { width });
    }
    doc.moveDown(2);
    doc.font('body').fontSize(9).fillColor('#444').text('Thank you for your business.', left, doc.y, { width });
    doc.end();
  });
}

/** E-mails the receipt with the invoice PDF. The Message-ID is fixed per payment, so a retried job is recognisable. */
export async function sendReceipt(deps: Pick<AppDeps, 'config'> & OutboxDeps, paymentId: string): Promise<void> {
  const { db } = deps.database;
  const [pay] = await db.select().from(payments).where(eq(payments.id, paymentId));
  if (!pay || pay.status !== 'succeeded') return;
  const view = await invoiceView(db, pay.invoiceId);
  const [cust] = await db.select({ email: customers.email }).from(customers).where(eq(customers.id, view.customerId));
  if (!cust?.email) return;
  const company = await companyRow(db);
  const payment = view.payments.find((p) => p.id === paymentId);
  const pdf = await renderInvoicePdf(view, company, payment);
  const what =
    view.purpose === 'renewal'
      ? 'Your maintenance agreement is renewed.'
      : view.purpose === 'enrollment'
        ? 'Welcome: your maintenance agreement is active.'
        : 'Thank you for your payment.';
  // The term this payment bought, written as every screen writes it (shared/agreement-terms.ts).
  const [term] = await db.select({ startsOn: agreementTerms.startsOn, endsOn: agreementTerms.endsOn }).from(agreementTerms).where(eq(agreementTerms.invoiceId, view.id)).limit(1);
  const base = deps.config.publicUrl.replace(/\/$/, '');
  const body = renderEmail({
    title: `Receipt for invoice ${view.number}`,
    paragraphs: [
      `Hello ${view.customerName},`,
      term ? `${what} Term: ${termRangeLabel(term)}. ${coveredThroughLabel(term)}.` : what,
      `We received ${formatUsd(pay.amountCents)} by ${METHOD_LABEL[pay.method].toLowerCase()}${pay.reference ? ` (${pay.reference})` : ''}. The invoice and receipt are attached as a PDF.`,
    ],
    action: { label: 'View your invoices', url: `${base}/portal/invoices/${view.id}` },
    footer: `${company.name} · ${company.phone}`,
  });
  // The mail queue sends it and retries; the key stops a second copy when this job runs again.
  await queueMail(deps, {
    kind: 'receipt',
    key: `receipt-${paymentId}`,
    message: {
      to: cust.email,
      subject: `Receipt for invoice ${view.number} from ${company.name}`,
      text: body.text,
      html: body.html,
      attachments: [{ filename: `invoice-${view.number}.pdf`, content: pdf, contentType: 'application/pdf' }],
    },
  });
}

export async function queueReceipt(deps: Pick<AppDeps, 'logger' | 'jobs'>, paymentId: string): Promise<void> {
  try {
    await deps.jobs.send(RECEIPT_JOB, { paymentId }, { singletonKey: `receipt-${paymentId}` });
  } catch (err) {
    // A receipt that fails to send never undoes a recorded payment.
    deps.logger.error({ err, paymentId }, 'receipt e-mail failed');
  }
}
