/**
 * Folder-level import cycles.
 *
 * Reads every TypeScript file under shared/, server/, src/ and scripts/, finds its
 * import / export-from specifiers (a regex, not a parser), resolves relative and alias
 * paths (`@shared/…` → shared/, `@/…` → src/), groups files into folders and prints the
 * strongly connected components of the folder graph that hold more than one folder.
 *
 *   npx tsx scripts/import-cycles.ts            all imports
 *   npx tsx scripts/import-cycles.ts --runtime  ignore `import type` / `export type`
 *
 * Exit code 1 when a cycle is found, so it can gate CI later.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';

const ROOT = resolve(dirname(new URL(import.meta.url).pathname), '..');
const TOP = ['shared', 'server', 'src', 'scripts'];
const runtimeOnly = process.argv.includes('--runtime');

function walk(dir: string, out: string[]): void {
  if (!existsSync(dir)) return;
  for (const name of readdirSync(dir)) {
    if (name === 'node_modules' || name.startsWith('.')) continue;
    const path = join(dir, name);
    if (statSync(path).isDirectory()) walk(path, out);
    else if (/\.(ts|tsx|mts)$/.test(name) && !name.endsWith('.d.ts')) out.push(path);
  }
}

/** The folder a file counts towards: deep enough to separate the layers named in DEVELOPERS.md. */
export function folderOf(rel: string): string {
  const parts = rel.split('/');
  const file = parts.pop()!;
  // Files directly under server/ (entry points, config, ids) are nodes of their own: app.ts wires every
  // folder together and config/ids are read by all, so one "server" node would loop by construction.
  if (parts.length === 1 && parts[0] === 'server') return `server/${file.replace(/\.tsx?$/, '')}`;
  if (parts[0] === 'shared' && parts[1] === 'electrical') return parts.slice(0, 3).join('/');
  if (parts[0] === 'src' && parts[1] === 'features') return parts.slice(0, 3).join('/');
  return parts.slice(0, 2).join('/') || parts[0] || '.';
}

const SPEC = /(?:^|[;\n}])\s*(import|export)\s+(type\s+)?(?:[^'";]*?\sfrom\s+)?['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g;

function resolveSpec(fromFile: string, spec: string): string | null {
  let base: string;
  if (spec.startsWith('.')) base = resolve(dirname(fromFile), spec);
  else if (spec.startsWith('@shared/')) base = join(ROOT, 'shared', spec.slice('@shared/'.length));
  else if (spec.startsWith('@/')) base = join(ROOT, 'src', spec.slice(2));
  else return null; // a package
  const stripped = base.replace(/\.(js|mjs)$/, '');
  for (const candidate of [base, `${stripped}.ts`, `${stripped}.tsx`, `${stripped}.mts`, join(base, 'index.ts'), join(base, 'index.tsx')]) {
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return null;
}

export function folderGraph(): Map<string, Map<string, string[]>> {
  const files: string[] = [];
  for (const top of TOP) walk(join(ROOT, top), files);
  const graph = new Map<string, Map<string, string[]>>();
  for (const file of files) {
    const rel = relative(ROOT, file);
    const from = folderOf(rel);
    if (!graph.has(from)) graph.set(from, new Map());
    const text = readFileSync(file, 'utf8');
    for (const m of text.matchAll(SPEC)) {
      if (runtimeOnly && m[2]) continue;
      const spec = m[3] ?? m[4];
      if (!spec) continue;
      const target = resolveSpec(file, spec);
      if (!target) continue;
      const to = folderOf(relative(ROOT, target));
      if (to === from || !TOP.some((t) => to === t || to.startsWith(`${t}/`))) continue;
      const edges = graph.get(from)!;
      if (!edges.has(to)) edges.set(to, []);
      edges.get(to)!.push(`${rel} → ${relative(ROOT, target)}`);
    }
  }
  return graph;
}

/** Tarjan's strongly connected components. */
export function components(graph: Map<string, Map<string, string[]>>): string[][] {
  let index = 0;
  const idx = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const on = new Set<string>();
  const out: string[][] = [];
  const visit = (v: string): void => {
    idx.set(v, index);
    low.set(v, index++);
    stack.push(v);
    on.add(v);
    for (const w of graph.get(v)?.keys() ?? []) {
      if (!idx.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (on.has(w)) low.set(v, Math.min(low.get(v)!, idx.get(w)!));
    }
    if (low.get(v) === idx.get(v)) {
      const scc: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        on.delete(w);
        scc.push(w);
      } while (w !== v);
      if (scc.length > 1) out.push(scc.sort());
    }
  };
  for (const v of [...graph.keys()].sort()) if (!idx.has(v)) visit(v);
  return out;
}

const graph = folderGraph();
const sccs = components(graph);
const edgeCount = [...graph.values()].reduce((n, e) => n + e.size, 0);
console.log(`${graph.size} folders, ${edgeCount} folder edges${runtimeOnly ? ' (runtime imports only)' : ''}`);
if (sccs.length === 0) console.log('no folder-level import cycles');
for (const scc of sccs) {
  console.log(`\ncycle of ${scc.length} folders: ${scc.join(', ')}`);
  const members = new Set(scc);
  for (const from of scc) {
    for (const [to, why] of graph.get(from) ?? []) {
      if (members.has(to)) console.log(`  ${from} → ${to}  (${why.length}; e.g. ${why[0]})`);
    }
  }
}
process.exitCode = sccs.length > 0 ? 1 : 0;
