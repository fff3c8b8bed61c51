import { escapeHtml } from '../../../shared/html';
import type { CapturedMessage } from './mail-store';

const TITLE = 'Seasonwell test mailbox';

const when = (d: Date): string => `${d.toISOString().slice(0, 19).replace('T', ' ')} UTC`;

function formatSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} kB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}

// Everything inline: the mailbox must work with no network and under a CSP that blocks external files.
const STYLE = `
:root { color-scheme: light; --ink: #1f2a30; --muted: #5b6b73; --line: #d7e0e4; --paper: #f5f8f9; --accent: #1b6f7a; }
* { box-sizing: border-box; }
body { margin: 0; font: 15px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; color: var(--ink); background: var(--paper); }
header { background: var(--accent); color: #fff; padding: 12px 24px; display: flex; align-items: center; gap: 16px; flex-wrap: wrap; }
header h1 { font-size: 18px; margin: 0; font-weight: 600; }
header a { color: #fff; }
main { max-width: 1100px; margin: 0 auto; padding: 20px 24px 48px; }
.panel { background: #fff; border: 1px solid var(--line); border-radius: 8px; padding: 16px 20px; margin-bottom: 16px; }
.toolbar { display: flex; gap: 12px; align-items: center; flex-wrap: wrap; margin-bottom: 16px; }
.toolbar form { display: flex; gap: 8px; align-items: center; margin: 0; }
input[type=search] { padding: 6px 10px; border: 1px solid var(--line); border-radius: 6px; min-width: 260px; font: inherit; }
button { font: inherit; padding: 6px 14px; border-radius: 6px; border: 1px solid var(--accent); background: #fff; color: var(--accent); cursor: pointer; }
button.danger { border-color: #a3352b; color: #a3352b; }
table { width: 100%; border-collapse: collapse; }
th, td { text-align: left; padding: 8px 10px; border-bottom: 1px solid var(--line); vertical-align: top; }
th { font-size: 13px; color: var(--muted); font-weight: 600; }
td.when { white-space: nowrap; color: var(--muted); font-variant-numeric: tabular-nums; }
a { color: var(--accent); }
.empty { color: var(--muted); padding: 24px 0; text-align: center; }
dl.meta { display: grid; grid-template-columns: max-content 1fr; gap: 4px 16px; margin: 0; }
dl.meta dt { color: var(--muted); }
dl.meta dd { margin: 0; word-break: break-word; }
h2 { font-size: 15px; margin: 0 0 10px; }
pre { white-space: pre-wrap; word-break: break-word; margin: 0; font: 13px/1.5 ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace; }
iframe { width: 100%; height: 520px; border: 1px solid var(--line); border-radius: 6px; background: #fff; }
ul.plain { margin: 0; padding-left: 18px; }
.muted { color: var(--muted); }
`;

function layout(base: string, heading: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(heading === TITLE ? TITLE : `${heading} · ${TITLE}`)}</title>
<style>${STYLE}</style>
</head>
<body>
<header><h1><a href="${escapeHtml(base)}/">${escapeHtml(TITLE)}</a></h1><span>Mail sent by this machine never leaves it; it lands here.</span></header>
<main>
${body}
</main>
</body>
</html>`;
}

/** `base` is the path the mailbox app is mounted at ('' at the root). */
export function renderMessageList(base: string, messages: CapturedMessage[], filterTo: string | undefined, total: number): string {
  const rows = messages
    .map(
      (m) => `<tr>
<td class="when"><time datetime="${escapeHtml(m.receivedAt.toISOString())}">${escapeHtml(when(m.receivedAt))}</time></td>
<td>${escapeHtml(m.to.join(', '))}</td>
<td><a href="${escapeHtml(base)}/messages/${encodeURIComponent(m.id)}">${escapeHtml(m.subject || '(no subject)')}</a>${
        m.attachments.length > 0 ? ` <span class="muted">· ${m.attachments.length} attachment${m.attachments.length === 1 ? '' : 's'}</span>` : ''
      }</td>
</tr>`,
    )
    .join('\n');
  const table =
    messages.length > 0
      ? `<table>
<thead><tr><th scope="col">Received</th><th scope="col">To</th><th scope="col">Subject</th></tr></thead>
<tbody>
${rows}
</tbody>
</table>`
      : `<p class="empty">${filterTo ? `No messages to ${escapeHtml(filterTo)}.` : 'No messages yet.'}</p>`;
  const b = escapeHtml(base);
  return layout(
    base,
    TITLE,
    `<div class="toolbar">
<form method="get" action="${b}/" role="search">
<label for="to">Recipient</label>
<input type="search" id="to" name="to" value="${escapeHtml(filterTo ?? '')}" placeholder="name@example.test">
<button type="submit">Filter</button>
</form>
<a href="${b}/">Show all</a>
<span class="muted">${messages.length} shown of ${total}</span>
<form method="post" action="${b}/clear"><button type="submit" class="danger">Clear mailbox</button></form>
</div>
<section class="panel" aria-label="Messages">
${table}
</section>`,
  );
}

export function renderMessage(base: string, m: CapturedMessage): string {
  const id = encodeURIComponent(m.id);
  const b = escapeHtml(base);
  const meta: [string, string][] = [
    ['From', m.from],
    ['To', m.to.join(', ')],
    ...(m.cc.length > 0 ? ([['Cc', m.cc.join(', ')]] as [string, string][]) : []),
    ['Subject', m.subject || '(no subject)'],
    ['Received', when(m.receivedAt)],
    ['Size', formatSize(m.size)],
  ];
  const htmlPart =
    m.html !== null
      ? `<section class="panel" aria-label="HTML body">
<h2>HTML body</h2>
<iframe title="HTML body" sandbox srcdoc="${escapeHtml(m.html)}"></iframe>
</section>`
      : '';
  const attachments =
    m.attachments.length > 0
      ? `<section class="panel" aria-label="Attachments">
<h2>Attachments</h2>
<ul class="plain">
${m.attachments
  .map(
    (a, i) =>
      `<li><a href="${b}/api/messages/${id}/attachments/${i}" download="${escapeHtml(a.filename)}">${escapeHtml(a.filename)}</a> <span class="muted">${escapeHtml(a.contentType)}, ${escapeHtml(formatSize(a.content.length))}</span></li>`,
  )
  .join('\n')}
</ul>
</section>`
      : '';
  const links =
    m.links.length > 0
      ? `<section class="panel" aria-label="Links">
<h2>Links</h2>
<ul class="plain">
${m.links.map((l) => `<li><a href="${escapeHtml(l)}" rel="noreferrer">${escapeHtml(l)}</a></li>`).join('\n')}
</ul>
</section>`
      : '';
  return layout(
    base,
    m.subject || '(no subject)',
    `<p><a href="${b}/">← All messages</a> · <a href="${b}/api/messages/${id}/raw">Message source</a></p>
<section class="panel" aria-label="Headers">
<dl class="meta">
${meta.map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd>${escapeHtml(v)}</dd>`).join('\n')}
</dl>
</section>
${htmlPart}
<section class="panel" aria-label="Text body">
<h2>Text body</h2>
<pre>${escapeHtml(m.text)}</pre>
</section>
${attachments}
${links}
<section class="panel" aria-label="All headers">
<details>
<summary>All headers</summary>
<dl class="meta">
${Object.entries(m.headers)
  .map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd>${escapeHtml(v)}</dd>`)
  .join('\n')}
</dl>
</details>
</section>`,
  );
}

export function renderNotFound(base: string, what: string): string {
  return layout(base, 'Not found', `<section class="panel"><p>${escapeHtml(what)}</p><p><a href="${escapeHtml(base)}/">Back to the mailbox</a></p></section>`);
}
