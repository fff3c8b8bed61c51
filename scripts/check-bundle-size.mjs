// Transfer-size budgets for the built client, checked after `ng build`. Angular's own budgets
// (angular.json) count raw bytes; what the browser waits for is the gzip-compressed file, so this
// gzips what the build emitted and fails the build past the limits.
//   goal: initial load ≤ 60 kB gzip, each lazy area (portal, office, field, admin) ≤ 120 kB gzip.
//   Each lazy area's ceiling is the goal itself; the initial load and the signed-out pages fail past
//   the sizes last measured rounded up to the next 10 kB, so that they do not grow unnoticed, and
//   BUNDLE_BUDGET=goal fails the initial load past its goal too.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';

const ROOT = new URL('..', import.meta.url).pathname.replace(/\/$/, '');
const DIST = join(ROOT, 'dist', 'seasonwell');
const BROWSER = join(DIST, 'browser');
export const GOAL = { initial: 60 * 1024, area: 120 * 1024 };
// Measured 104.6 initial, 56.4 sign-in, 111.8 portal, 119.4 office, 115.4 field, 116.3 admin (were
// 120.3 / 174.6 / 189.0 / 126.5 for the areas before the visit page deferred its parts and forms
// loaded their zod schemas on first use). DEVELOPERS.md says how to keep an area under its ceiling.
export const CEILING = { initial: 110 * 1024, signIn: 60 * 1024, portal: GOAL.area, office: GOAL.area, field: GOAL.area, admin: GOAL.area };
/** Every page but the start page loads through this chunk (the icon registry, the guards, the 404 page). */
export const PAGES = 'src/app/pages.routes.ts';
export const AREAS = {
  portal: 'src/app/portal/portal.routes.ts',
  office: 'src/app/office/office.routes.ts',
  field: 'src/app/field/field.routes.ts',
  admin: 'src/app/admin/admin.routes.ts',
};

const gzipCache = new Map();
function gzipSize(file) {
  if (!gzipCache.has(file)) gzipCache.set(file, gzipSync(readFileSync(join(BROWSER, file)), { level: 9 }).length);
  return gzipCache.get(file);
}

/** The files index.html loads before the app can start. */
function initialFiles() {
  const html = readFileSync(join(BROWSER, 'index.html'), 'utf8');
  const files = new Set();
  for (const m of html.matchAll(/<(?:script|link)\b[^>]*?(?:src|href)="([^"]+\.(?:js|css))"/g)) files.add(m[1].replace(/^\//, ''));
  return files;
}

/** esbuild's metafile, written by the build's statsJson option; keys of `outputs` sit under browser/. */
function outputs() {
  const stats = JSON.parse(readFileSync(join(DIST, 'stats.json'), 'utf8'));
  const out = new Map();
  for (const [path, o] of Object.entries(stats.outputs)) {
    if (!path.endsWith('.js')) continue;
    out.set(path.replace(/^browser\//, ''), o);
  }
  return out;
}

const norm = (path) => path.replace(/^browser\//, '');

/** A file and everything it imports statically: what loads together with it. */
function staticClosure(start, graph, into = new Set()) {
  const stack = [start];
  while (stack.length) {
    const file = stack.pop();
    if (into.has(file) || !graph.has(file)) continue;
    into.add(file);
    for (const imp of graph.get(file).imports ?? []) if (imp.kind === 'import-statement') stack.push(norm(imp.path));
  }
  return into;
}

/** Every chunk a lazy import can reach from `start`, through further lazy imports too. */
function lazyTargets(start, graph) {
  const seen = new Set();
  const stack = [start];
  while (stack.length) {
    const file = stack.pop();
    if (seen.has(file) || !graph.has(file)) continue;
    seen.add(file);
    for (const imp of graph.get(file).imports ?? []) stack.push(norm(imp.path));
  }
  return [...seen].filter((f) => f !== start && [...seen].some((g) => (graph.get(g).imports ?? []).some((i) => i.kind === 'dynamic-import' && norm(i.path) === f)));
}

const sum = (files) => [...files].reduce((n, f) => n + gzipSize(f), 0);

/**
 * initial: what index.html loads before the app starts, with the static imports of those files.
 * sign-in: the heaviest signed-out page (or the profile), with the pages chunk every page but the
 * start page loads through.
 * Per area: `gzip` is its heaviest page, the pages chunk, the area's routes chunk and one page's
 * lazy chunk (or a chunk a page defers), each with its static imports, minus what the initial
 * load already has; `all` is every chunk the area can load, for reference.
 */
export function measure() {
  const graph = outputs();
  const initial = new Set();
  for (const f of initialFiles()) {
    if (graph.has(f)) staticClosure(f, graph, initial);
    else initial.add(f);
  }
  const chunkOf = (entry) => {
    const root = [...graph].find(([, o]) => o.entryPoint === entry)?.[0];
    if (!root) throw new Error(`no chunk for ${entry} in stats.json`);
    return root;
  };
  const pagesRoot = chunkOf(PAGES);
  const pagesBase = staticClosure(pagesRoot, graph);
  // The signed-out pages (sign-in and the like) and the profile: the pages chunk's own lazy pages.
  let signIn = { gzip: 0, page: PAGES };
  for (const imp of graph.get(pagesRoot).imports ?? []) {
    const target = norm(imp.path);
    if (imp.kind !== 'dynamic-import' || Object.values(AREAS).includes(graph.get(target)?.entryPoint)) continue;
    const gzip = sum([...staticClosure(target, graph, new Set(pagesBase))].filter((f) => !initial.has(f)));
    if (gzip > signIn.gzip) signIn = { gzip, page: graph.get(target).entryPoint ?? target };
  }
  const areas = {};
  for (const [area, entry] of Object.entries(AREAS)) {
    const root = chunkOf(entry);
    const base = staticClosure(root, graph, new Set(pagesBase));
    let worst = { gzip: sum([...base].filter((f) => !initial.has(f))), page: entry };
    const all = new Set(base);
    for (const target of lazyTargets(root, graph)) {
      const files = staticClosure(target, graph, new Set(base));
      for (const f of files) all.add(f);
      const gzip = sum([...files].filter((f) => !initial.has(f)));
      if (gzip > worst.gzip) worst = { gzip, page: graph.get(target).entryPoint ?? target };
    }
    areas[area] = { gzip: worst.gzip, heaviestPage: worst.page, all: sum([...all].filter((f) => !initial.has(f))) };
  }
  return { initial: { files: initial.size, gzip: sum(initial) }, signIn, areas };
}

if (process.argv[1] === new URL(import.meta.url).pathname) {
  if (!existsSync(join(DIST, 'stats.json'))) {
    console.error('[budgets] dist/seasonwell/stats.json is missing: build with the production configuration (statsJson) first');
    process.exit(1);
  }
  const m = measure();
  const strict = process.env.BUNDLE_BUDGET === 'goal';
  const kb = (n) => `${(n / 1024).toFixed(1)} kB`;
  const failures = [];
  const check = (name, size, goal, ceiling) => {
    const limit = strict ? goal : ceiling;
    if (size > limit) failures.push(`${name} ${kb(size)} > ${kb(limit)}`);
    return `goal ${kb(goal)}, ceiling ${kb(ceiling)}${size > goal ? `, ${kb(size - goal)} over the goal` : ''}`;
  };
  console.log(`[budgets] initial  ${kb(m.initial.gzip).padStart(9)} gzip, ${m.initial.files} files (${check('initial', m.initial.gzip, GOAL.initial, CEILING.initial)})`);
  console.log(
    `[budgets] sign-in  ${kb(m.signIn.gzip).padStart(9)} gzip, heaviest page ${m.signIn.page.replace(/^src\/app\//, '')} (${check('sign-in', m.signIn.gzip, GOAL.area, CEILING.signIn)})`,
  );
  for (const [area, a] of Object.entries(m.areas)) {
    const note = check(area, a.gzip, GOAL.area, CEILING[area]);
    console.log(`[budgets] ${area.padEnd(8)} ${kb(a.gzip).padStart(9)} gzip, heaviest page ${a.heaviestPage.replace(/^src\/app\//, '')}; all its pages ${kb(a.all)} (${note})`);
  }
  if (failures.length) {
    console.error(`[budgets] over the gzip budget: ${failures.join('; ')}`);
    process.exit(1);
  }
}
