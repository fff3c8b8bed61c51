import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import { withSessionLock } from '../db/advisory-lock';

// Any fixed number, apart from the migration lock: every process starting the queue takes it.
const QUEUE_SETUP_LOCK = 7_311_205;

export type JobHandler<T extends object> = (data: T, job: { id: string; name: string }) => Promise<void>;

interface Registration {
  name: string;
  handler: JobHandler<object>;
  cron?: string;
  options?: PgBoss.Queue;
  work?: PgBoss.WorkOptions;
}

export type JobOptions = { cron?: string; queue?: PgBoss.Queue; work?: PgBoss.WorkOptions };

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
  /** This process's worker per queue, woken at once when this process queues a job for it. */
  private readonly workers = new Map<string, string>();

  constructor(
    private readonly connectionString: string,
    private readonly logger: Logger,
    /** pg-boss's schema; tests that run workers use one of their own. */
    private readonly schema = 'pgboss',
    /** pg-boss's own settings, e.g. a shorter maintenance interval in tests. */
    private readonly bossOptions: Omit<PgBoss.ConstructorOptions, 'connectionString' | 'schema'> = {},
  ) {}

  /** Register a queue and its handler; `cron` schedules it in the zone given to start(). */
  register<T extends object>(name: string, handler: JobHandler<T>, opts: JobOptions = {}): void {
    this.registrations.push({ name, handler: handler as JobHandler<object>, cron: opts.cron, options: opts.queue, work: opts.work });
  }

  /**
   * Creates the queues, schedules the cron jobs in `timeZone` (the company's, from its row) and
   * starts the workers. Without a zone (no company row yet) nothing is scheduled until a restart.
   */
  async start({ work = true, timeZone }: { work?: boolean; timeZone: string | null }): Promise<void> {
    const boss = new PgBoss({ max: 4, ...this.bossOptions, connectionString: this.connectionString, schema: this.schema });
    boss.on('error', (err) => this.logger.error({ err }, 'job queue error'));
    // pg-boss installs its schema under a lock, but createQueue takes none: two processes creating
    // queues at once on a new database deadlock (40P01). One process at a time sets up.
    await withSessionLock(this.connectionString, QUEUE_SETUP_LOCK, async () => {
      await boss.start();
      for (const r of this.registrations) {
        await boss.createQueue(r.name, { name: r.name, retryLimit: 5, retryDelay: 30, retryBackoff: true, ...r.options });
        if (r.cron && timeZone) await boss.schedule(r.name, r.cron, {}, { tz: timeZone });
        else if (r.cron) this.logger.warn({ queue: r.name }, 'the company is not set up: scheduled job not scheduled');
      }
    });
    if (work) {
      for (const r of this.registrations) {
        const workerId = await boss.work<object>(r.name, r.work ?? {}, async (jobs) => {
          for (const job of jobs) await r.handler(job.data ?? {}, { id: job.id, name: job.name });
        });
        this.workers.set(r.name, workerId);
      }
    }
    this.boss = boss;
  }

  async send<T extends object>(name: string, data: T, options: PgBoss.SendOptions = {}): Promise<string | null> {
    if (!this.boss) throw new Error(`job queue not started: cannot send ${name}`);
    const id = await this.boss.send(name, data, options);
    // Skip the wait for the next poll when this process works the queue and the job is due now.
    const workerId = this.workers.get(name);
    if (id && workerId && options.startAfter === undefined) this.boss.notifyWorker(workerId);
    return id;
  }

  /** Runs a registered handler directly, for tests and one-off runs. */
  async runNow<T extends object>(name: string, data: T): Promise<void> {
    const r = this.registrations.find((x) => x.name === name);
    if (!r) throw new Error(`no job named ${name}`);
    await r.handler(data, { id: 'direct', name });
  }

  async stop(): Promise<void> {
    // Graceful: workers take no new jobs and finish the current ones (up to 5 s; pg-boss fails what
    // is left, so it is retried), then pg-boss closes its own pool.
    await this.boss?.stop({ graceful: true, wait: true, timeout: 5000 });
    this.boss = null;
    this.workers.clear();
  }
}
