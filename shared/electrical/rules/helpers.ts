/** Small helpers the rule checks share: number formats for messages, part names, the bank's batteries. */
import { stringMembers, type BatteryProps } from '../parts/battery';
import type { DiagramPart } from '../../diagram/schema';
import type { RuleInput } from './registry';

/** "166.7 A", "1,250 A". */
export function amps(x: number): string {
  const a = Math.abs(x);
  return a >= 1000 ? `${Math.round(x).toLocaleString('en-US')} A` : a >= 100 ? `${x.toFixed(0)} A` : `${x.toFixed(1)} A`;
}
export const volts = (x: number) => `${x.toFixed(2)} V`;
export const pct = (x: number) => `${x.toFixed(1)} %`;
/** "300 mm (11.8 in)". */
export const mmAndIn = (m: number) => `${(m * 1000).toFixed(0)} mm (${(m / 0.0254).toFixed(1)} in)`;

/** A part or cable as the designer named it: "Battery 1 (bat1)", or the id when it has no label. */
export function name(input: Pick<RuleInput, 'topo'>, id: string): string {
  const p = input.topo.parts.get(id);
  if (p) return p.label ? `${p.label} (${p.id})` : p.id;
  const c = input.topo.cables.get(id);
  return c?.label ? `${c.label} (${c.id})` : id;
}

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
