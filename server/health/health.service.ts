import type { Database } from '../db/client';

/** True when PostgreSQL answers a trivial query within two seconds. */
export async function databaseIsUp(database: Database): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  try {
    const timeout = new Promise<never>((_, reject) => {
      timer = setTimeout(() => reject(new Error('timeout')), 2000);
    });
    await Promise.race([database.pool.query('select 1'), timeout]);
    return true;
  } catch {
    return false;
  } finally {
    clearTimeout(timer);
  }
}
