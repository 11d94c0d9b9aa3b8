/**
 * The rule-check registry.
 *
 * ## How to add a rule
 * 1. Write a `Rule` in rules.ts (or a new file): a stable kebab-case `id` (never renamed — saved reviews
 *    refer to it), a one-line `title`, the `basis` (the standard's clause, or "common practice" /
 *    "first principles"; say "from memory" when the clause was recalled, not read), and `check(input)`
 *    returning zero or more findings. Messages are plain language and carry the numbers with units;
 *    add a `suggestion` when there is an obvious fix.
 * 2. Set `needs`: 'document' for rules that read the diagram only (they run even when the diagram does
 *    not compile), 'load' for rules that need the solved load case, 'faults' for rules that need the
 *    fault sweep, 'n1' for rules that need the N-1 study (with the load case). A rule never solves
 *    anything itself.
 * 3. Set `ruleSet` only for a rule that belongs to one practice (e.g. 'marine'): it then runs only when
 *    the document's settings.ruleSet is that one. Without it the rule runs for every rule set (it may
 *    still read settings.ruleSet, e.g. to raise its severity).
 * 4. Add it to `RULES` in rules.ts, a test where it fires and one where it does not
 *    (tests/electrical/rules/), and its row in docs/rules.md (a test checks every rule has one).
 * A finding is a design observation, never an approval to install.
 */
import type { DiagramDocument, RuleSet } from '../document/schema';
import type { AnalysisContext } from '../analysis/context';
import type { DiagramTopology } from '../analysis/topology';
import type { AnalysisIssue, FaultSweep, Finding, OperatingPoint, Severity } from '../analysis/types';
import type { ContingencyStudy } from '../analysis/contingency';

export interface RuleInput {
  doc: DiagramDocument;
  topo: DiagramTopology;
  /** Present when the diagram compiled. */
  ctx: AnalysisContext | null;
  /** The solved load case (loads as drawn, chargers off), when it solved. */
  load: OperatingPoint | null;
  /** The fault sweep, when the fault network could be built. */
  faults: FaultSweep | null;
  /** The N-1 study (the load case with each unit disconnected in turn), when there are two or more units in parallel. */
  contingency?: ContingencyStudy | null;
  compileErrors: AnalysisIssue[];
}

export interface Rule {
  id: string;
  title: string;
  severity: Severity;
  basis: string;
  needs: 'document' | 'load' | 'faults' | 'n1';
  /** Runs only under this rule set (settings.ruleSet); omitted: under every rule set. */
  ruleSet?: RuleSet;
  check(input: RuleInput): Finding[];
}

const SEVERITY_ORDER: Record<Severity, number> = { error: 0, warning: 1, note: 2 };

/** Runs the rules whose inputs are available; findings sorted by severity, then rule order. */
export function runRules(rules: readonly Rule[], input: RuleInput): Finding[] {
  const out: Finding[] = [];
  for (const rule of rules) {
    if (rule.ruleSet && rule.ruleSet !== input.doc.settings.ruleSet) continue;
    if (rule.needs === 'load' && (!input.ctx || !input.load)) continue;
    if (rule.needs === 'faults' && (!input.ctx || !input.faults)) continue;
    if (rule.needs === 'n1' && (!input.ctx || !input.load || !input.contingency)) continue;
    out.push(...rule.check(input));
  }
  return out.map((f, i) => ({ f, i })).sort((a, b) => SEVERITY_ORDER[a.f.severity] - SEVERITY_ORDER[b.f.severity] || a.i - b.i).map((x) => x.f);
}
