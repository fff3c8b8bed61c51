import { randomUUID } from 'node:crypto';
import type PgBoss from 'pg-boss';
import type { JobHandler, JobOptions, JobQueue } from './queue';

/**
 * A job queue that runs each job at once, in the caller, and hands its error back: for tests and
 * one-off tools that run without pg-boss workers. Schedules are kept but never fire.
 */
export class InlineJobs implements JobQueue {
  private readonly handlers = new Map<string, JobHandler<object>>();
  readonly schedules = new Map<string, string>();

  register<T extends object>(name: string, handler: JobHandler<T>, opts: JobOptions = {}): void {
    this.handlers.set(name, handler as JobHandler<object>);
    if (opts.cron) this.schedules.set(name, opts.cron);
  }

  async send<T extends object>(name: string, data: T, _options: PgBoss.SendOptions = {}): Promise<string | null> {
    const handler = this.handlers.get(name);
    if (!handler) throw new Error(`no job named ${name}`);
    const id = randomUUID();
    await handler(data, { id, name });
    return id;
  }
}
