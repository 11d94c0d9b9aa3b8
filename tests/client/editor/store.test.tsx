import { describe, expect, it } from 'vitest';
import { postToPostTemplate } from '@shared/diagram';
import { editor, resetEditor } from './flow-mocks';

describe('editor store: history', () => {
  it('undoes and redoes adding a part as one step', () => {
    resetEditor();
    const id = editor().addPart('battery', { x: 100, y: 40 });
    expect(id).toBeTruthy();
    expect(editor().doc.parts).toHaveLength(1);
    expect(editor().past).toHaveLength(1);
    editor().undo();
    expect(editor().doc.parts).toHaveLength(0);
    editor().redo();
    expect(editor().doc.parts.map((p) => p.id)).toEqual([id]);
    expect(editor().doc.parts[0].position).toEqual({ x: 100, y: 40 });
  });

  it('records a whole drag (many moves with one drag key) as one step', () => {
    resetEditor();
    const id = editor().addPart('fuse', { x: 0, y: 0 })!;
    for (let x = 10; x <= 200; x += 10) editor().moveParts([{ id, position: { x, y: x / 2 } }], 'drag-1');
    expect(editor().doc.parts[0].position).toEqual({ x: 200, y: 100 });
    expect(editor().past).toHaveLength(2); // add + one drag
    editor().undo();
    expect(editor().doc.parts[0].position).toEqual({ x: 0, y: 0 });
    editor().redo();
    expect(editor().doc.parts[0].position).toEqual({ x: 200, y: 100 });
  });

  it('a long drag of several parts keeps one patch per part, touches only the moved parts, and undoes exactly', () => {
    resetEditor();
    const a = editor().addPart('battery', { x: 0, y: 0 })!;
    const b = editor().addPart('battery', { x: 200, y: 0 })!;
    const c = editor().addPart('fuse', { x: 400, y: 0 })!;
    const still = editor().doc.parts.find((p) => p.id === c)!;
    for (let k = 1; k <= 300; k++) {
      editor().moveParts([{ id: a, position: { x: k, y: 0 } }, { id: b, position: { x: 200 + k, y: k } }], 'drag-many');
    }
    const step = editor().past.at(-1)!;
    expect(step.patches).toHaveLength(2);
    expect(step.inversePatches).toHaveLength(2);
    // The part not dragged is the very same object (memoised canvas nodes skip it).
    expect(editor().doc.parts.find((p) => p.id === c)).toBe(still);
    expect(Object.isFrozen(editor().doc.parts.find((p) => p.id === a))).toBe(true);
    editor().undo();
    expect(editor().doc.parts.map((p) => p.position)).toEqual([{ x: 0, y: 0 }, { x: 200, y: 0 }, { x: 400, y: 0 }]);
    editor().redo();
    expect(editor().doc.parts.map((p) => p.position)).toEqual([{ x: 300, y: 0 }, { x: 500, y: 300 }, { x: 400, y: 0 }]);
  });

  it('does not move parts of a read-only diagram', () => {
    resetEditor(undefined, { readOnly: true });
    editor().moveParts([{ id: 'x', position: { x: 1, y: 1 } }], 'd');
    expect(editor().past).toHaveLength(0);
  });

  it('keeps two drags as two steps', () => {
    resetEditor();
    const id = editor().addPart('fuse', { x: 0, y: 0 })!;
    editor().moveParts([{ id, position: { x: 50, y: 0 } }], 'a');
    editor().moveParts([{ id, position: { x: 90, y: 0 } }], 'b');
    editor().undo();
    expect(editor().doc.parts[0].position).toEqual({ x: 50, y: 0 });
  });

  it('deletes a part with its cables as one step, and undo brings both back', () => {
    resetEditor();
    const a = editor().addPart('battery', { x: 0, y: 0 })!;
    const b = editor().addPart('battery', { x: 200, y: 0 })!;
    const c = editor().addCable({ part: a, terminal: 'pos' }, { part: b, terminal: 'pos' })!;
    editor().select([a]);
    editor().deleteSelection();
    expect(editor().doc.parts.map((p) => p.id)).toEqual([b]);
    expect(editor().doc.cables).toHaveLength(0);
    editor().undo();
    expect(editor().doc.parts.map((p) => p.id).sort()).toEqual([a, b].sort());
    expect(editor().doc.cables.map((x) => x.id)).toEqual([c]);
  });

  it('drops annotations on deleted parts (and deleted parts from steps and highlights) in the same undo step', () => {
    resetEditor();
    const a = editor().addPart('battery', { x: 0, y: 0 })!;
    const b = editor().addPart('battery', { x: 200, y: 0 })!;
    const annotations = [
      { id: 'n1', kind: 'callout', partId: a, text: 'Check torque' },
      { id: 'n2', kind: 'callout', partId: b, text: 'Label this one' },
      { id: 'n3', kind: 'step', number: 1, text: 'Fit the posts', partIds: [a, b] },
      { id: 'n4', kind: 'highlight', partIds: [a] },
    ];
    editor().edit('Annotate', (d) => {
      d.annotations = structuredClone(annotations) as typeof d.annotations;
    });
    const stepsBefore = editor().past.length;
    editor().deleteIds([a]);
    expect(editor().past.length).toBe(stepsBefore + 1);
    // The callout on the deleted battery and the highlight around it alone go; the step keeps the other battery.
    expect(editor().doc.annotations).toEqual([
      { id: 'n2', kind: 'callout', partId: b, text: 'Label this one' },
      { id: 'n3', kind: 'step', number: 1, text: 'Fit the posts', partIds: [b] },
    ]);
    editor().undo();
    expect(editor().doc.parts.map((p) => p.id).sort()).toEqual([a, b].sort());
    expect(editor().doc.annotations).toEqual(annotations);
  });

  it('a busbar with fewer taps drops the cables on the lost taps; other prop edits leave the cables untouched', () => {
    resetEditor();
    const bar = editor().addPart('busbar', { x: 0, y: 0 }, { props: { material: 'copper', width_mm: 25, thickness_mm: 6, tapCount: 6, tapSpacing_m: 0.04, rating_A: 300 } })!;
    const bat = editor().addPart('battery', { x: 0, y: 200 })!;
    const keep = editor().addCable({ part: bat, terminal: 'pos' }, { part: bar, terminal: 't2' })!;
    const lost = editor().addCable({ part: bat, terminal: 'neg' }, { part: bar, terminal: 't6' })!;
    const cables = editor().doc.cables;
    editor().updatePart(bar, { props: { ...(editor().doc.parts[0].props as object), rating_A: 400 } });
    expect(editor().doc.cables).toBe(cables);
    editor().updatePart(bar, { props: { ...(editor().doc.parts[0].props as object), tapCount: 4 } });
    expect(editor().doc.cables.map((c) => c.id)).toEqual([keep]);
    editor().undo();
    expect(editor().doc.cables.map((c) => c.id)).toEqual([keep, lost]);
  });

  it('makes a new edit clear the redo stack', () => {
    resetEditor();
    editor().addPart('battery', { x: 0, y: 0 });
    editor().undo();
    expect(editor().future).toHaveLength(1);
    editor().addPart('shunt', { x: 0, y: 0 });
    expect(editor().future).toHaveLength(0);
  });

  it('refuses edits when read-only', () => {
    resetEditor(undefined, { readOnly: true });
    expect(editor().addPart('battery', { x: 0, y: 0 })).toBeNull();
    expect(editor().doc.parts).toHaveLength(0);
  });
});

describe('editor store: cables', () => {
  it('makes a short jumper between two batteries and a default cable run otherwise', () => {
    resetEditor();
    const a = editor().addPart('battery', { x: 0, y: 0 })!;
    const b = editor().addPart('battery', { x: 200, y: 0 })!;
    const f = editor().addPart('fuse', { x: 0, y: -150 })!;
    const j = editor().addCable({ part: a, terminal: 'pos' }, { part: b, terminal: 'pos' })!;
    const r = editor().addCable({ part: a, terminal: 'pos' }, { part: f, terminal: 'a' })!;
    const byId = new Map(editor().doc.cables.map((c) => [c.id, c]));
    expect(byId.get(j)!.props.role).toBe('jumper');
    expect(byId.get(j)!.props.length_m).toBe(0.3);
    expect(byId.get(r)!.props.role).toBe('cable');
  });

  it('refuses a cable from a terminal to itself', () => {
    resetEditor();
    const a = editor().addPart('battery', { x: 0, y: 0 })!;
    expect(editor().addCable({ part: a, terminal: 'pos' }, { part: a, terminal: 'pos' })).toBeNull();
    expect(editor().doc.cables).toHaveLength(0);
  });
});

describe('editor store: clipboard', () => {
  it('pastes copies with fresh ids, keeps cables between copied parts, offsets them, and is one undo step', () => {
    resetEditor(postToPostTemplate({ count: 2, takeOff: 'same-end' }));
    const before = editor().doc;
    editor().select(['bat1', 'bat2']);
    editor().copySelection();
    const pasted = editor().paste();
    const after = editor().doc;
    expect(after.parts).toHaveLength(before.parts.length + 2);
    // Two batteries and the two jumpers between them; no id reused.
    expect(pasted).toHaveLength(4);
    const oldIds = new Set([...before.parts.map((p) => p.id), ...before.cables.map((c) => c.id)]);
    for (const id of pasted) expect(oldIds.has(id)).toBe(false);
    const newParts = after.parts.filter((p) => pasted.includes(p.id));
    const newCables = after.cables.filter((c) => pasted.includes(c.id));
    expect(newCables).toHaveLength(2);
    for (const c of newCables) {
      expect(pasted).toContain(c.from.part);
      expect(pasted).toContain(c.to.part);
    }
    const orig = before.parts.find((p) => p.id === 'bat2')!;
    const copy = newParts.find((p) => p.label === orig.label)!;
    expect(copy.position.x).toBeGreaterThan(orig.position.x);
    expect(editor().selection.sort()).toEqual([...pasted].sort());
    editor().undo();
    expect(editor().doc.parts).toHaveLength(before.parts.length);
    expect(editor().doc.cables).toHaveLength(before.cables.length);
  });

  it('pastes twice without id clashes', () => {
    resetEditor();
    const a = editor().addPart('battery', { x: 0, y: 0 })!;
    editor().select([a]);
    editor().copySelection();
    const p1 = editor().paste();
    const p2 = editor().paste();
    const ids = editor().doc.parts.map((p) => p.id);
    expect(new Set(ids).size).toBe(3);
    expect(p1[0]).not.toBe(p2[0]);
  });

  it('duplicates the selection (Ctrl+D) without touching the clipboard', () => {
    resetEditor();
    const a = editor().addPart('inverter', { x: 0, y: 0 })!;
    editor().select([a]);
    const dup = editor().duplicateSelection();
    expect(dup).toHaveLength(1);
    expect(editor().clipboard).toBeNull();
    expect(editor().doc.parts.find((p) => p.id === dup[0])!.type).toBe('inverter');
  });
});

describe('editor store: rotate and focus', () => {
  it('rotates selected parts by 90° steps, wrapping at 360', () => {
    resetEditor();
    const a = editor().addPart('fuse', { x: 0, y: 0 })!;
    editor().select([a]);
    for (let i = 0; i < 5; i++) editor().rotateSelection();
    expect(editor().doc.parts[0].rotation).toBe(90);
  });

  it('focusParts selects the parts and issues a new framing request', () => {
    resetEditor(postToPostTemplate({ count: 3, takeOff: 'diagonal' }));
    const seq = editor().focusRequest?.seq ?? 0;
    editor().focusParts(['bat1', 'bat3']);
    expect(editor().selection).toEqual(['bat1', 'bat3']);
    expect(editor().focusRequest).toEqual({ ids: ['bat1', 'bat3'], seq: seq + 1 });
  });
});
