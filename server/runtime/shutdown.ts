import type { Server } from 'node:http';
import type { Logger } from 'pino';

/** How long requests in flight may take to finish once the process is asked to stop. */
export const DRAIN_MS = 10_000;

/**
 * Stops taking connections, lets the requests in flight finish (up to `drainMs`), then cuts what is
 * left. Keep-alive connections are closed as soon as they fall idle, so a browser holding one open
 * does not keep the process alive.
 */
export function closeHttpServer(server: Server, logger: Logger, drainMs = DRAIN_MS): Promise<void> {
  return new Promise((resolve) => {
    const sweep = setInterval(() => server.closeIdleConnections(), 100);
    const cut = setTimeout(() => {
      logger.warn({ afterMs: drainMs }, 'requests still running when the drain time ran out; closing their connections');
      server.closeAllConnections();
    }, drainMs);
    server.close(() => {
      clearInterval(sweep);
      clearTimeout(cut);
      resolve();
    });
    server.closeIdleConnections();
  });
}

/**
 * Logs what would otherwise vanish or kill the process without a word. A rejected promise nobody
 * awaited is logged and the process goes on; an uncaught exception leaves the process in an unknown
 * state, so it is logged and the process exits (Node.js docs, "Warning: using uncaughtException
 * correctly").
 */
export function logProcessFaults(logger: Logger): void {
  process.on('unhandledRejection', (reason) => {
    logger.error({ err: reason }, 'unhandled promise rejection');
  });
  process.on('uncaughtException', (err, origin) => {
    logger.fatal({ err, origin }, 'uncaught exception; exiting');
    process.exit(1);
  });
}
