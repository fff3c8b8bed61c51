// The server's import graph: no file may reach itself through its imports (type-only imports
// included, since they tie modules together for a reader just the same), and nothing in server/
// may import the Angular client.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(__dirname, '..');
const SERVER = join(ROOT, 'server');
const CLIENT = join(ROOT, 'src');

function tsFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return tsFiles(path);
    return name.endsWith('.ts') && !name.endsWith('.d.ts') ? [path] : [];
  });
}

/** The file a relative specifier points at, as TypeScript's bundler resolution finds it. */
function resolveLocal(from: string, spec: string): string | null {
  if (!spec.startsWith('.')) return null;
  const base = resolve(dirname(from), spec.replace(/\.js$/, ''));
  for (const candidate of [base, `${base}.ts`, join(base, 'index.ts')]) {
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return null;
}

function importsOf(file: string): string[] {
  // readImportFiles and detectJavaScriptImports: static, type-only and dynamic imports, re-exports.
  const info = ts.preProcessFile(readFileSync(file, 'utf8'), true, true);
  return info.importedFiles.map((f) => f.fileName);
}

/** Strongly connected components (Tarjan); any with more than one file, or a self-import, is a cycle. */
function cycles(graph: Map<string, string[]>): string[][] {
  let index = 0;
  const stack: string[] = [];
  const onStack = new Set<string>();
  const idx = new Map<string, number>();
  const low = new Map<string, number>();
  const found: string[][] = [];
  const visit = (v: string) => {
    idx.set(v, index);
    low.set(v, index++);
    stack.push(v);
    onStack.add(v);
    for (const w of graph.get(v) ?? []) {
      if (!idx.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) {
        low.set(v, Math.min(low.get(v)!, idx.get(w)!));
      }
    }
    if (low.get(v) === idx.get(v)) {
      const scc: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        scc.push(w);
      } while (w !== v);
      if (scc.length > 1 || (graph.get(v) ?? []).includes(v)) found.push(scc.sort());
    }
  };
  for (const v of graph.keys()) if (!idx.has(v)) visit(v);
  return found;
}

describe('server import graph', () => {
  const files = tsFiles(SERVER);
  const graph = new Map<string, string[]>();
  const clientImports: string[] = [];
  for (const file of files) {
    const targets: string[] = [];
    for (const spec of importsOf(file)) {
      const target = resolveLocal(file, spec);
      if (!target) continue;
      if (target.startsWith(CLIENT + '/')) clientImports.push(`${relative(ROOT, file)} imports ${spec}`);
      if (target.startsWith(SERVER + '/')) targets.push(target);
    }
    graph.set(file, targets);
  }

  it('finds the server files and their imports', () => {
    expect(files.length).toBeGreaterThan(50);
    expect(graph.get(join(SERVER, 'app.ts'))).toContain(join(SERVER, 'routes.ts'));
  });

  it('has no import cycle', () => {
    const list = cycles(graph).map((scc) => scc.map((f) => relative(ROOT, f)).join(' → '));
    expect(list, `import cycles:\n${list.join('\n')}`).toEqual([]);
  });

  it('never imports the client from src/', () => {
    expect(clientImports).toEqual([]);
  });
});
