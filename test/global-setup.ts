import type { TestProject } from 'vitest/node';
import { fileURLToPath } from 'node:url';
import { clusterHome, createDatabase, databaseUrl, dropDatabase, ensureCluster } from '../scripts/lib/pg.mjs';
import { createDatabase as connect } from '../server/db/client';
import { runMigrations } from '../server/db/migrate';
import { seedDemo } from '../server/db/seed/seed';

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
  }
}

const ROOT = fileURLToPath(new URL('..', import.meta.url));
let dropAtEnd: (() => void) | null = null;

// One fresh, migrated and seeded database per run. `npm test` passes its own cluster's URL;
// a direct `npx vitest` starts a scratch cluster of its own.
export async function setup(project: TestProject): Promise<void> {
  let url = process.env.TEST_DATABASE_URL;
  if (!url) {
    const port = Number(process.env.TEST_PG_PORT ?? 55433);
    const { bin } = await ensureCluster({ home: clusterHome(ROOT, 'test-pg'), port, durable: false });
    const name = `sw_vitest_${process.pid}_${Date.now().toString(36)}`;
    createDatabase(bin, port, name);
    url = databaseUrl(port, name);
    dropAtEnd = () => dropDatabase(bin, port, name);
  }
  await runMigrations(url);
  const database = connect(url, 2);
  await seedDemo(database.db);
  await database.close();
  project.provide('databaseUrl', url);
}

export async function teardown(): Promise<void> {
  dropAtEnd?.();
}
