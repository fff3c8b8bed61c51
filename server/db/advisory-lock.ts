import pg from 'pg';

/** Runs `fn` holding a session advisory lock on a connection of its own, released however it ends. */
export async function withSessionLock<T>(connectionString: string, key: number, fn: () => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString });
  await client.connect();
  try {
    await client.query('select pg_advisory_lock($1)', [key]);
    return await fn();
  } finally {
    // Closing the connection releases the lock too, so a failed unlock needs nothing more.
    await client.query('select pg_advisory_unlock($1)', [key]).catch(() => {});
    await client.end().catch(() => {});
  }
}
