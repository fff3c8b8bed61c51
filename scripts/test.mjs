// npm test: a fresh clone to every test layer, then one line totalled over all of them.
// Plain Node with built-ins only, because it runs before node_modules exists.
import { mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { clusterHome, createDatabase, databaseUrl, ensureCluster, stopCluster } from './lib/pg.mjs';
import { BIN, ROOT, buildClient, buildServer, ensureChromium, ensureDependencies, freePort, run, say } from './lib/proc.mjs';

const started = Date.now();
const reports = join(ROOT, '.test-runs', String(process.pid));
mkdirSync(reports, { recursive: true });

// A cluster of its own per run, on a free port, without fsync: fast and thrown away afterwards.
const pgHome = clusterHome(ROOT, `test-run-${process.pid}`);
let pgUp = false;
const results = [];

function readJson(file) {
  try {
    return JSON.parse(readFileSync(file, 'utf8'));
  } catch {
    return null;
  }
}

/** Counts from a vitest JSON report (used by both vitest and ng test). */
function vitestCounts(file) {
  const r = readJson(file);
  if (!r) return null;
  return { passed: r.numPassedTests ?? 0, failed: (r.numFailedTests ?? 0) + (r.numFailedTestSuites && !r.numFailedTests ? r.numFailedTestSuites : 0) };
}

function playwrightCounts(file) {
  const r = readJson(file);
  if (!r?.stats) return null;
  return { passed: (r.stats.expected ?? 0) + (r.stats.flaky ?? 0), failed: r.stats.unexpected ?? 0 };
}

async function layer(name, fn, counts) {
  say(`— ${name} —`);
  const t = Date.now();
  let code = 1;
  try {
    code = await fn();
  } catch (err) {
    process.stderr.write(`[seasonwell] ${name}: ${err instanceof Error ? err.message : err}\n`);
  }
  let c = counts();
  // A layer that crashed before reporting counts as one failure, never as a pass.
  if (!c) c = { passed: 0, failed: 1 };
  if (code !== 0 && c.failed === 0) c.failed = 1;
  results.push({ name, ...c, seconds: Math.round((Date.now() - t) / 1000) });
}

let exitCode = 1;
try {
  ensureDependencies();
  ensureChromium();

  // Lint counts as one check: ESLint (with the project's own rules) and Prettier's check both pass.
  let lintCode = 1;
  await layer(
    'lint (ESLint, Prettier)',
    async () => {
      const eslint = await run(join(BIN, 'eslint'), ['.']);
      const prettier = await run(join(BIN, 'prettier'), ['--check', '--log-level=warn', '.']);
      lintCode = eslint === 0 && prettier === 0 ? 0 : 1;
      return lintCode;
    },
    () => (lintCode === 0 ? { passed: 1, failed: 0 } : { passed: 0, failed: 1 }),
  );
  const pgPort = await freePort();
  await ensureCluster({ home: pgHome, port: pgPort, durable: false });
  pgUp = true;
  const { findPgBin } = await import('./lib/pg.mjs');
  const bin = findPgBin();
  createDatabase(bin, pgPort, 'sw_unit');
  createDatabase(bin, pgPort, 'sw_e2e');

  await buildClient({ force: true });
  await buildServer({ force: true });

  await layer(
    'server and shared (vitest)',
    () =>
      run(join(BIN, 'vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${join(reports, 'vitest.json')}`], {
        env: { ...process.env, TEST_DATABASE_URL: databaseUrl(pgPort, 'sw_unit') },
      }),
    () => vitestCounts(join(reports, 'vitest.json')),
  );

  await layer(
    'components (ng test)',
    () =>
      run(join(BIN, 'ng'), ['test', '--watch=false', '--reporters=json', '--reporters=default', `--output-file=${join(reports, 'ng-test.json')}`], {
        env: { ...process.env, NG_CLI_ANALYTICS: 'false', CI: 'true' },
      }),
    () => vitestCounts(join(reports, 'ng-test.json')),
  );

  const [appPort, smtpPort, mailboxPort, stripePort] = [await freePort(), await freePort(), await freePort(), await freePort()];
  await layer(
    'browser journeys (Playwright, Chromium)',
    () =>
      run(join(BIN, 'playwright'), ['test'], {
        env: {
          ...process.env,
          E2E_DATABASE_URL: databaseUrl(pgPort, 'sw_e2e'),
          E2E_PORT: String(appPort),
          E2E_SMTP_PORT: String(smtpPort),
          E2E_MAILBOX_PORT: String(mailboxPort),
          E2E_STRIPE_PORT: String(stripePort),
          PW_JSON: join(reports, 'playwright.json'),
        },
      }),
    () => playwrightCounts(join(reports, 'playwright.json')),
  );

  const failed = results.reduce((n, r) => n + r.failed, 0);
  exitCode = failed === 0 ? 0 : 1;
} catch (err) {
  process.stderr.write(`[seasonwell] ${err instanceof Error ? err.message : String(err)}\n`);
  results.push({ name: 'set-up', passed: 0, failed: 1, seconds: 0 });
  exitCode = 1;
} finally {
  if (pgUp) stopCluster({ home: pgHome });
  rmSync(pgHome, { recursive: true, force: true });
  rmSync(reports, { recursive: true, force: true });
}

const passed = results.reduce((n, r) => n + r.passed, 0);
const failed = results.reduce((n, r) => n + r.failed, 0);
say('');
for (const r of results) say(`${r.name}: ${r.passed} passed, ${r.failed} failed (${r.seconds} s)`);
say(`total time ${Math.round((Date.now() - started) / 1000)} s`);
process.stdout.write(`${passed} passed, ${failed} failed\n`);
process.exit(exitCode);
