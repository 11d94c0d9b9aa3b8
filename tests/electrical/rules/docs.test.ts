/** docs/rules.md lists every rule in RULES, with the severity, needs and rule set the code gives it. */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { RULES, type Rule } from '../../../shared/electrical/rules';

const DOC = readFileSync(fileURLToPath(new URL('../../../docs/rules.md', import.meta.url)), 'utf8');

const NEEDS: Record<Rule['needs'], string> = { document: 'document', load: 'load case', faults: 'fault sweep', n1: 'N-1 study' };

/** Rows of the rules table: `| \`id\` | title | severity | needs | rule set | basis |`. */
function rows(): Map<string, { title: string; severity: string; needs: string; ruleSet: string; basis: string }> {
  const out = new Map<string, { title: string; severity: string; needs: string; ruleSet: string; basis: string }>();
  for (const line of DOC.split('\n')) {
    const m = /^\| `([a-z0-9-]+)` \|(.*)\|\s*$/.exec(line);
    if (!m) continue;
    const cells = m[2].split('|').map((c) => c.trim());
    if (cells.length !== 5) throw new Error(`docs/rules.md row for ${m[1]} has ${cells.length + 1} cells, not 6`);
    const [title, severity, needs, ruleSet, basis] = cells;
    out.set(m[1], { title, severity, needs, ruleSet, basis });
  }
  return out;
}

describe('docs/rules.md', () => {
  const table = rows();

  it.each(RULES.map((r) => [r.id, r] as const))('lists %s with its severity, needs and rule set', (_id, rule) => {
    const row = table.get(rule.id);
    expect(row, `docs/rules.md has no row for rule "${rule.id}"`).toBeDefined();
    expect(row!.title.length).toBeGreaterThan(5);
    expect(row!.basis.length).toBeGreaterThan(5);
    expect(row!.severity.split(' ')[0]).toBe(rule.severity);
    expect(row!.needs).toBe(NEEDS[rule.needs]);
    expect(row!.ruleSet).toBe(rule.ruleSet ?? 'all');
  });

  it('has no row for a rule that does not exist', () => {
    const known = new Set(RULES.map((r) => r.id));
    expect([...table.keys()].filter((id) => !known.has(id))).toEqual([]);
  });
});
