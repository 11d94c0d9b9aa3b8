/**
 * Bill-of-materials changes between two documents: lines matched by category and description (what to
 * order), with the quantity on each side. Cable lines are lengths in the team's unit.
 */
import type { DiagramDocument } from '@shared/diagram';
import { billOfMaterials, type BomCategory, type BomUnit } from '@shared/diagram/bom';
import type { UnitSystem } from '@shared/units';

export interface BomChange {
  category: BomCategory;
  description: string;
  unit: BomUnit;
  /** Quantity in A and B; 0 where the line is absent. */
  a: number;
  b: number;
  status: 'added' | 'removed' | 'changed';
}

const clean = (x: number) => Math.round(x * 1e6) / 1e6;

export function bomChanges(a: DiagramDocument, b: DiagramDocument, unitSystem: UnitSystem): BomChange[] {
  const la = billOfMaterials(a, { unitSystem }).lines;
  const lb = billOfMaterials(b, { unitSystem }).lines;
  const key = (l: { category: string; description: string }) => `${l.category}\u0000${l.description}`;
  const inA = new Map(la.map((l) => [key(l), l]));
  const inB = new Map(lb.map((l) => [key(l), l]));
  const out: BomChange[] = [];
  for (const l of la) {
    const other = inB.get(key(l));
    if (!other) out.push({ category: l.category, description: l.description, unit: l.unit, a: clean(l.quantity), b: 0, status: 'removed' });
    else if (clean(other.quantity) !== clean(l.quantity)) out.push({ category: l.category, description: l.description, unit: l.unit, a: clean(l.quantity), b: clean(other.quantity), status: 'changed' });
  }
  for (const l of lb) {
    if (!inA.has(key(l))) out.push({ category: l.category, description: l.description, unit: l.unit, a: 0, b: clean(l.quantity), status: 'added' });
  }
  return out;
}
