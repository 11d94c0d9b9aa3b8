/** Diagram documents for the integration tests (not a test file itself). */
import { postToPostTemplate } from '../../shared/diagram/templates';
import type { DiagramDocument } from '../../shared/electrical/document/schema';

export function smallBank(name = 'Two-battery test bank'): DiagramDocument {
  return postToPostTemplate({ count: 2, takeOff: 'diagonal', name });
}

/**
 * A diagram at the document's part limit (2,000 parts): a 64-battery post-to-post bank extended with
 * further batteries, each jumpered to the one before. Its JSON is well over 1 MB.
 */
export function partLimitBank(): DiagramDocument {
  const doc = postToPostTemplate({ count: 64, takeOff: 'same-end', name: 'Part-limit bank' });
  const template = doc.parts.find((p) => p.id === 'bat64')!;
  const jumper = doc.cables.find((c) => c.id === 'j-pos-1')!;
  const parts = [...doc.parts];
  const cables = [...doc.cables];
  for (let i = 65; parts.length < 2000; i++) {
    parts.push({ ...template, id: `bat${i}`, label: `Battery ${i}`, position: { x: i * 200, y: 0 } });
    for (const pole of ['pos', 'neg'] as const) {
      cables.push({ ...jumper, id: `j-${pole}-${i - 1}`, from: { part: `bat${i - 1}`, terminal: pole }, to: { part: `bat${i}`, terminal: pole } });
    }
  }
  return { ...doc, parts, cables };
}
