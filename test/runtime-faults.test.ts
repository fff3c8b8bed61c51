import { Writable } from 'node:stream';
import { pino } from 'pino';
import { describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { createDatabase } from '../server/db/client';
import { logProcessFaults } from '../server/runtime/shutdown';

/** A pino logger writing JSON lines into an array. */
function capture() {
  const lines: Record<string, unknown>[] = [];
  const stream = new Writable({
    write(chunk, _enc, done) {
      for (const l of String(chunk).split('\n').filter(Boolean)) lines.push(JSON.parse(l) as Record<string, unknown>);
      done();
    },
  });
  return { logger: pino({ level: 'info' }, stream), lines };
}

const settle = () => new Promise((r) => setImmediate(r));

describe('faults that would otherwise go unseen', () => {
  it('logs an error from an idle pool connection instead of crashing', async () => {
    const { logger, lines } = capture();
    const database = createDatabase(inject('databaseUrl'), 1, logger);
    try {
      database.pool.emit('error', new Error('terminating connection due to administrator command'), undefined as never);
      await settle();
      expect(lines).toContainEqual(
        expect.objectContaining({ level: 50, msg: 'database pool error', err: expect.objectContaining({ message: 'terminating connection due to administrator command' }) }),
      );
    } finally {
      await database.close();
    }
  });

  it('logs a promise rejection nobody handled', async () => {
    const { logger, lines } = capture();
    const before = { rejection: process.listeners('unhandledRejection'), exception: process.listeners('uncaughtException') };
    logProcessFaults(logger);
    try {
      const reason = new Error('lost in a callback');
      process.emit('unhandledRejection', reason, Promise.resolve());
      await settle();
      expect(lines).toContainEqual(expect.objectContaining({ level: 50, msg: 'unhandled promise rejection', err: expect.objectContaining({ message: 'lost in a callback' }) }));
      expect(process.listeners('uncaughtException').length).toBe(before.exception.length + 1);
    } finally {
      for (const l of process.listeners('unhandledRejection')) if (!before.rejection.includes(l)) process.off('unhandledRejection', l);
      for (const l of process.listeners('uncaughtException')) if (!before.exception.includes(l)) process.off('uncaughtException', l);
    }
  });
});
