import compression from 'compression';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pinoHttp } from 'pino-http';
import type { Config } from './config';
import type { AppDeps } from './deps';
import { authMiddleware } from './auth/session';
import { UNSUBSCRIBE_PATH } from './mail/unsubscribe';
import { guardParams, jsonBodiesOnly, sameOriginWrites, storableTextOnly } from './http/edge';
import { apiNotFound, errorHandler, notFoundAnywhere } from './http/errors';
import { apiRouters } from './routes';
import { memoPerRequest } from './runtime/request-memo';

/** Builds the Express app from explicit dependencies; nothing is read from globals. */
export function createApp(deps: AppDeps): Express {
  const { config } = deps;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.TRUST_PROXY);
  // Paths match exactly as written, so every guard below sees the same path the router routes.
  app.set('case sensitive routing', true);
  app.set('strict routing', true);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // Angular adds component styles at run time as <style> elements.
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'", 'data:'],
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
          ...(config.production ? { upgradeInsecureRequests: [] } : {}),
        },
      },
      crossOriginEmbedderPolicy: false,
      // Older browsers read X-Frame-Options; DENY says the same as frame-ancestors 'none'.
      frameguard: { action: 'deny' },
      referrerPolicy: { policy: 'no-referrer' },
      // A year, subdomains included (RFC 6797; common practice). Only over HTTPS, in production.
      hsts: config.production ? { maxAge: 31_536_000, includeSubDomains: true } : false,
    }),
  );
  app.use(compression());
  app.use(
    pinoHttp({
      logger: deps.logger,
      redact: ['req.headers.cookie', 'req.headers.authorization', 'req.headers["x-xsrf-token"]', 'res.headers["set-cookie"]'],
      autoLogging: { ignore: (req) => !req.url?.startsWith('/api') },
      // One short line per request: method, path and status, never headers or bodies.
      serializers: {
        req: (req: { method: string; url: string }) => ({ method: req.method, url: req.url.split('?')[0] }),
        res: (res: { statusCode: number }) => ({ status: res.statusCode }),
      },
    }),
  );
  const rawMounts = apiRouters.filter((r) => r.rawBody).map((r) => r.path);
  const multipartMounts = apiRouters.filter((r) => r.multipart).map((r) => r.path);
  // Refusals that need no session or body come first: another site's writes, then non-JSON bodies.
  app.use(sameOriginWrites(config, [UNSUBSCRIBE_PATH]));
  app.use(jsonBodiesOnly({ rawMounts, multipartMounts }));
  // Sessions, passport and CSRF; raw-body webhook routes carry their own signature.
  app.use(authMiddleware(deps, rawMounts));
  app.use(memoPerRequest);

  for (const { path, build, rawBody } of apiRouters) {
    if (rawBody) app.use(path, guardParams(build(deps)));
  }
  app.use('/api', express.json({ limit: '1mb' }));
  app.use(storableTextOnly);
  for (const { path, build, rawBody } of apiRouters) {
    if (!rawBody) app.use(path, guardParams(build(deps)));
  }
  // Any other spelling of /api is an API path too: a JSON 404, never the client's page.
  app.use((req, res, next) => (/^\/api(\/|$)/i.test(req.path) ? apiNotFound(req, res, next) : next()));

  serveClient(app, config);
  app.use(notFoundAnywhere);
  app.use(errorHandler);
  return app;
}

/** Serves the built Angular app, with index.html for any other GET (client-side routes). */
function serveClient(app: Express, config: Config): void {
  const dist = resolve(config.CLIENT_DIST);
  const index = join(dist, 'index.html');
  if (!existsSync(index)) return;
  app.use(
    express.static(dist, {
      index: false,
      setHeaders(res, file) {
        // Hashed bundles never change; index.html must always be fresh.
        res.setHeader('Cache-Control', /-[A-Z0-9]{8}\.(js|css)$/.test(file) || file.includes('/media/') ? 'public, max-age=31536000, immutable' : 'no-cache');
      },
    }),
  );
  app.get('/{*splat}', (req, res, next) => {
    if (req.path.includes('.') && !req.path.endsWith('.html')) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
}
