/**
 * npm run -s solve -- [--timing] FILE [FILE...]
 *
 * Solves each network file and prints one JSON line per file (docs/cli.md):
 *   {"file":..., "node_voltages_V":{...}, "element_currents_A":{...}}      or
 *   {"file":..., "error":{"code":..., "message":...}}
 * Exit status 1 when any file failed, else 0. Nothing else goes to stdout.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { performance } from 'node:perf_hooks';
import { parseNetworkJson } from '../shared/electrical/network/parse';
import { solveNetwork } from '../shared/electrical/network/solve';
import type { Network } from '../shared/electrical/network/types';

const args = process.argv.slice(2);
const timing = args.includes('--timing');
const files = args.filter((a) => a !== '--timing');

if (files.length === 0) {
  process.stderr.write('usage: npm run -s solve -- [--timing] FILE [FILE...]\n');
  process.exit(1);
}

/** Median of five solves after one warm-up, each building and solving the system from the parsed network. */
function medianSolveMs(net: Network): number {
  solveNetwork(net);
  const times: number[] = [];
  for (let i = 0; i < 5; i++) {
    const t0 = performance.now();
    solveNetwork(net);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[2];
}

let failed = false;
for (const file of files) {
  let line: object;
  let text: string | null = null;
  try {
    // npm runs scripts from the package root; INIT_CWD is where the command was typed.
    text = readFileSync(resolve(process.env.INIT_CWD ?? process.cwd(), file), 'utf8');
  } catch (e) {
    line = { file, error: { code: 'unreadable_file', message: `cannot read ${file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}` } };
  }
  if (text !== null) {
    const parsed = parseNetworkJson(text);
    if (!parsed.ok) line = { file, error: { code: parsed.error.code, message: parsed.error.message } };
    else {
      const r = solveNetwork(parsed.network);
      if (!r.ok) line = { file, error: { code: r.error.code, message: r.error.message } };
      else {
        line = { file, node_voltages_V: r.node_voltages_V, element_currents_A: r.element_currents_A };
        if (timing) (line as Record<string, unknown>).timing_ms = { solve: medianSolveMs(parsed.network) };
      }
    }
  }
  if ('error' in line!) failed = true;
  process.stdout.write(JSON.stringify(line!) + '\n');
}
process.exitCode = failed ? 1 : 0;
