// Largest paint and layout shift of every page of every role: runs the e2e/pages.spec.ts journey
// (axe and PerformanceObserver in Chromium, against the production build served by the compiled
// server on a fresh seeded database), then prints the pages from slowest to fastest largest paint.
// Run through `npm run bench pages`; reads the client build in dist/ (`npx ng build` first).
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT, freePort } from '../lib/proc.mjs';

const URL_ = process.env.BENCH_DATABASE_URL;
if (!URL_) throw new Error('BENCH_DATABASE_URL is not set; run this through npm run bench');
const RESULTS = join(ROOT, 'bench', 'results', 'pages.json');
// Goal on localhost for every page; CLS is web.dev's "good" threshold and the journey asserts it.
const LCP_GOAL_MS = 800;
const CLS_GOOD = 0.1;

if (!existsSync(join(ROOT, 'dist', 'seasonwell', 'browser', 'index.html'))) {
  console.log('pages: no client build in dist/seasonwell; run `npx ng build` first');
  process.exit(0);
}

const [app, mailbox, stripe, smtp] = [await freePort(), await freePort(), await freePort(), await freePort()];
const run = spawnSync(join(ROOT, 'node_modules', '.bin', 'playwright'), ['test', 'e2e/pages.spec.ts'], {
  cwd: ROOT,
  stdio: ['ignore', 'ignore', 'inherit'],
  env: {
    ...process.env,
    E2E_DATABASE_URL: URL_,
    E2E_PORT: String(app),
    E2E_MAILBOX_PORT: String(mailbox),
    E2E_STRIPE_PORT: String(stripe),
    E2E_SMTP_PORT: String(smtp),
    PAGES_RESULTS: RESULTS,
    PW_JSON: join(ROOT, 'test-results', 'bench-pages.json'),
  },
});

if (!existsSync(RESULTS)) {
  console.log('pages: the journey wrote no results');
  process.exit(1);
}
const { pages } = JSON.parse(readFileSync(RESULTS, 'utf8')) as { pages: { role: string; path: string; lcpMs: number | null; cls: number; violations: unknown[] }[] };
const rows = [...pages].sort((a, b) => (b.lcpMs ?? 0) - (a.lcpMs ?? 0));
console.log(`${'role'.padEnd(11)} ${'page'.padEnd(52)} ${'LCP ms'.padStart(7)} ${'CLS'.padStart(6)} axe`);
for (const p of rows) {
  const path = p.path.replace(/[0-9a-f]{8}-[0-9a-f-]{27}/g, ':id');
  console.log(`${p.role.padEnd(11)} ${path.padEnd(52)} ${String(p.lcpMs ?? '—').padStart(7)} ${p.cls.toFixed(3).padStart(6)} ${p.violations.length}`);
}
const slow = rows.filter((p) => (p.lcpMs ?? 0) > LCP_GOAL_MS).length;
const shifty = rows.filter((p) => p.cls >= CLS_GOOD).length;
console.log(`${rows.length} pages; ${slow} over the ${LCP_GOAL_MS} ms largest-paint goal; ${shifty} at or over CLS ${CLS_GOOD}; results in bench/results/pages.json`);
process.exit(run.status ?? 1);
