// Compiles the server into dist/server, so production runs plain Node without a TypeScript loader.
// Our code (server/, shared/) is bundled; every package stays an import of node_modules, so native
// and optional packages (sharp, @node-rs/argon2, pg's optional pg-native) load as they are.
import { build } from 'esbuild';
import { cpSync, rmSync } from 'node:fs';
import { join } from 'node:path';

const ROOT = new URL('..', import.meta.url).pathname.replace(/\/$/, '');
const OUT = join(ROOT, 'dist', 'server');

// Each entry is one self-contained file directly in dist/server (no shared chunks), so
// import.meta.url finds dist/migrations the same way from each (see server/db/migrate.ts).
export const SERVER_ENTRIES = {
  main: 'server/main.ts',
  migrate: 'server/cli/migrate.ts',
  seed: 'server/cli/seed.ts',
  fakes: 'server/fakes/main.ts',
};

export async function buildServer() {
  rmSync(OUT, { recursive: true, force: true });
  await build({
    absWorkingDir: ROOT,
    entryPoints: Object.entries(SERVER_ENTRIES).map(([out, file]) => ({ in: file, out })),
    outdir: OUT,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    sourcemap: true,
    logLevel: 'warning',
  });
  // Migrations ship inside dist, so a deploy needs only dist/ and the package files.
  rmSync(join(ROOT, 'dist', 'migrations'), { recursive: true, force: true });
  cpSync(join(ROOT, 'migrations'), join(ROOT, 'dist', 'migrations'), { recursive: true });
}

if (process.argv[1] === new URL(import.meta.url).pathname) {
  await buildServer();
  console.log('[seasonwell] server compiled into dist/server');
}
