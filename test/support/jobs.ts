import { randomUUID } from 'node:crypto';
import pg from 'pg';
import { pino } from 'pino';
import { inject } from 'vitest';
import type { AppDeps } from '../../server/deps';
import { Jobs } from '../../server/jobs/queue';
import { registerMailJobs } from '../../server/mail/mail.jobs';

/**
 * A real pg-boss queue with workers, in a pg-boss schema of its own so no other test file's worker
 * takes its jobs. Registers the mail queue (retried after 1 s instead of 30 s) plus whatever
 * `register` adds, puts the queue into deps.jobs and starts it; stop() puts back what was
 * there. With `work: false` jobs are queued and nobody takes them.
 */
export async function startTestJobs(
  deps: AppDeps,
  { register = () => {}, work = true }: { register?: (jobs: Jobs) => void; work?: boolean } = {},
): Promise<{ jobs: Jobs; stop(): Promise<void> }> {
  const before = deps.jobs;
  const url = inject('databaseUrl');
  const schema = `pgboss_t_${randomUUID().replace(/-/g, '').slice(0, 12)}`;
  const jobs = new Jobs(url, pino({ level: 'silent' }), schema);
  deps.jobs = jobs;
  registerMailJobs(deps, { retryDelay: 1, retryBackoff: false });
  register(jobs);
  await jobs.start({ work, timeZone: 'America/Chicago' });
  return {
    jobs,
    async stop() {
      await jobs.stop();
      if (deps.jobs === jobs) deps.jobs = before;
      const client = new pg.Client({ connectionString: url });
      await client.connect();
      try {
        await client.query(`drop schema if exists "${schema}" cascade`);
      } finally {
        await client.end();
      }
    },
  };
}
