import { Router, type Response } from 'express';
import type { AppDeps } from '../deps';
import { escapeHtml } from '../../shared/html';
import { companyRow } from '../company/company';
import { readUnsubscribeToken, suppress } from './unsubscribe';

const PURPOSE_LABEL = { reminders: 'seasonal reminders' } as const;

function page(res: Response, status: number, title: string, body: string): void {
  res.status(status).type('html').setHeader('Cache-Control', 'no-store')
    .send(`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(title)}</title>
<style>body{font-family:system-ui,sans-serif;max-width:32rem;margin:3rem auto;padding:0 1rem;line-height:1.5}button{font:inherit;padding:.6rem 1.2rem;border-radius:.5rem;border:0;background:#1f5f8b;color:#fff;cursor:pointer}</style></head>
<body><main><h1>${escapeHtml(title)}</h1>${body}</main></body></html>`);
}

/**
 * Opting out of reminders without signing in. The signed token in the query is the whole
 * authority, so this mount takes no session, cookie or CSRF token (it is a raw-body mount and the
 * only path the Origin guard lets through). GET only shows a button; the POST, from that button or
 * a mail program's one-click (RFC 8058 §3), records the opt-out at once and answers 200.
 */
export function unsubscribeRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.get('/', async (req, res) => {
    const t = readUnsubscribeToken(deps, req.query['token']);
    if (!t) return page(res, 404, 'Link not valid', '<p>This unsubscribe link is not valid. Use the link in the most recent e-mail.</p>');
    const company = await companyRow(deps.database.db);
    const token = encodeURIComponent(String(req.query['token']));
    page(
      res,
      200,
      `Stop ${PURPOSE_LABEL[t.purpose]}?`,
      `<p>${escapeHtml(company.name)} will stop sending ${PURPOSE_LABEL[t.purpose]} to this household. Receipts, sign-in links and visit confirmations still arrive.</p>
<form method="post" action="?token=${token}"><button type="submit">Unsubscribe</button></form>`,
    );
  });
  router.post('/', async (req, res) => {
    const t = readUnsubscribeToken(deps, req.query['token']);
    if (!t) return page(res, 404, 'Link not valid', '<p>This unsubscribe link is not valid.</p>');
    await suppress(deps.database.db, t.customerId, t.purpose, 'one_click');
    page(res, 200, 'You are unsubscribed', `<p>No more ${PURPOSE_LABEL[t.purpose]} will be sent to this household.</p>`);
  });
  return router;
}
