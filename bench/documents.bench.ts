/**
 * Document benchmarks: `diffDiagrams` between two revisions of a 2,000-part document, and its
 * `billOfMaterials`. The document is 23 copies of the 40-battery busbar bank template (ids prefixed)
 * and 60 notes: 1,992 parts and 2,829 cables (the format allows 2,000 parts). The second revision
 * moves, edits, removes, adds and reconnects a few percent of them.
 */
import { billOfMaterials } from '../shared/diagram/bom';
import { diffDiagrams } from '../shared/diagram/diff';
import { type DiagramDocument, diagramSchema } from '../shared/electrical/document/schema';
import { busbarBankTemplate } from '../shared/diagram/templates';
import type { BenchCase } from './registry';

/** A document of `copies` × the 40-battery busbar bank (84 parts, 123 cables each) and `notes` notes. */
export function largeDocument(copies = 23, notes = 60): DiagramDocument {
  const bank = busbarBankTemplate({ count: 40 });
  const parts: DiagramDocument['parts'] = [];
  const cables: DiagramDocument['cables'] = [];
  for (let k = 0; k < copies; k++) {
    const id = (x: string) => `s${k}-${x}`;
    for (const p of bank.parts) parts.push({ ...structuredClone(p), id: id(p.id), position: { x: p.position.x, y: p.position.y + k * 1200 } } as DiagramDocument['parts'][number]);
    for (const c of bank.cables) cables.push({ ...structuredClone(c), id: id(c.id), from: { ...c.from, part: id(c.from.part) }, to: { ...c.to, part: id(c.to.part) } });
  }
  for (let j = 0; j < notes; j++) parts.push({ id: `n${j}`, type: 'note', position: { x: -400, y: 100 * j }, props: { text: `Site note ${j + 1}` } } as DiagramDocument['parts'][number]);
  return diagramSchema.parse({ ...bank, name: `${copies} banks`, parts, cables });
}

/** The next revision: every 25th part moved, every 40th battery's state of charge edited, every 50th cable
 * lengthened, every 100th cable reconnected to a neighbouring stud, 10 cables removed, 5 notes added. */
export function nextRevision(doc: DiagramDocument): DiagramDocument {
  const next = structuredClone(doc);
  next.parts.forEach((p, i) => {
    if (i % 25 === 0) p.position = { x: p.position.x + 20, y: p.position.y };
    if (i % 40 === 0 && p.type === 'battery') p.props = { ...p.props, soc: 0.8 };
  });
  next.cables.forEach((c, i) => {
    if (i % 50 === 0) c.props = { ...c.props, length_m: c.props.length_m + 0.5 };
    if (i % 100 === 0 && c.to.terminal.startsWith('t')) c.to = { ...c.to, terminal: c.to.terminal === 't1' ? 't2' : 't1' };
  });
  next.cables.splice(100, 10);
  for (let j = 0; j < 5; j++) next.parts.push({ id: `note-${j}`, type: 'note', position: { x: 0, y: -200 - 50 * j }, props: { text: `Revision note ${j + 1}` } } as DiagramDocument['parts'][number]);
  return diagramSchema.parse(next);
}

export const cases: BenchCase<any>[] = [
  {
    name: 'documents: diffDiagrams, 2,000-part document and its next revision',
    setup: () => {
      const a = largeDocument();
      const b = nextRevision(a);
      const d = diffDiagrams(a, b);
      if (a.parts.length < 1990 || d.summary.partsMoved === 0 || d.summary.cablesRemoved !== 10) throw new Error('bench documents are not as intended');
      return { a, b };
    },
    run: ({ a, b }: { a: DiagramDocument; b: DiagramDocument }) => diffDiagrams(a, b),
    samples: 51,
  },
  {
    name: 'documents: diffDiagrams, 2,000-part document against itself (no changes)',
    setup: () => {
      const a = largeDocument();
      return { a, b: structuredClone(a) };
    },
    run: ({ a, b }: { a: DiagramDocument; b: DiagramDocument }) => diffDiagrams(a, b),
    samples: 51,
  },
  {
    name: 'documents: billOfMaterials, 2,000-part document',
    setup: () => largeDocument(),
    run: (doc: DiagramDocument) => billOfMaterials(doc, { unitSystem: 'metric' }),
    samples: 51,
  },
];
