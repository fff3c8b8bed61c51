import express, { type Request, type Response } from 'express';
import { toMessageJson, type CapturedMessage, type MailStore } from './mail-store';
import { renderMessage, renderMessageList, renderNotFound } from './mailbox-pages';

// Pages and srcdoc frames inherit this: no scripts anywhere, no remote images, fonts or styles.
const PAGE_CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'self'; frame-ancestors 'self'";

const MAX_WAIT_MS = 30_000;

function jsonError(res: Response, status: number, code: string, message: string, fields?: Record<string, string>): void {
  res.status(status).json({ error: { code, message, ...(fields ? { fields } : {}) } });
}

/** Reads an optional single-valued query parameter; repeated or non-string values are a 400. */
function queryText(req: Request, res: Response, name: string): string | undefined | null {
  const value = req.query[name];
  if (value === undefined) return undefined;
  if (typeof value !== 'string') {
    jsonError(res, 400, 'invalid_query', `${name} must be given once, as text`, { [name]: 'must be a single value' });
    return null;
  }
  const trimmed = value.trim();
  return trimmed === '' ? undefined : trimmed;
}

function sendAttachment(res: Response, message: CapturedMessage, indexParam: string): void {
  const index = /^\d+$/.test(indexParam) ? Number(indexParam) : NaN;
  const attachment = Number.isSafeInteger(index) ? message.attachments[index] : undefined;
  if (!attachment) {
    jsonError(res, 404, 'attachment_not_found', `Message ${message.id} has no attachment ${indexParam}`, {
      index: `must be 0 to ${message.attachments.length - 1}`,
    });
    return;
  }
  // An attached HTML or SVG file must not run as a page on this origin.
  res.set('Content-Security-Policy', 'sandbox');
  res.set('X-Content-Type-Options', 'nosniff');
  res.attachment(attachment.filename);
  res.type(attachment.contentType || 'application/octet-stream');
  res.send(attachment.content);
}

/** Mailbox pages and the JSON API tests use to read captured mail. Callers mount it only outside production. */
export function createMailboxApp(store: MailStore): express.Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('etag', false);
  app.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });

  // JSON API
  app.get('/api/messages', (req, res) => {
    const to = queryText(req, res, 'to');
    if (to === null) return;
    // A sender asks whether a message it may have sent before a crash arrived.
    const messageId = queryText(req, res, 'messageId');
    if (messageId === null) return;
    res.json(store.list({ to, messageId }).map(toMessageJson));
  });

  app.get('/api/messages/latest', async (req, res) => {
    const to = queryText(req, res, 'to');
    if (to === null) return;
    const waitText = queryText(req, res, 'waitMs');
    if (waitText === null) return;
    let waitMs = 0;
    if (waitText !== undefined) {
      waitMs = /^\d+$/.test(waitText) ? Number(waitText) : NaN;
      if (!Number.isSafeInteger(waitMs) || waitMs > MAX_WAIT_MS) {
        jsonError(res, 400, 'invalid_query', `waitMs must be a whole number of milliseconds up to ${MAX_WAIT_MS}`, {
          waitMs: `must be 0 to ${MAX_WAIT_MS}`,
        });
        return;
      }
    }
    const message = await store.waitForLatest({ to }, waitMs);
    if (!message) {
      jsonError(res, 404, 'no_messages', to ? `No messages to ${to}` : 'No messages yet');
      return;
    }
    res.json(toMessageJson(message));
  });

  app.get('/api/messages/:id', (req, res) => {
    const message = store.get(req.params.id);
    if (!message) return jsonError(res, 404, 'message_not_found', `No message with id ${req.params.id}`);
    res.json(toMessageJson(message));
  });

  app.get('/api/messages/:id/raw', (req, res) => {
    const message = store.get(req.params.id);
    if (!message) return jsonError(res, 404, 'message_not_found', `No message with id ${req.params.id}`);
    // Shown as text so the source can be read in the browser; never rendered.
    res.set('X-Content-Type-Options', 'nosniff');
    res.type('text/plain; charset=utf-8').send(message.raw);
  });

  app.get('/api/messages/:id/attachments/:index', (req, res) => {
    const message = store.get(req.params.id);
    if (!message) return jsonError(res, 404, 'message_not_found', `No message with id ${req.params.id}`);
    sendAttachment(res, message, req.params.index);
  });

  app.delete('/api/messages', (_req, res) => {
    store.clear();
    res.status(204).end();
  });

  // Pages
  const page = (res: Response, status: number, html: string): void => {
    res.status(status).set('Content-Security-Policy', PAGE_CSP).type('html').send(html);
  };

  app.get('/', (req, res) => {
    const raw = req.query.to;
    const to = typeof raw === 'string' && raw.trim() !== '' ? raw.trim() : undefined;
    page(res, 200, renderMessageList(req.baseUrl, store.list({ to }), to, store.size));
  });

  app.get('/messages/:id', (req, res) => {
    const message = store.get(req.params.id);
    if (!message) return page(res, 404, renderNotFound(req.baseUrl, `No message with id ${req.params.id}.`));
    page(res, 200, renderMessage(req.baseUrl, message));
  });

  app.post('/clear', (req, res) => {
    store.clear();
    res.redirect(303, `${req.baseUrl}/`);
  });

  return app;
}
