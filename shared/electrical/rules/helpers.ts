/** Small helpers the rule checks share: number formats for messages, part names, the bank's batteries. */
import { stringMembers, type BatteryProps } from '../parts/battery';
import type { DiagramPart } from '../document/schema';
import { PART_TYPES } from '../parts/registry';
import type { RuleInput } from './registry';

export { amps } from '../analysis/format';
export const volts = (x: number) => `${x.toFixed(2)} V`;
export const pct = (x: number) => `${x.toFixed(1)} %`;
/** "300 mm (11.8 in)". */
export const mmAndIn = (m: number) => `${(m * 1000).toFixed(0)} mm (${(m / 0.0254).toFixed(1)} in)`;

/**
 * A part or cable as the designer knows it: its label ("Battery 1"); an unlabelled part by its kind and
 * id ("Fuse f3"); an unlabelled cable by its ends ("the cable from Battery 1 + to Fuse 1"). Start a sentence
 * with `cap(name(…))`.
 */
export function name(input: Pick<RuleInput, 'topo'>, id: string): string {
  const p = input.topo.parts.get(id);
  if (p) return partName(p);
  const c = input.topo.cables.get(id);
  if (!c) return id;
  if (c.label) return c.label;
  const end = (t: { part: string; terminal: string }) => {
    const q = input.topo.parts.get(t.part);
    const sign = t.terminal === 'pos' ? ' +' : t.terminal === 'neg' ? ' \u2212' : '';
    return `${q ? partName(q) : t.part}${sign}`;
  };
  return `the cable from ${end(c.from)} to ${end(c.to)}`;
}

function partName(p: DiagramPart): string {
  return p.label || `${PART_TYPES[p.type].name} ${p.id}`;
}

/** The text with its first letter in capitals (for a name that starts a sentence). */
export const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** "A", "A and B", "A, B and C". */
export function list(xs: string[]): string {
  return xs.length <= 1 ? (xs[0] ?? '') : `${xs.slice(0, -1).join(', ')} and ${xs[xs.length - 1]}`;
}

export function membersOf(p: DiagramPart): BatteryProps[] {
  if (p.type === 'battery') return [p.props];
  if (p.type === 'series_string') return stringMembers(p.props);
  return [];
}

export const allBatteries = (input: RuleInput) => input.topo.sources.flatMap((s) => membersOf(s).map((b) => ({ part: s.id, b })));

export function distinct<T>(xs: T[]): T[] {
  return [...new Set(xs)];
}
