/** Names of parts and cables as the designer wrote them, for the panels and for messages. */
import type { DiagramDocument } from '@shared/diagram';
import { PART_TYPES } from '@shared/electrical/parts';
import { AMPACITY_TABLES } from '@shared/electrical/tables/ampacity';
import { useEffect, useMemo, useState } from 'react';
import { useEditorStore } from '../store';

export type LabelOf = (id: string) => string;

/**
 * A name for every part and cable: its label; an unlabelled part its type and a number ("Fuse #2");
 * an unlabelled cable its two ends ("cable from Fuse 1 to Battery 2 +").
 */
function namesOf(doc: DiagramDocument): Map<string, string> {
  const names = new Map<string, string>();
  const count = new Map<string, number>();
  for (const p of doc.parts) {
    const n = (count.get(p.type) ?? 0) + 1;
    count.set(p.type, n);
    names.set(p.id, p.label || `${PART_TYPES[p.type]?.name ?? 'Part'} #${n}`);
  }
  const end = (e: { part: string; terminal: string }) => `${names.get(e.part) ?? 'a removed part'}${e.terminal === 'pos' ? ' +' : e.terminal === 'neg' ? ' −' : ''}`;
  for (const c of doc.cables) names.set(c.id, c.label || `cable from ${end(c.from)} to ${end(c.to)}`);
  return names;
}

export function labelsOf(doc: DiagramDocument): LabelOf {
  const names = namesOf(doc);
  return (id) => {
    const hit = names.get(id);
    if (hit) return hit;
    // A series-string member: "<string>/b<k>".
    const m = /^(.+)\/b(\d+)$/.exec(id);
    if (m && names.has(m[1])) return `${names.get(m[1])}, battery ${m[2]}`;
    return id;
  };
}

/** The diagram's part/cable names; changes only when the document does. */
export function useLabels(): LabelOf {
  const doc = useEditorStore((s) => s.doc);
  return useMemo(() => labelsOf(doc), [doc]);
}

/**
 * Parts named by label in a message the core wrote: "Battery 2 (bat2)" reads "Battery 2", an id
 * standing alone ("c-pos1 carries 52.7 A") is replaced by its name, and an ampacity table id by the
 * table's name. Ids that are plain words (a part whose id is "inverter") are left alone, so the
 * message's own words never change.
 */
export function plainTextOf(doc: DiagramDocument): (text: string) => string {
  const names = namesOf(doc);
  const esc = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  // "Label (id)" → "Label"; an unlabelled part's "Battery bat1" → its name.
  const pairs = new Map<string, string>();
  for (const x of [...doc.parts, ...doc.cables]) if (x.label && x.label !== x.id) pairs.set(`${x.label} (${x.id})`, x.label);
  for (const p of doc.parts) if (!p.label && PART_TYPES[p.type]) pairs.set(`${PART_TYPES[p.type].name} ${p.id}`, names.get(p.id)!);
  const paired = pairs.size ? new RegExp([...pairs.keys()].sort((a, b) => b.length - a.length).map(esc).join('|'), 'g') : null;
  const tables = Object.values(AMPACITY_TABLES).map((t) => [t.id, t.name] as const);
  // Longest first, so "c-pos10" is not read as "c-pos1" followed by "0"; a series-string member is "<string>/b<k>".
  const ids = [...names.keys(), ...tables.map(([id]) => id)].filter((id) => /[\d_/.-]/.test(id)).sort((a, b) => b.length - a.length);
  const bare = ids.length ? new RegExp(`(?<![\\w/.-])(${ids.map(esc).join('|')})(?:/b(\\d+))?(?![\\w/-])`, 'g') : null;
  const tableNames = new Map<string, string>(tables);
  return (text) => {
    let out = paired ? text.replace(paired, (m) => pairs.get(m) ?? m) : text;
    if (bare) {
      out = out.replace(bare, (m, id: string, k: string | undefined, at: number) => {
        const name = names.get(id) ?? tableNames.get(id);
        if (!name) return m;
        const shown = `${name}${k ? `, battery ${k}` : ''}`;
        return at === 0 ? shown[0].toUpperCase() + shown.slice(1) : shown;
      });
    }
    return out;
  };
}

/** `plainTextOf` for the editor's document; changes only when the document does. */
export function usePlainText(): (text: string) => string {
  const doc = useEditorStore((s) => s.doc);
  return useMemo(() => plainTextOf(doc), [doc]);
}

/**
 * Titles of what the core reports outside the rule registry: the structural errors (each reported
 * by the structural rule as "structure-<code>"), solver errors and notes, and analysis notes.
 */
const CORE_TITLES: Record<string, string> = {
  empty_diagram: 'Nothing to analyse',
  no_source: 'No battery or charger',
  floating_part: 'Part not connected',
  unconnected_terminal: 'Terminal not connected',
  disconnected_circuit: 'Parts not connected to the bank',
  invalid_value: 'Value that is not a number',
  zero_resistance_loop: 'Sources in a loop with no resistance',
  shorted_source: 'Short circuit',
  reversed_polarity: 'Reversed polarity',
  unequal_parallel_voltage: 'Unequal voltages in parallel',
  open_switch: 'Switch open',
  no_table_value: 'No table value for this conductor',
  no_fault_study: 'No fault study',
  no_charger: 'No charger switched on',
  unknown_fault: 'Fault case not in the diagram',
  analysis_failed: 'The analysis failed',
  below_v_min: 'Load below its minimum voltage',
  current_limit: 'Charger at its current limit',
  singular_network: 'Circuit cannot be solved',
  floating_node: 'Point with no path to the bank',
  no_convergence: 'Solution did not settle',
  malformed_network: 'Circuit cannot be built',
  unknown_node: 'Circuit cannot be built',
  unknown_element: 'Circuit cannot be built',
  duplicate_id: 'Circuit cannot be built',
  'equalization-current-over-fuse': 'Equalizing current above a fuse rating',
  'equalization-current-over-ampacity': 'Equalizing current above a cable ampacity',
};

/** "current-imbalance" → "Current imbalance": a readable stand-in for a code with no title yet. */
function readable(code: string): string {
  const words = code.replace(/^structure-/, '').replace(/[-_]+/g, ' ').trim();
  return words ? words[0].toUpperCase() + words.slice(1) : 'Finding';
}

/**
 * A finding's plain-language title: the rule's title from the registry, the title of a structural,
 * solver or analysis code, or the code written as words — never the code itself.
 */
export function findingTitle(code: string, ruleTitles: ReadonlyMap<string, string> | null): string {
  const rule = ruleTitles?.get(code);
  if (rule) return rule;
  const core = CORE_TITLES[code] ?? (code.startsWith('structure-') ? CORE_TITLES[code.slice('structure-'.length).replace(/-/g, '_')] : undefined);
  return core ?? readable(code);
}

let ruleTitles: Map<string, string> | null = null;

/** Rule titles by rule id, loaded with the rule registry on first use (ids are shown until then). */
export function useRuleTitles(): Map<string, string> | null {
  const [titles, setTitles] = useState(ruleTitles);
  useEffect(() => {
    if (titles) return;
    let live = true;
    import('@shared/electrical/rules/rules')
      .then(({ RULES }) => {
        ruleTitles = new Map(RULES.map((r) => [r.id, r.title]));
        if (live) setTitles(ruleTitles);
      })
      .catch(() => {});
    return () => {
      live = false;
    };
  }, [titles]);
  return titles;
}
