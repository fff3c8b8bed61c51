// npm run bench: every benchmark in scripts/bench/*.ts, each on a fresh migrated database in a
// throw-away cluster. Benchmarks report ratios measured in one run, never pass/fail timings.
import { existsSync, readdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { clusterHome, createDatabase, databaseUrl, ensureCluster, stopCluster } from './lib/pg.mjs';
import { ROOT, ensureDependencies, freePort, run, say } from './lib/proc.mjs';

ensureDependencies();
const dir = join(ROOT, 'scripts', 'bench');
const only = process.argv[2];
const files = existsSync(dir)
  ? readdirSync(dir)
      .filter((f) => f.endsWith('.ts') && (!only || f.includes(only)))
      .sort()
  : [];
if (!files.length) {
  say('no benchmarks found in scripts/bench');
  process.exit(0);
}

const home = clusterHome(ROOT, `bench-${process.pid}`);
const port = await freePort();
let code = 0;
try {
  const { bin } = await ensureCluster({ home, port, durable: false });
  for (const [i, file] of files.entries()) {
    const name = `bench_${i}`;
    createDatabase(bin, port, name);
    say(`— ${file} —`);
    const url = databaseUrl(port, name);
    if ((await run(process.execPath, ['--import', 'tsx', 'server/cli/migrate.ts'], { env: { ...process.env, DATABASE_URL: url } })) !== 0) throw new Error('migrations failed');
    const c = await run(process.execPath, ['--import', 'tsx', join('scripts', 'bench', file)], { env: { ...process.env, BENCH_DATABASE_URL: url, LOG_LEVEL: 'silent' } });
    if (c !== 0) code = c;
  }
} finally {
  stopCluster({ home });
  rmSync(home, { recursive: true, force: true });
}
process.exit(code);
