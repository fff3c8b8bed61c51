import express, { type Request, type Response } from 'express';
import { randomBytes } from 'node:crypto';
import { escapeHtml as esc } from '../../../shared/html';
import { formatMoney } from '../../../shared/money';
import { completeCheckout, sessionNow } from './checkout-sessions';
import { FAKE_API_VERSION, type Engine } from './engine';
import { FakeStripeError } from './errors';
import type { WireCheckoutSession, WireLineItem } from './wire-types';

// The hosted payment page: plain server-rendered HTML, no script. Card data is
// typed here, on the fake's own port, and never reaches our app server.

const CARDS_HELP: [string, string][] = [
  ['4242 4242 4242 4242', 'succeeds'],
  ['4000 0000 0000 0002', 'declined (generic)'],
  ['4000 0000 0000 9995', 'declined (insufficient funds)'],
  ['4000 0000 0000 0069', 'declined (expired card)'],
  ['4000 0000 0000 0341', 'saves, then later charges decline'],
];

const STYLE = `
  body { font-family: system-ui, sans-serif; background: #f3f4f6; color: #1f2937; margin: 0; }
  main { max-width: 28rem; margin: 2rem auto; background: #fff; border: 1px solid #d1d5db; border-radius: 8px; padding: 1.5rem; }
  .banner { background: #fef3c7; border: 1px dashed #b45309; padding: .5rem .75rem; border-radius: 4px; font-size: .9rem; }
  table { width: 100%; border-collapse: collapse; margin: 1rem 0; }
  td { padding: .25rem 0; } td.amt { text-align: right; } tr.total td { border-top: 1px solid #d1d5db; font-weight: 600; }
  label { display: block; margin-top: .75rem; font-weight: 600; font-size: .9rem; }
  input { width: 100%; box-sizing: border-box; padding: .5rem; font-size: 1rem; border: 1px solid #9ca3af; border-radius: 4px; }
  .row { display: flex; gap: .75rem; } .row > div { flex: 1; }
  button { margin-top: 1rem; width: 100%; padding: .6rem; font-size: 1rem; background: #374151; color: #fff; border: 0; border-radius: 4px; cursor: pointer; }
  .error { background: #fee2e2; border: 1px solid #b91c1c; color: #7f1d1d; padding: .5rem .75rem; border-radius: 4px; margin-top: 1rem; }
  details { margin-top: 1.25rem; font-size: .85rem; } a { color: #1d4ed8; }
`;

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)}</title><style>${STYLE}</style></head>
<body><main>
<p class="banner">Test tool: no real card is charged. Use a test card number below.</p>
${body}
</main></body></html>`;
}

interface FormValues {
  card_number?: string;
  expiry?: string;
  cvc?: string;
}

function checkoutForm(s: WireCheckoutSession, lines: WireLineItem[], error?: string, values: FormValues = {}): string {
  const setup = s.mode === 'setup';
  const rows = lines.map((l) => `<tr><td>${esc(l.description)} × ${esc(l.quantity)}</td><td class="amt">${esc(formatMoney(l.amount_total, l.currency))}</td></tr>`).join('');
  const summary = setup
    ? '<p>Save a card for future charges. Nothing is charged now.</p>'
    : `<table aria-label="Order summary">${rows}<tr class="total"><td>Total</td><td class="amt">${esc(formatMoney(s.amount_total ?? 0, s.currency ?? 'usd'))}</td></tr></table>`;
  const cancel = s.cancel_url ? `<p><a href="${esc(s.cancel_url)}">Cancel</a></p>` : '';
  return page(
    'Test payment page',
    `<h1>Test payment page</h1>
${summary}
${error ? `<p class="error" role="alert">${esc(error)}</p>` : ''}
<form method="post" action="/checkout/${esc(s.id)}">
  <label for="card_number">Card number</label>
  <input id="card_number" name="card_number" inputmode="numeric" autocomplete="cc-number" required value="${esc(values.card_number)}">
  <div class="row">
    <div><label for="expiry">Expiry (MM/YY)</label>
    <input id="expiry" name="expiry" placeholder="MM/YY" autocomplete="cc-exp" required value="${esc(values.expiry)}"></div>
    <div><label for="cvc">CVC</label>
    <input id="cvc" name="cvc" inputmode="numeric" autocomplete="cc-csc" required value="${esc(values.cvc)}"></div>
  </div>
  <button type="submit">${setup ? 'Save card' : 'Pay'}</button>
</form>
${cancel}
<details><summary>Test card numbers</summary><ul>
${CARDS_HELP.map(([n, what]) => `<li><code>${n}</code>: ${what}</li>`).join('\n')}
</ul><p>Any future expiry date and any 3-digit CVC.</p></details>`,
  );
}

function parseExpiry(raw: string | undefined): { expMonth: number; expYear: number } | null {
  const m = /^\s*(\d{1,2})\s*\/\s*(\d{2}|\d{4})\s*$/.exec(raw ?? '');
  if (!m) return null;
  return { expMonth: Number(m[1]), expYear: Number(m[2]) };
}

export function createHostedPageRouter(engine: Engine, publicUrl: (req: Request) => string): express.Router {
  const router = express.Router();
  router.use(express.urlencoded({ extended: false, limit: '16kb' }));

  const sessionOr404 = (req: Request, res: Response): WireCheckoutSession | undefined => {
    const s = engine.sessions.get(String(req.params['id']));
    if (!s) {
      res.status(404).type('html').send(page('Test payment page', '<h1>Payment page not found</h1><p>This payment link is not valid.</p>'));
      return undefined;
    }
    return sessionNow(engine, s.id);
  };

  const closed = (res: Response, s: WireCheckoutSession) => {
    const text = s.status === 'complete' ? 'This payment is already complete.' : 'This payment page has expired.';
    res
      .status(410)
      .type('html')
      .send(page('Test payment page', `<h1>Test payment page</h1><p role="status">${esc(text)}</p>`));
  };

  router.get('/:id', (req, res) => {
    const s = sessionOr404(req, res);
    if (!s) return;
    if (s.status !== 'open') return closed(res, s);
    res.type('html').send(checkoutForm(s, engine.sessionLines.get(s.id) ?? []));
  });

  router.post('/:id', (req, res) => {
    const s = sessionOr404(req, res);
    if (!s) return;
    if (s.status !== 'open') return closed(res, s);
    const body = (req.body ?? {}) as Record<string, unknown>;
    const values: FormValues = {
      card_number: typeof body['card_number'] === 'string' ? body['card_number'] : '',
      expiry: typeof body['expiry'] === 'string' ? body['expiry'] : '',
      cvc: typeof body['cvc'] === 'string' ? body['cvc'] : '',
    };
    const lines = engine.sessionLines.get(s.id) ?? [];
    const again = (status: number, message: string) =>
      // The card number is never echoed back into the page.
      res
        .status(status)
        .type('html')
        .send(checkoutForm(s, lines, message, { expiry: values.expiry }));
    const exp = parseExpiry(values.expiry);
    if (!exp) return again(400, 'Expiry must be written as MM/YY.');
    try {
      const info = {
        requestId: `req_${randomBytes(7).toString('hex')}`,
        idempotencyKey: null,
        apiVersion: FAKE_API_VERSION,
        publicUrl: publicUrl(req),
      };
      completeCheckout(engine, s.id, { number: values.card_number ?? '', ...exp, cvc: values.cvc }, info);
    } catch (e) {
      if (e instanceof FakeStripeError) return again(e.status === 402 ? 402 : 400, e.body.message);
      throw e;
    }
    res.redirect(303, s.success_url.replaceAll('{CHECKOUT_SESSION_ID}', s.id));
  });

  return router;
}
