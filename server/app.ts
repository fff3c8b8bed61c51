import compression from 'compression';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pinoHttp } from 'pino-http';
import type { Config } from './config';
import type { AppDeps } from './deps';
import { authMiddleware } from './auth/session';
import { apiNotFound, errorHandler } from './http/errors';
import { apiRouters } from './routes';

/** Builds the Express app from explicit dependencies; nothing is read from globals. */
export function createApp(deps: AppDeps): Express {
  const { config } = deps;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');

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
      hsts: config.production,
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
  // Sessions, passport and CSRF; raw-body webhook routes carry their own signature.
  app.use(authMiddleware(deps, apiRouters.filter((r) => r.rawBody).map((r) => r.path)));

  for (const { path, build, rawBody } of apiRouters) {
    if (rawBody) app.use(path, build(deps));
  }
  app.use('/api', express.json({ limit: '1mb' }));
  app.use('/api', express.urlencoded({ extended: false, limit: '1mb' }));
  for (const { path, build, rawBody } of apiRouters) {
    if (!rawBody) app.use(path, build(deps));
  }
  app.use('/api', apiNotFound);

  serveClient(app, config);
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
