/**
 * Summarise a CPU profile from editor-drag.ts --profile: self time by original function (through the
 * client build's source maps; build with `npx vite build --sourcemap` first), top N.
 * Usage: node_modules/.bin/tsx bench/browser/profile-summary.ts [test-results/bench-editor-drag.cpuprofile] [N]
 */
import { existsSync, readFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { SourceMapConsumer, type RawSourceMap } from 'source-map-js';

interface ProfileNode { id: number; callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number }; hitCount?: number }
interface Profile { nodes: ProfileNode[]; samples: number[]; timeDeltas: number[] }

const file = process.argv[2] ?? 'test-results/bench-editor-drag.cpuprofile';
const top = Number(process.argv[3] ?? 30);
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
const byName = new Map<string, number>();
let total = 0;
for (const n of profile.nodes) {
  const ms = self.get(n.id) ?? 0;
  if (!ms) continue;
  total += ms;
  const f = n.callFrame;
  let name = f.functionName || '(anonymous)';
  if (f.url) {
    const m = mapFor(f.url)?.originalPositionFor({ line: f.lineNumber + 1, column: f.columnNumber });
    if (m?.source) name = `${m.name ?? name} ${m.source.replace(/^.*node_modules\//, '').replace(/^(\.\.\/)+/, '')}:${m.line}`;
    else name = `${name} ${basename(f.url)}`;
  }
  byName.set(name, (byName.get(name) ?? 0) + ms);
}
const rows = [...byName].sort((a, b) => b[1] - a[1]).slice(0, top);
console.log(`total sampled ${total.toFixed(0)} ms`);
for (const [name, ms] of rows) console.log(`${ms.toFixed(1).padStart(8)} ms ${((ms / total) * 100).toFixed(1).padStart(5)} %  ${name}`);
