/**
 * npm run bench [-- --only TEXT] [-- --json]
 *
 * Runs every case exported by bench/*.bench.ts (see registry.ts) and prints a table. Cases marked
 * `memory` run in a fresh child process so their peak RSS is their own.
 */
import { execFile } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { runCase, type BenchCase, type BenchResult } from './registry';

const here = dirname(fileURLToPath(import.meta.url));
const args = process.argv.slice(2);
const flag = (name: string) => {
  const i = args.indexOf(name);
  return i >= 0 ? (args[i + 1] ?? '') : undefined;
};

type Loaded = BenchCase & { file: string };

async function loadCases(only?: string): Promise<Loaded[]> {
  const files = readdirSync(here).filter((f) => f.endsWith('.bench.ts') && (only === undefined || f === only)).sort();
  const all: Loaded[] = [];
  for (const f of files) {
    const mod = (await import(pathToFileURL(join(here, f)).href)) as { cases?: BenchCase[] };
    for (const c of mod.cases ?? []) all.push({ ...c, file: f });
  }
  return all;
}

/** Runs a case in a fresh process that loads only the case's own file. */
function runInChild(c: Loaded): Promise<BenchResult> {
  const name = c.name;
  return new Promise((resolve, reject) => {
    execFile(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), '--child', name, '--file', c.file], { maxBuffer: 16 * 2 ** 20, timeout: 170_000 }, (err, stdout, stderr) => {
      if (err) return reject(new Error(`${name}: ${err.message}\n${stderr}`));
      resolve(JSON.parse(stdout.trim().split('\n').pop()!));
    });
  });
}

const fmt = (x: number | null | undefined, digits = 2) => (x === null || x === undefined ? '' : x.toFixed(digits));

function table(results: BenchResult[]): string {
  const rows = [['case', 'samples', 'median ms', 'min ms', 'max ms', 'target ms', 'peak RSS MB', 'RSS before MB', 'peak heap MB', 'target MB']];
  for (const r of results) {
    rows.push([
      r.name,
      r.skipped ? `skipped: ${r.skipped}` : String(r.samples),
      fmt(r.medianMs, r.medianMs !== null && r.medianMs < 10 ? 3 : 1),
      fmt(r.minMs, r.minMs !== null && r.minMs < 10 ? 3 : 1),
      fmt(r.maxMs, r.maxMs !== null && r.maxMs < 10 ? 3 : 1),
      r.targetMs !== undefined ? `<= ${r.targetMs}` : '',
      fmt(r.peakRssMb, 0),
      fmt(r.baselineRssMb, 0),
      fmt(r.peakHeapMb, 0),
      r.targetMb !== undefined ? `< ${r.targetMb}` : '',
    ]);
  }
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  const line = (r: string[]) => `| ${r.map((x, c) => x.padEnd(widths[c])).join(' | ')} |`;
  return [line(rows[0]), `|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`, ...rows.slice(1).map(line)].join('\n');
}

async function main() {
  const child = flag('--child');
  const cases = await loadCases(child !== undefined ? flag('--file') : undefined);
  if (child !== undefined) {
    const c = cases.find((x) => x.name === child);
    if (!c) throw new Error(`no bench case ${child}`);
    process.stdout.write(JSON.stringify(await runCase(c)) + '\n');
    return;
  }
  const only = flag('--only');
  const selected = only ? cases.filter((c) => c.name.includes(only)) : cases;
  const results: BenchResult[] = [];
  const t0 = performance.now();
  const loadBefore = loadavg();
  for (const c of selected) {
    process.stderr.write(`running ${c.name} ...\n`);
    results.push(c.memory ? await runInChild(c) : await runCase(c));
  }
  if (args.includes('--json')) {
    process.stdout.write(JSON.stringify(results, null, 2) + '\n');
    return;
  }
  const la = (x: number[]) => x.map((v) => v.toFixed(2)).join(' ');
  process.stdout.write(`Node ${process.version}, ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown cpu'}); load average (1, 5, 15 min) ${la(loadBefore)} before, ${la(loadavg())} after\n\n`);
  process.stdout.write(table(results) + '\n');
  const notes = results.filter((r) => r.note).map((r) => `- ${r.name}: ${r.note}`);
  if (notes.length) process.stdout.write(`\n${notes.join('\n')}\n`);
  process.stdout.write(`\ntotal ${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
}

main().catch((e) => {
  process.stderr.write(`${(e as Error).stack ?? e}\n`);
  process.exit(1);
});
