import { Router } from 'express';
import type { AppDeps } from '../deps';
import { currentUser, isStaffOffice, requireRole, requireUser } from '../auth/access';
import { forbidden, notFound, parse } from '../http/errors';
import { StoredObjectMissing } from '../integrations/storage';
import { multipart } from './multipart';
import { archiveFile, fileFor, storeUploads, uploadTargetSchema } from './uploads.service';

/** "inline" or "attachment" with a quoted ASCII name and the UTF-8 name (RFC 6266 / RFC 5987). */
export function contentDisposition(kind: 'inline' | 'attachment', name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`;
}

/** Photos and documents: upload, and download only through this authorised route. */
export function uploadRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  const { storage } = deps;

  r.post('/', requireUser, multipart('files'), async (req, res) => {
    const user = currentUser(req);
    const target = parse(uploadTargetSchema, req.body ?? {});
    const incoming = (req.files as Express.Multer.File[] | undefined) ?? [];
    res.status(201).json(await storeUploads(deps, user, target, incoming));
  });

  const send = (thumb: boolean) =>
    (async (req, res) => {
      const f = await fileFor(deps, currentUser(req), String(req.params.id));
      const key = thumb ? f.thumbKey : f.storageKey;
      if (!key) throw notFound('That thumbnail');
      let body: Buffer;
      try {
        body = await storage.get(key);
      } catch (err) {
        if (err instanceof StoredObjectMissing) throw notFound('That file');
        throw err;
      }
      const download = req.query.download === '1' || (!thumb && f.contentType === 'application/pdf' && req.query.inline !== '1');
      res.setHeader('Content-Type', thumb ? 'image/webp' : f.contentType);
      res.setHeader('Content-Length', String(body.length));
      res.setHeader('Content-Disposition', contentDisposition(download ? 'attachment' : 'inline', thumb ? f.originalName.replace(/\.[a-z]+$/, '-thumb.webp') : f.originalName));
      res.setHeader('Cache-Control', 'private, max-age=3600');
      res.setHeader('X-Content-Type-Options', 'nosniff');
      // A stored file never runs as a page, even if someone opens it directly.
      res.setHeader('Content-Security-Policy', "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox");
      res.end(body);
    }) as import('express').RequestHandler;

  r.get('/:id', requireUser, send(false));
  r.get('/:id/thumb', requireUser, send(true));

  r.post('/:id/archive', requireRole('technician', 'office', 'owner'), async (req, res) => {
    const user = currentUser(req);
    if (!isStaffOffice(user) && user.role !== 'technician') throw forbidden();
    await archiveFile(deps, user, String(req.params.id));
    res.json({ id: String(req.params.id), archived: true });
  });

  return r;
}
