import PgBoss from 'pg-boss';
import type { Logger } from 'pino';

export type JobHandler<T extends object> = (data: T, job: { id: string; name: string }) => Promise<void>;

interface Registration {
  name: string;
  handler: JobHandler<object>;
  cron?: string;
  options?: PgBoss.Queue;
}

export type JobOptions = { cron?: string; queue?: PgBoss.Queue };

/** What features need from the job queue: pg-boss in main.ts, run-at-once in tests (inline.ts). */
export interface JobQueue {
  /** Register a queue and its handler before start; `cron` schedules it. */
  register<T extends object>(name: string, handler: JobHandler<T>, opts?: JobOptions): void;
  /** Queue one job; resolves with its id, or null when a job with the same singletonKey is waiting. */
  send<T extends object>(name: string, data: T, options?: PgBoss.SendOptions): Promise<string | null>;
}

/**
 * Long work (renewals, campaigns, webhook processing, e-mail) runs as pg-boss jobs in PostgreSQL,
 * so several API and worker processes can share one database. Features register their queues
 * before start(); send() works once started.
 */
export class Jobs implements JobQueue {
  private boss: PgBoss | null = null;
  private readonly registrations: Registration[] = [];

  constructor(
    private readonly connectionString: string,
    private readonly logger: Logger,
  ) {}

  /** Register a queue and its handler; `cron` schedules it in the zone given to start(). */
  register<T extends object>(name: string, handler: JobHandler<T>, opts: JobOptions = {}): void {
    this.registrations.push({ name, handler: handler as JobHandler<object>, cron: opts.cron, options: opts.queue });
  }

  /**
   * Creates the queues, schedules the cron jobs in `timeZone` (the company's, from its row) and
   * starts the workers. Without a zone (no company row yet) nothing is scheduled until a restart.
   */
  async start({ work = true, timeZone }: { work?: boolean; timeZone: string | null }): Promise<void> {
    const boss = new PgBoss({ connectionString: this.connectionString, schema: 'pgboss', max: 4 });
    boss.on('error', (err) => this.logger.error({ err }, 'job queue error'));
    await boss.start();
    for (const r of this.registrations) {
      await boss.createQueue(r.name, { name: r.name, retryLimit: 5, retryDelay: 30, retryBackoff: true, ...r.options });
      if (r.cron && timeZone) await boss.schedule(r.name, r.cron, {}, { tz: timeZone });
      else if (r.cron) this.logger.warn({ queue: r.name }, 'the company is not set up: scheduled job not scheduled');
      if (work) {
        await boss.work<object>(r.name, async (jobs) => {
          for (const job of jobs) await r.handler(job.data ?? {}, { id: job.id, name: job.name });
        });
      }
    }
    this.boss = boss;
  }

  async send<T extends object>(name: string, data: T, options: PgBoss.SendOptions = {}): Promise<string | null> {
    if (!this.boss) throw new Error(`job queue not started: cannot send ${name}`);
    return this.boss.send(name, data, options);
  }

  /** Runs a registered handler directly, for tests and one-off runs. */
  async runNow<T extends object>(name: string, data: T): Promise<void> {
    const r = this.registrations.find((x) => x.name === name);
    if (!r) throw new Error(`no job named ${name}`);
    await r.handler(data, { id: 'direct', name });
  }

  async stop(): Promise<void> {
    await this.boss?.stop({ graceful: true, timeout: 5000 });
    this.boss = null;
  }
}
