/**
 * Summarise a CPU profile from editor-drag.ts --profile: self time by original function (through the
 * client build's source maps; build with `npx vite build --sourcemap` first), top N.
 * Usage: node_modules/.bin/tsx bench/browser/profile-summary.ts [test-results/bench-editor-drag.cpuprofile] [N] [--inclusive]
 * With --inclusive: total (inclusive) time of the app's own functions (sources under src/ and shared/),
 * which shows which components and hooks the time is spent under.
 */
import { existsSync, readFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { SourceMapConsumer, type RawSourceMap } from 'source-map-js';

interface ProfileNode { id: number; callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number }; hitCount?: number; children?: number[] }
interface Profile { nodes: ProfileNode[]; samples: number[]; timeDeltas: number[] }

const argv = process.argv.slice(2).filter((a) => !a.startsWith('--'));
const INCLUSIVE = process.argv.includes('--inclusive');
const file = argv[0] ?? 'test-results/bench-editor-drag.cpuprofile';
const top = Number(argv[1] ?? 30);
const profile = JSON.parse(readFileSync(file, 'utf8')) as Profile;
const self = new Map<number, number>();
profile.samples.forEach((id, i) => self.set(id, (self.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000));
const maps = new Map<string, SourceMapConsumer | null>();
const mapFor = (url: string) => {
  if (!maps.has(url)) {
    const p = join('dist/client/assets', basename(new URL(url, 'http://x').pathname) + '.map');
    maps.set(url, existsSync(p) ? new SourceMapConsumer(JSON.parse(readFileSync(p, 'utf8')) as RawSourceMap) : null);
  }
  return maps.get(url)!;
};
const nameOf = (n: ProfileNode) => {
  const f = n.callFrame;
  let name = f.functionName || '(anonymous)';
  if (f.url) {
    const m = mapFor(f.url)?.originalPositionFor({ line: f.lineNumber + 1, column: f.columnNumber });
    if (m?.source) name = `${m.name ?? name} ${m.source.replace(/^.*node_modules\//, '').replace(/^(\.\.\/)+/, '')}:${m.line}`;
    else name = `${name} ${basename(f.url)}`;
  }
  return name;
};
const byName = new Map<string, number>();
let total = 0;
if (INCLUSIVE) {
  // Each node's self time counts towards every distinct app function on its stack.
  const parent = new Map<number, ProfileNode>();
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n);
  const names = new Map(profile.nodes.map((n) => [n.id, nameOf(n)]));
  const app = (name: string) => /(^|\s)(src|shared)\//.test(name);
  for (const n of profile.nodes) {
    const ms = self.get(n.id) ?? 0;
    if (!ms) continue;
    total += ms;
    const seen = new Set<string>();
    for (let m: ProfileNode | undefined = byId.get(n.id); m; m = parent.get(m.id)) {
      const name = names.get(m.id)!;
      if (app(name) && !seen.has(name)) {
        seen.add(name);
        byName.set(name, (byName.get(name) ?? 0) + ms);
      }
    }
  }
} else {
  for (const n of profile.nodes) {
    const ms = self.get(n.id) ?? 0;
    if (!ms) continue;
    total += ms;
    const name = nameOf(n);
    byName.set(name, (byName.get(name) ?? 0) + ms);
  }
}
const rows = [...byName].sort((a, b) => b[1] - a[1]).slice(0, top);
console.log(`total sampled ${total.toFixed(0)} ms`);
for (const [name, ms] of rows) console.log(`${ms.toFixed(1).padStart(8)} ms ${((ms / total) * 100).toFixed(1).padStart(5)} %  ${name}`);
