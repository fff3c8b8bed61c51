import { escapeHtml } from '../../shared/html';
import { checkHttpUrl, checkText, MailInputError } from './mail';

// The e-mail layout: the product's one card design, as HTML and as plain text. Sending is mail.ts.

export interface EmailContent {
  title: string;
  paragraphs: string[];
  action?: { label: string; url: string };
  footer?: string;
}

const FONT = "Nunito, 'Segoe UI', Roboto, 'Helvetica Neue', Helvetica, Arial, sans-serif";
const INK = '#1f2a30';
const MUTED = '#5b6b73';
const ACCENT = '#1b6f7a';

const lines = (text: string): string => escapeHtml(text).replace(/\r?\n/g, '<br>');

/** Our plain e-mail layout: one card, a heading, paragraphs, an optional button. Inline CSS, no remote images. */
export function renderEmail(content: EmailContent): { html: string; text: string } {
  if (content === null || typeof content !== 'object') throw new MailInputError('content', 'must be an object');
  const title = checkText(content.title, 'title');
  if (!Array.isArray(content.paragraphs)) throw new MailInputError('paragraphs', 'must be a list of text');
  const paragraphs = content.paragraphs.map((p, i) => checkText(p, `paragraphs[${i}]`, { allowEmpty: true }));
  let action: { label: string; url: string } | undefined;
  if (content.action !== undefined) {
    const label = checkText(content.action?.label, 'action.label');
    action = { label, url: checkHttpUrl(content.action.url, 'action.url').toString() };
  }
  const footer = content.footer === undefined ? undefined : checkText(content.footer, 'footer', { allowEmpty: true });

  const paragraphHtml = paragraphs.map((p) => `<p style="margin:0 0 14px;font-family:${FONT};font-size:16px;line-height:1.55;color:${INK};">${lines(p)}</p>`).join('\n');
  const actionHtml = action
    ? `<table role="presentation" cellpadding="0" cellspacing="0" border="0" style="margin:22px 0 18px;"><tr>
<td style="border-radius:8px;background:${ACCENT};"><a href="${escapeHtml(action.url)}" style="display:inline-block;padding:12px 24px;font-family:${FONT};font-size:16px;font-weight:700;color:#ffffff;text-decoration:none;border-radius:8px;">${escapeHtml(action.label)}</a></td>
</tr></table>
<p style="margin:0 0 14px;font-family:${FONT};font-size:13px;line-height:1.5;color:${MUTED};">If the button does not open, copy this address into your browser:<br><span style="word-break:break-all;">${escapeHtml(action.url)}</span></p>`
    : '';
  const footerHtml =
    footer !== undefined && footer !== ''
      ? `<tr><td style="padding:14px 32px 0;font-family:${FONT};font-size:12px;line-height:1.5;color:${MUTED};text-align:center;">${lines(footer)}</td></tr>`
      : '';

  const html = `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
</head>
<body style="margin:0;padding:0;background:#f1f5f6;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="background:#f1f5f6;">
<tr><td align="center" style="padding:28px 12px;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="max-width:560px;">
<tr><td style="background:#ffffff;border:1px solid #dde6e9;border-radius:12px;padding:28px 32px;">
<h1 style="margin:0 0 18px;font-family:${FONT};font-size:22px;line-height:1.3;font-weight:700;color:${INK};">${escapeHtml(title)}</h1>
${paragraphHtml}
${actionHtml}
</td></tr>
${footerHtml}
</table>
</td></tr>
</table>
</body>
</html>`;

  const textParts = [title, ...paragraphs];
  if (action) textParts.push(`${action.label}:\n${action.url}`);
  if (footer) textParts.push(`--\n${footer}`);
  return { html, text: `${textParts.join('\n\n')}\n` };
}
