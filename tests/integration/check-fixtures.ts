/** Diagram documents for the check-route tests (not a test file itself). */
import { seriesParallelTemplate } from '../../shared/diagram/templates';
import type { DiagramDocument } from '../../shared/electrical/document/schema';

/** 63 strings of 40 batteries in series on busbars: a 5,360-element network (as compileDiagram counts it). */
export function bigBank(): DiagramDocument {
  return seriesParallelTemplate({ seriesCount: 40, parallelCount: 63, name: 'Big check' });
}

/**
 * A network above 60,000 elements within the document's limits (2,000 parts): `copies` 64S61P banks
 * (about 8,100 elements each), their busbars tied copy to copy through the two spare taps.
 */
export function oversizedBank(copies = 9): DiagramDocument {
  const base = seriesParallelTemplate({ seriesCount: 64, parallelCount: 61, name: 'Oversized bank' });
  const link = base.cables.find((c) => c.from.part.startsWith('string') || c.to.part.startsWith('string'))!;
  const parts: DiagramDocument['parts'] = [];
  const cables: DiagramDocument['cables'] = [];
  for (let k = 0; k < copies; k++) {
    const sfx = k === 0 ? '' : `-k${k}`;
    for (const p of base.parts) {
      const props = p.type === 'busbar' ? { ...p.props, tapCount: 64 } : p.props;
      parts.push({ ...p, id: p.id + sfx, position: { x: p.position.x, y: p.position.y + k * 2000 }, props } as DiagramDocument['parts'][number]);
    }
    for (const c of base.cables) cables.push({ ...c, id: c.id + sfx, from: { ...c.from, part: c.from.part + sfx }, to: { ...c.to, part: c.to.part + sfx } });
    if (k > 0) {
      const prev = k === 1 ? '' : `-k${k - 1}`;
      for (const bus of ['bus-pos', 'bus-neg']) cables.push({ ...link, id: `tie-${bus}${sfx}`, from: { part: bus + sfx, terminal: 't63' }, to: { part: bus + prev, terminal: 't64' } });
    }
  }
  return { ...base, parts, cables };
}
