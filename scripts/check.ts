/**
 * npm run -s check -- DIAGRAM.json [--mode load|charge|equalize|fault|discharge] [--table] [--size] [--apply] [--units metric|us]
 *
 * Reads a diagram file, runs the analysis of the mode (default load) and the rule checks, and prints
 * the result as JSON (default) or as human-readable tables (--table). `--size` adds the sizing
 * suggestions and their checked plan; `--apply` (implies --size) adds the document with the safe
 * suggestions applied and its findings before and after. Relative paths are taken from the directory the
 * command was typed in. Exit status 1 when the file cannot be read, is not a valid diagram (errors with
 * JSON paths), or has structural errors; 0 otherwise (rule findings do not change the exit status).
 * docs/cli.md.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { applySafeSizing, sizeDiagram, type SizingWithPlan } from '../shared/electrical/sizing';
import type { UnitSystem } from '../shared/units/format';
import { parseDiagram } from '../shared/diagram/parse';
import { analyzeDiagram } from '../shared/electrical/study/analyze';
import type { AnalysisMode, AnalysisResult } from '../shared/electrical/analysis/types';

const MODES: AnalysisMode[] = ['load', 'charge', 'equalize', 'fault', 'discharge'];
const CAUTION = 'Design aid only, not an approval to install: confirm against the parts\u2019 own ratings, local codes and licensed practice.';

function usage(message: string): never {
  process.stderr.write(`${message}\nusage: npm run -s check -- DIAGRAM.json [--mode ${MODES.join('|')}] [--table] [--size] [--apply] [--units metric|us]\n`);
  process.exit(1);
}

const args = process.argv.slice(2);
let file: string | undefined;
let mode: AnalysisMode = 'load';
let table = false;
let size = false;
let apply = false;
let units: UnitSystem | undefined;
for (let i = 0; i < args.length; i++) {
  const a = args[i];
  if (a === '--table') table = true;
  else if (a === '--size') size = true;
  else if (a === '--apply') size = apply = true;
  else if (a === '--units' || a.startsWith('--units=')) {
    const v = a.includes('=') ? a.slice(8) : args[++i];
    if (v !== 'metric' && v !== 'us') usage(`unknown unit system "${v ?? ''}" (metric or us)`);
    units = v;
  }
  else if (a === '--mode' || a.startsWith('--mode=')) {
    const v = a.includes('=') ? a.slice(7) : args[++i];
    if (!MODES.includes(v as AnalysisMode)) usage(`unknown mode "${v ?? ''}"`);
    mode = v as AnalysisMode;
  } else if (a.startsWith('--')) usage(`unknown option ${a}`);
  else if (file) usage('give one diagram file');
  else file = a;
}
if (!file) usage('no diagram file given');

let text: string;
try {
  // npm runs scripts from the package root; INIT_CWD is where the command was typed.
  text = readFileSync(resolve(process.env.INIT_CWD ?? process.cwd(), file), 'utf8');
} catch (e) {
  const out = { file, ok: false, stage: 'read', errors: [{ code: 'unreadable_file', message: `cannot read ${file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}` }] };
  if (table) process.stderr.write(`${out.errors[0].message}\n`);
  else process.stdout.write(JSON.stringify(out) + '\n');
  process.exit(1);
}

const parsed = parseDiagram(text);
if (!parsed.ok) {
  if (table) {
    process.stderr.write(`${file}: not a valid diagram (${parsed.totalErrors} error${parsed.totalErrors === 1 ? '' : 's'})\n`);
    for (const e of parsed.errors) process.stderr.write(`  ${e.path}: ${e.message}\n`);
  } else {
    process.stdout.write(JSON.stringify({ file, ok: false, stage: 'parse', errors: parsed.errors.map((e) => ({ code: 'invalid_diagram', ...e })), totalErrors: parsed.totalErrors }) + '\n');
  }
  process.exit(1);
}

const result = analyzeDiagram(parsed.doc, { mode });
// Structural errors (an open terminal, a short …) exit 1 even when the connected remainder was analysed.
const structural = (!result.ok && result.stage === 'compile') || (result.ok && (result.notConnected?.length ?? 0) > 0);
const sizing: SizingWithPlan | null = size ? sizeDiagram(parsed.doc, units ? { unitSystem: units } : {}) : null;
let applied: { document: unknown; applied: string[]; refused: { source: string; reasons: string[] }[]; findingsBefore: unknown[]; findingsAfter: unknown[] } | null = null;
if (apply && sizing?.ok) {
  const document = applySafeSizing(parsed.doc, sizing);
  const before = analyzeDiagram(parsed.doc, { mode: 'load' });
  const after = analyzeDiagram(document, { mode: 'load' });
  applied = { document, applied: sizing.plan.safe, refused: sizing.plan.refused, findingsBefore: before.findings, findingsAfter: after.findings };
}

if (!table) {
  const extra = {
    ...(sizing ? { sizing } : {}),
    ...(applied ? { document: applied.document, apply: { applied: applied.applied, refused: applied.refused, findingsBefore: applied.findingsBefore, findingsAfter: applied.findingsAfter } } : {}),
  };
  process.stdout.write(JSON.stringify({ file, caution: CAUTION, ...result, ...extra }) + '\n');
  process.exit(structural || !result.ok ? 1 : 0);
}

// --- Tables -------------------------------------------------------------------------------------------
const n = (x: number | null | undefined, d = 1) => (x === null || x === undefined ? '—' : x.toFixed(d));
function print(title: string, head: string[], rows: (string | number)[][], textColumns = 1) {
  if (!rows.length) return;
  const cells = [head, ...rows.map((r) => r.map(String))];
  const w = head.map((_, i) => Math.max(...cells.map((r) => r[i].length)));
  process.stdout.write(`\n${title}\n`);
  cells.forEach((r, k) => {
    process.stdout.write(r.map((c, i) => (i < textColumns ? c.padEnd(w[i]) : c.padStart(w[i]))).join('  ') + '\n');
    if (k === 0) process.stdout.write(w.map((x) => '-'.repeat(x)).join('  ') + '\n');
  });
}

function tables(r: AnalysisResult) {
  process.stdout.write(`${parsed.ok && parsed.doc.name ? parsed.doc.name : file} — mode ${r.mode}\n${CAUTION}\n`);
  if (!r.ok) {
    print(`Errors (${r.stage})`, ['code', 'parts', 'message'], r.errors.map((e) => [e.code, e.parts.join(', '), e.message]));
  } else {
    const b = r.bank;
    process.stdout.write(`\nBank: ${n(b.nominal_V)} V nominal, ${n(b.capacity_Ah, 0)} Ah, ${n(b.energy_Wh / 1000, 2)} kWh, ${b.units} unit(s)` +
      `${b.cRate !== null ? `, ${n(b.cRate, 2)} C in the load case` : ''}\n`);
    for (const [id, inv] of Object.entries(b.inverters)) {
      process.stdout.write(`Inverter ${id}: ${inv.power_W} W at ${(inv.efficiency * 100).toFixed(0)} % → ${n(inv.dcCurrentAtNominal_A)} A DC at nominal\n`);
    }
    const op = r.operating;
    if (op) {
      print('Batteries', ['id', 'current A', 'share %', 'ideal %', 'dev pp', 'terminal V', 'C-rate', 'loss W'],
        Object.entries(op.sources).map(([id, s]) => [id, n(s.current_A), n(s.share_pct), n(s.idealShare_pct), n(s.deviation_pp, 2), n(s.terminal_V, 3), n(s.cRate, 2), n(s.loss_W, 2)]));
      process.stdout.write(`Imbalance ${n(op.imbalance_pct)} %, total loss ${n(op.losses.total_W, 1)} W\n`);
      print('Cables', ['id', 'current A', 'drop V', 'loss W', 'ampacity A', 'use %'],
        Object.entries(op.cables).map(([id, c]) => [id, n(c.current_A), n(c.drop_V, 3), n(c.loss_W, 2), n(c.ampacity_A, 0), n(c.utilisation_pct, 0)]));
      print('Parts', ['id', 'type', 'current A', 'voltage V', 'drop %', 'rating A', 'use %', 'loss W'],
        Object.entries(op.parts).map(([id, p]) => [id, p.type, n(p.current_A ?? p.maxSegmentCurrent_A), n(p.voltage_V, 3), n(p.drop_pct, 2), n(p.rating_A, 0), n(p.utilisation_pct, 0), n(p.loss_W, 2)]));
    }
    if (r.faults && (r.mode === 'fault' || r.mode === 'load')) {
      print(`Prospective fault current at each fuse (${r.faults.cases.length} cases, ${r.faults.fault_ohm * 1000} mΩ fault)`, ['fuse', 'max A', 'case'],
        Object.entries(r.faults.maxByFuse).map(([id, m]) => [id, n(m.current_A, 0), r.faults!.cases[m.case]?.label ?? '—']));
    }
    if (r.faultCase) process.stdout.write(`\nFault case: ${r.faultCase.label}: ${n(r.faultCase.faultCurrent_A, 0)} A in the fault\n`);
    if (r.charge) process.stdout.write(`\nCharging: ${n(r.charge.totalCharge_A)} A from ${Object.keys(r.charge.chargers).join(', ')}\n`);
    if (r.equalize) process.stdout.write(`\nEqualization: largest initial current ${n(r.equalize.maxCurrent_A)} A (${r.equalize.between.join(' ↔ ')})\n`);
    if (r.discharge) {
      const d = r.discharge;
      process.stdout.write(`\nDischarge: ${n(d.duration_h, 2)} h until ${d.stoppedBy}${d.firstEmpty ? ` (${d.firstEmpty} first)` : ''}; usable ${n(d.usable_Ah, 0)} Ah of ${n(d.nameplate_Ah, 0)} Ah (${n(d.usable_pct)} %), ${d.steps} steps\n`);
    }
  }
  print('Findings', ['severity', 'rule', 'parts', 'message'], r.findings.map((f) => [f.severity, f.id, f.parts.join(', '), f.message]), 4);
  if (!r.findings.length) process.stdout.write('\nFindings: none\n');
}
tables(result);
if (sizing) {
  if (!sizing.ok) process.stdout.write(`\nSizing: not possible — ${sizing.errors.map((e) => e.message).join('; ')}\n`);
  else {
    print('Sizing (suggestions, not approval to install)', ['unit', 'share A', 'N-1 A', 'needs A', 'fuse', 'min conductor', 'status'],
      sizing.branches.map((b) => [b.source, n(b.share_A), n(b.nMinusOne_A), n(b.required_A), `${b.fuse.rating_A} A ${b.fuse.fuseClass}`, b.minimumConductor ? `${b.minimumConductor.size} ${b.minimumConductor.system}` : '—', b.status]));
    const plan = sizing.plan;
    process.stdout.write(`Plan: ${plan.pending.length} to change; ${plan.all ? (plan.all.safe ? 'all safe together' : `not all safe (${plan.all.reasons.join(' ')})`) : 'nothing to change'}; safe set: ${plan.safe.join(', ') || 'none'}\n`);
    for (const r of plan.refused) process.stdout.write(`  refused ${r.source}: ${r.reasons.join(' ')}\n`);
  }
}
if (applied) {
  const count = (fs: unknown[], sev: string) => (fs as { severity: string }[]).filter((f) => f.severity === sev).length;
  process.stdout.write(`\nApplied ${applied.applied.length} suggestion(s): errors ${count(applied.findingsBefore, 'error')} → ${count(applied.findingsAfter, 'error')}, warnings ${count(applied.findingsBefore, 'warning')} → ${count(applied.findingsAfter, 'warning')} (the document is in the JSON output)\n`);
}
process.exit(structural || !result.ok ? 1 : 0);
