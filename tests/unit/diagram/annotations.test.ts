/** The annotation layer's schemas, reference checks, pruning, and its independence from the electrical model. */
import { describe, expect, it } from 'vitest';
import { parseDiagram, postToPostTemplate } from '../../../shared/diagram';
import {
  drawableAnnotations, nextStepNumber, parseAnnotations, pruneDanglingReferences, stepsInOrder,
} from '../../../shared/diagram/annotations';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { billOfMaterials } from '../../../shared/diagram/bom';

const parts = new Set(['bat1', 'bat2', 'f1']);

describe('parseAnnotations', () => {
  it('accepts each kind', () => {
    const r = parseAnnotations([
      { id: 'a1', kind: 'callout', partId: 'bat1', text: 'Torque to the maker\u2019s figure' },
      { id: 'a2', kind: 'step', number: 1, text: 'Fit the main fuse', partIds: ['f1'] },
      { id: 'a3', kind: 'note', position: { x: 10, y: -20 }, text: 'Vent the enclosure' },
      { id: 'a4', kind: 'highlight', partIds: ['bat1', 'bat2'], label: 'Bank A' },
    ], parts);
    expect(r.issues).toEqual([]);
    expect(r.annotations.map((a) => a.kind)).toEqual(['callout', 'step', 'note', 'highlight']);
  });

  it('names the path and problem of each broken entry', () => {
    const r = parseAnnotations([
      { id: 'a1', kind: 'callout', partId: 'bat1', text: '   ' },
      { id: 'a2', kind: 'step', number: 1.5, text: 'x', partIds: [] },
      { id: 'a3', kind: 'note', text: 'no position' },
      { id: 'a4', kind: 'highlight', partIds: [] },
    ]);
    const byPath = Object.fromEntries(r.issues.map((i) => [i.path, i.message]));
    expect(byPath['$.annotations[0].text']).toBe('Text is required');
    expect(byPath['$.annotations[1].number']).toBe('A step number is a whole number');
    expect(Object.keys(byPath)).toContain('$.annotations[2].position');
    expect(byPath['$.annotations[3].partIds']).toBe('A highlight surrounds at least one part');
    expect(r.annotations).toEqual([]);
  });

  it('reports references to parts that are not in the document', () => {
    const r = parseAnnotations([
      { id: 'a1', kind: 'callout', partId: 'ghost', text: 'x' },
      { id: 'a2', kind: 'step', number: 2, text: 'y', partIds: ['bat1', 'gone'] },
    ], parts);
    expect(r.issues).toEqual([
      { path: '$.annotations[0].partId', message: 'No part with id "ghost"' },
      { path: '$.annotations[1].partIds[1]', message: 'No part with id "gone"' },
    ]);
  });

  it('refuses two steps with one number', () => {
    const r = parseAnnotations([
      { id: 's1', kind: 'step', number: 3, text: 'a', partIds: [] },
      { id: 's2', kind: 'step', number: 3, text: 'b', partIds: [] },
    ]);
    expect(r.issues).toEqual([{ path: '$.annotations[1].number', message: 'Step 3 is numbered twice (also $.annotations[0])' }]);
  });

  it('keeps entries of kinds it does not know, without drawing them', () => {
    const future = { id: 'z1', kind: 'dimension', from: 'bat1', to: 'bat2', mm: 300 };
    const r = parseAnnotations([future]);
    expect(r.issues).toEqual([]);
    expect(r.other).toEqual([future]);
    expect(drawableAnnotations([future])).toEqual([]);
  });
});

describe('pruneDanglingReferences', () => {
  it('drops callouts on removed parts and removed parts from steps and highlights', () => {
    const doc = {
      parts: [{ id: 'bat1' }],
      annotations: [
        { id: 'c1', kind: 'callout', partId: 'bat9', text: 'gone' },
        { id: 's1', kind: 'step', number: 1, text: 'keep', partIds: ['bat1', 'bat9'] },
        { id: 'h1', kind: 'highlight', partIds: ['bat9'] },
        { id: 'n1', kind: 'note', position: { x: 0, y: 0 }, text: 'stays' },
      ],
    };
    expect(pruneDanglingReferences(doc)).toEqual([
      { id: 's1', kind: 'step', number: 1, text: 'keep', partIds: ['bat1'] },
      { id: 'n1', kind: 'note', position: { x: 0, y: 0 }, text: 'stays' },
    ]);
  });

  it('returns the same array when nothing refers to a removed part', () => {
    const doc = { parts: [{ id: 'bat1' }], annotations: [{ id: 'c1', kind: 'callout', partId: 'bat1', text: 'ok' }] };
    expect(pruneDanglingReferences(doc)).toBe(doc.annotations);
  });
});

describe('steps', () => {
  it('numbers the next step after the highest and lists steps in number order', () => {
    const list = drawableAnnotations([
      { id: 's3', kind: 'step', number: 7, text: 'c', partIds: [] },
      { id: 's1', kind: 'step', number: 2, text: 'a', partIds: [] },
    ]);
    expect(nextStepNumber(list)).toBe(8);
    expect(stepsInOrder(list).map((s) => s.id)).toEqual(['s1', 's3']);
    expect(nextStepNumber([])).toBe(1);
  });
});

describe('the layer never changes the electrical model', () => {
  it('gives the same analysis and bill of materials with and without annotations', () => {
    const bare = postToPostTemplate({ count: 4, takeOff: 'same-end' });
    const annotated = parseDiagram({
      ...bare,
      annotations: [
        { id: 'a1', kind: 'callout', partId: bare.parts[0].id, text: 'Check the lug' },
        { id: 'a2', kind: 'highlight', partIds: bare.parts.slice(0, 2).map((p) => p.id), label: 'Left pair' },
        { id: 'a3', kind: 'step', number: 1, text: 'Fit fuse', partIds: [bare.parts[0].id] },
        { id: 'a4', kind: 'note', position: { x: 0, y: 0 }, text: 'Vent' },
      ],
    });
    expect(annotated.ok).toBe(true);
    if (!annotated.ok) return;
    expect(analyzeDiagram(annotated.doc, { mode: 'load' })).toEqual(analyzeDiagram(bare, { mode: 'load' }));
    expect(billOfMaterials(annotated.doc, { unitSystem: 'metric' })).toEqual(billOfMaterials(bare, { unitSystem: 'metric' }));
  });
});
