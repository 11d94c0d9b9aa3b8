/**
 * "Apply all" on every demo diagram and on the templates the editor offers leaves no new error: the
 * sizing plan's safe set applied, then the findings compared by rule and parts.
 */
import { describe, expect, it } from 'vitest';
import { demoDiagramContents, demoHouseBankContent, demoRevisionContents } from '../../../server/db/demo-diagrams';
import { busbarBankTemplate, postToPostTemplate, seriesParallelTemplate, type DiagramDocument } from '../../../shared/diagram';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { applySafeSizing, sizeDiagram } from '../../../shared/electrical/sizing';

const banks: [string, DiagramDocument][] = [
  ...demoDiagramContents().map((d) => [d.name, d.content] as [string, DiagramDocument]),
  ...demoRevisionContents().map((d) => [d.message, d.content] as [string, DiagramDocument]),
  [demoHouseBankContent().name, demoHouseBankContent().content],
  ...(['same-end', 'diagonal'] as const).map((t) => [`template post to post ${t}`, postToPostTemplate({ count: 4, takeOff: t })] as [string, DiagramDocument]),
  ['template busbars', busbarBankTemplate({ count: 4 })],
  ['template 4S2P', seriesParallelTemplate({ seriesCount: 4, parallelCount: 2 })],
];

const errorKeys = (doc: DiagramDocument) => analyzeDiagram(doc).findings.filter((f) => f.severity === 'error').map((f) => f.id);

describe('Apply all on the demo diagrams and templates', () => {
  for (const [name, doc] of banks) {
    it(`${name}: no new error`, () => {
      for (const unitSystem of ['metric', 'us'] as const) {
        const sized = sizeDiagram(doc, { unitSystem });
        if (!sized.ok) throw new Error(sized.errors.map((e) => e.message).join('; '));
        const after = applySafeSizing(doc, sized);
        const before = errorKeys(doc);
        const now = errorKeys(after);
        expect(now.length).toBeLessThanOrEqual(before.length);
        for (const id of now) expect(before, `new error ${id}`).toContain(id);
        // Settled: sizing the sized design asks for nothing more (no second "Apply all").
        const again = sizeDiagram(after, { unitSystem });
        if (!again.ok) throw new Error('sizing the sized design failed');
        expect(again.plan.pending, `${unitSystem}: still to change after Apply all`).toEqual([]);
      }
    });
  }
});
