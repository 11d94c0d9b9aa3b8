import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { busbarBankTemplate, postToPostTemplate, seriesParallelTemplate, type DiagramDocument, type DiagramPart } from '../../../shared/diagram';
import { type ResultsSummary, diffDiagrams, diffResultsSummaries, resultsSummarySchema } from '../../../shared/diagram/diff';
import { batteryDefaults } from '../../../shared/electrical/parts';

const clone = <T>(x: T): T => structuredClone(x);
const part = (doc: DiagramDocument, id: string) => {
  const p = doc.parts.find((x) => x.id === id);
  if (!p) throw new Error(`no part ${id}`);
  return p;
};
const cable = (doc: DiagramDocument, id: string) => {
  const c = doc.cables.find((x) => x.id === id);
  if (!c) throw new Error(`no cable ${id}`);
  return c;
};

const EMPTY_SUMMARY = {
  identical: true, partsAdded: 0, partsRemoved: 0, partsMoved: 0, partsChanged: 0, cablesAdded: 0, cablesRemoved: 0,
  cablesMoved: 0, cablesChanged: 0, cablesReconnected: 0, settingsChanged: 0, annotationsAdded: 0, annotationsRemoved: 0,
  annotationsChanged: 0,
};

describe('diffDiagrams', () => {
  const base = () => postToPostTemplate({ count: 4, takeOff: 'same-end', conductor: { system: 'awg', size: '2' } });

  it('finds nothing between a document and itself (or a copy)', () => {
    const a = base();
    const d = diffDiagrams(a, clone(a));
    expect(d.summary).toEqual(EMPTY_SUMMARY);
    expect(d.settings).toEqual([]);
    expect(d.parts).toEqual({ added: [], removed: [], moved: [], changed: [] });
    expect(d.cables).toEqual({ added: [], removed: [], moved: [], changed: [] });
  });

  it('reports a changed capacity with its path, values and summary', () => {
    const a = base();
    const b = clone(a);
    const bat2 = part(b, 'bat2');
    if (bat2.type !== 'battery') throw new Error('bat2 is a battery');
    bat2.props.capacity_Ah = 200;
    const d = diffDiagrams(a, b);
    expect(d.parts.changed).toEqual([
      {
        id: 'bat2', type: 'battery', label: 'Battery 2',
        changes: [{ path: 'props.capacity_Ah', from: 100, to: 200, summary: 'Capacity 100 Ah → 200 Ah' }],
        summary: ['Capacity 100 Ah → 200 Ah'],
      },
    ]);
    expect(d.summary).toMatchObject({ identical: false, partsChanged: 1, partsMoved: 0 });
  });

  it('tells a move from a change, and keeps the move on a changed part', () => {
    const a = base();
    const b = clone(a);
    part(b, 'bat1').position = { x: 15, y: -40 };
    const bat3 = part(b, 'bat3');
    bat3.rotation = 90;
    bat3.label = 'House 3';
    const d = diffDiagrams(a, b);
    expect(d.parts.moved).toEqual([
      { id: 'bat1', type: 'battery', label: 'Battery 1', from: { position: { x: 0, y: 0 }, rotation: 0 }, to: { position: { x: 15, y: -40 }, rotation: 0 } },
    ]);
    expect(d.parts.changed).toHaveLength(1);
    expect(d.parts.changed[0]).toMatchObject({
      id: 'bat3',
      changes: [{ path: 'label', from: 'Battery 3', to: 'House 3', summary: 'Label "Battery 3" → "House 3"' }],
      moved: { from: { position: { x: 400, y: 0 }, rotation: 0 }, to: { position: { x: 400, y: 0 }, rotation: 90 } },
    });
  });

  it('reports added and removed parts and cables in document order', () => {
    const a = base();
    const b = clone(a);
    b.cables = b.cables.filter((c) => c.id !== 'j-pos-3' && c.id !== 'j-neg-3');
    b.parts = b.parts.filter((p) => p.id !== 'bat4');
    b.parts.push({ id: 'bat9', type: 'battery', label: 'Spare', position: { x: 0, y: 400 }, rotation: 0, props: batteryDefaults('agm', 100) });
    const d = diffDiagrams(a, b);
    expect(d.parts.removed.map((p) => p.id)).toEqual(['bat4']);
    expect(d.parts.added.map((p) => p.id)).toEqual(['bat9']);
    expect(d.cables.removed.map((c) => c.id)).toEqual(['j-pos-3', 'j-neg-3']);
    expect(d.summary).toMatchObject({ partsAdded: 1, partsRemoved: 1, cablesRemoved: 2, cablesAdded: 0 });
  });

  it('reports a moved take-off as a reconnection, with the conductor and length changes in team units', () => {
    const a = base();
    const b = clone(a);
    const neg = cable(b, 'c-main-neg');
    neg.from = { part: 'bat4', terminal: 'neg' }; // same-end → diagonal take-off
    neg.props.conductor = { system: 'awg', size: '2/0' };
    neg.props.length_m = 0.8;
    cable(a, 'c-main-neg').props.length_m = 1.2;

    const metric = diffDiagrams(a, b);
    expect(metric.cables.changed).toHaveLength(1);
    const c = metric.cables.changed[0];
    expect(c.id).toBe('c-main-neg');
    expect(c.reconnections).toEqual([
      { end: 'from', from: { part: 'bat1', terminal: 'neg' }, to: { part: 'bat4', terminal: 'neg' }, summary: 'Reconnected bat1.neg → bat4.neg' },
    ]);
    // 2 AWG = 33.6 mm², 2/0 AWG = 67.4 mm² (ASTM B258 areas, also in NEC Chapter 9 Table 8).
    expect(c.summary).toEqual([
      'Reconnected bat1.neg → bat4.neg',
      'Conductor 33.6 mm² (2 AWG) → 67.4 mm² (2/0 AWG)',
      'Length 1.20 m → 0.80 m',
    ]);
    expect(metric.summary).toMatchObject({ cablesChanged: 1, cablesReconnected: 1 });

    const us = diffDiagrams(a, b, { unitSystem: 'us' });
    // 1.2 m = 3.94 ft, 0.8 m = 2.62 ft (0.3048 m/ft, exact).
    expect(us.cables.changed[0].summary).toEqual(['Reconnected bat1.neg → bat4.neg', 'Conductor 2 AWG → 2/0 AWG', 'Length 3.9 ft → 2.6 ft']);
  });

  it('does not call a cable drawn the other way between the same terminals a reconnection', () => {
    const a = base();
    const b = clone(a);
    const j = cable(b, 'j-pos-1');
    [j.from, j.to] = [j.to, j.from];
    expect(diffDiagrams(a, b).summary.identical).toBe(true);
  });

  it('reports both ends when a cable moved entirely, and a waypoint-only edit as a move', () => {
    const a = base();
    const b = clone(a);
    const j = cable(b, 'j-pos-2');
    j.from = { part: 'bat1', terminal: 'pos' };
    j.to = { part: 'bat4', terminal: 'pos' };
    cable(b, 'j-neg-2').waypoints = [{ x: 250, y: 80 }];
    const d = diffDiagrams(a, b);
    expect(d.cables.changed.map((c) => c.reconnections.map((r) => r.summary))).toEqual([
      ['Reconnected bat2.pos → bat1.pos', 'Reconnected bat3.pos → bat4.pos'],
    ]);
    expect(d.cables.moved).toEqual([{ id: 'j-neg-2', label: '' }]);
  });

  it('lists settings changes with trade wording in both unit systems', () => {
    const a = base();
    const b = clone(a);
    b.settings.ambient_C = 40;
    b.settings.voltageDropLimit_pct = 2;
    expect(diffDiagrams(a, b).settings).toEqual([
      { path: 'settings.voltageDropLimit_pct', from: 3, to: 2, summary: 'Voltage drop limit 3 % → 2 %' },
      { path: 'settings.ambient_C', from: 30, to: 40, summary: 'Ambient 30 °C → 40 °C' },
    ]);
    // 30 °C = 86 °F, 40 °C = 104 °F.
    expect(diffDiagrams(a, b, { unitSystem: 'us' }).settings.map((s) => s.summary)).toEqual(['Voltage drop limit 3 % → 2 %', 'Ambient 86 °F → 104 °F']);
    expect(diffDiagrams(a, b).summary.settingsChanged).toBe(2);
  });

  it('names nested series-string fields and optional fields that appear', () => {
    const a = seriesParallelTemplate({ seriesCount: 4, parallelCount: 2 });
    const b = clone(a);
    const s = part(b, 'string1');
    if (s.type !== 'series_string') throw new Error('string1 is a string');
    s.props.member = { ...s.props.member, restingVoltage_V: 13.2 };
    s.props.interconnect!.length_m = 0.5;
    const d = diffDiagrams(a, b);
    expect(d.parts.changed[0].changes).toEqual([
      { path: 'props.member.restingVoltage_V', to: 13.2, summary: 'Member resting voltage not set → 13.2 V' },
      { path: 'props.interconnect.length_m', from: 0.3, to: 0.5, summary: 'Interconnect length 0.30 m → 0.50 m' },
    ]);
  });

  it('reports fuse and busbar changes in trade terms', () => {
    const a = busbarBankTemplate({ count: 2 });
    const b = clone(a);
    const f = part(b, 'fuse1');
    if (f.type !== 'fuse') throw new Error('fuse1 is a fuse');
    const fromRating = f.props.rating_A;
    f.props.fuseClass = 'anl';
    f.props.rating_A = 150;
    const bus = part(b, 'bus-pos');
    if (bus.type !== 'busbar') throw new Error('bus-pos is a busbar');
    bus.props.thickness_mm = 10;
    const d = diffDiagrams(a, b);
    expect(d.parts.changed.map((c) => c.summary)).toEqual([
      ['Thickness 6 mm → 10 mm'],
      ['Fuse class Class T → ANL', `Rating ${fromRating} A → 150 A`],
    ]);
  });

  it('reports a part whose type changed under the same id as removed and added', () => {
    const a = base();
    const b = clone(a);
    const i = b.parts.findIndex((p) => p.id === 'inverter');
    b.parts[i] = { id: 'inverter', type: 'dc_load', label: 'Load', position: b.parts[i].position, rotation: 0, props: { mode: 'current', current_A: 50 } };
    const d = diffDiagrams(a, b);
    expect(d.parts.removed.map((p) => p.type)).toEqual(['inverter']);
    expect(d.parts.added.map((p) => p.type)).toEqual(['dc_load']);
    expect(d.parts.changed).toEqual([]);
  });

  it('diffs annotations by id', () => {
    const a = base();
    a.annotations = [{ id: 'n1', kind: 'callout', text: 'Check torque' }, { id: 'n2', kind: 'callout', text: 'x' }];
    const b = clone(a);
    b.annotations = [{ id: 'n1', kind: 'callout', text: 'Torque to spec' }, { id: 'n3', kind: 'dimension' }];
    const d = diffDiagrams(a, b);
    expect(d.annotations.added.map((x) => x.id)).toEqual(['n3']);
    expect(d.annotations.removed.map((x) => x.id)).toEqual(['n2']);
    expect(d.annotations.changed).toEqual([{ id: 'n1', kind: 'callout', changes: [{ path: 'text', from: 'Check torque', to: 'Torque to spec', summary: 'Text "Check torque" → "Torque to spec"' }] }]);
  });

  // Random edits of a template: remove, add, move, change parts and cables.
  const editArb = fc.record({
    removeParts: fc.uniqueArray(fc.integer({ min: 1, max: 6 }), { maxLength: 3 }),
    capacity: fc.array(fc.tuple(fc.integer({ min: 1, max: 6 }), fc.integer({ min: 10, max: 500 })), { maxLength: 3 }),
    moves: fc.array(fc.tuple(fc.integer({ min: 1, max: 6 }), fc.integer({ min: -500, max: 500 })), { maxLength: 3 }),
    lengths: fc.array(fc.tuple(fc.integer({ min: 0, max: 20 }), fc.integer({ min: 1, max: 50 })), { maxLength: 4 }),
    addCount: fc.integer({ min: 0, max: 3 }),
    ambient: fc.option(fc.integer({ min: -20, max: 60 }), { nil: undefined }),
  });
  type Edit = typeof editArb extends fc.Arbitrary<infer T> ? T : never;
  function edit(doc: DiagramDocument, e: Edit) {
    const b = clone(doc);
    const batteries = (d: DiagramDocument) => d.parts.filter((p): p is Extract<DiagramPart, { type: 'battery' }> => p.type === 'battery');
    for (const [i, ah] of e.capacity) { const p = batteries(b)[i - 1]; if (p) p.props.capacity_Ah = ah; }
    for (const [i, dx] of e.moves) { const p = batteries(b)[i - 1]; if (p) p.position = { x: p.position.x + dx, y: p.position.y }; }
    for (const [i, dm] of e.lengths) { const c = b.cables[i]; if (c) c.props.length_m = dm / 10; }
    const gone = new Set(e.removeParts.map((i) => `bat${i}`));
    b.parts = b.parts.filter((p) => !gone.has(p.id));
    b.cables = b.cables.filter((c) => !gone.has(c.from.part) && !gone.has(c.to.part));
    for (let k = 0; k < e.addCount; k++) b.parts.push({ id: `new${k}`, type: 'battery', label: '', position: { x: k, y: 900 }, rotation: 0, props: batteryDefaults() });
    if (e.ambient !== undefined) b.settings.ambient_C = e.ambient;
    return b;
  }

  it('is symmetric: added A→B is removed B→A, and changes swap their values', () => {
    const a = postToPostTemplate({ count: 6, takeOff: 'diagonal' });
    fc.assert(fc.property(editArb, (e) => {
      const b = edit(a, e);
      const ab = diffDiagrams(a, b);
      const ba = diffDiagrams(b, a);
      const ids = (xs: { id: string }[]) => xs.map((x) => x.id).sort();
      expect(ids(ab.parts.added)).toEqual(ids(ba.parts.removed));
      expect(ids(ab.parts.removed)).toEqual(ids(ba.parts.added));
      expect(ids(ab.cables.added)).toEqual(ids(ba.cables.removed));
      expect(ids(ab.cables.removed)).toEqual(ids(ba.cables.added));
      expect(ids(ab.parts.moved)).toEqual(ids(ba.parts.moved));
      expect(ids(ab.parts.changed)).toEqual(ids(ba.parts.changed));
      expect(ids(ab.cables.changed)).toEqual(ids(ba.cables.changed));
      const swapped = (d: typeof ab) => d.parts.changed.flatMap((c) => c.changes.map((f) => `${c.id}:${f.path}:${JSON.stringify(f.from)}:${JSON.stringify(f.to)}`)).sort();
      const unswapped = ba.parts.changed.flatMap((c) => c.changes.map((f) => `${c.id}:${f.path}:${JSON.stringify(f.to)}:${JSON.stringify(f.from)}`)).sort();
      expect(swapped(ab)).toEqual(unswapped);
      expect(ab.summary.identical).toBe(ba.summary.identical);
      // Every removed battery is one of those the edit removed.
      expect(ab.parts.removed.every((p) => e.removeParts.includes(Number(p.id.slice(3))))).toBe(true);
      expect(ab.parts.added).toHaveLength(e.addCount);
    }), { numRuns: 150 });
  });

  it('finds nothing between any edited document and itself', () => {
    const a = busbarBankTemplate({ count: 4 });
    fc.assert(fc.property(editArb, (e) => {
      const b = edit(a, e);
      expect(diffDiagrams(b, clone(b)).summary).toEqual(EMPTY_SUMMARY);
    }), { numRuns: 60 });
  });
});

describe('diffResultsSummaries', () => {
  const a: ResultsSummary = {
    batteries: [
      { id: 'bat1', label: 'Battery 1', current_A: 60, share: 0.4 },
      { id: 'bat2', label: 'Battery 2', current_A: 50, share: 1 / 3 },
      { id: 'bat3', label: 'Battery 3', current_A: 40, share: 0.8 / 3 },
    ],
    imbalance_pct: 40,
    loadVoltage_V: 12.9,
    drop_pct: 1.5,
    losses_W: 22,
    findings: [
      { id: 'f1', rule: 'imbalance', severity: 'warning', parts: ['bat3', 'bat1'], message: 'Battery 1 carries 50 % more than Battery 3' },
      { id: 'f2', rule: 'fuse-near-battery', severity: 'error', parts: ['bat2'], message: 'No fuse near Battery 2' },
    ],
  };
  const b: ResultsSummary = {
    batteries: [
      { id: 'bat1', label: 'Battery 1', current_A: 52, share: 0.35 },
      { id: 'bat2', label: 'Battery 2', current_A: 48, share: 0.32 },
      { id: 'bat4', label: 'Battery 4', current_A: 49, share: 0.33 },
    ],
    imbalance_pct: 8,
    losses_W: 18.5,
    findings: [
      { id: 'g7', rule: 'imbalance', severity: 'note', parts: ['bat1', 'bat3'], message: 'reworded' },
      { id: 'g8', rule: 'drop-limit', severity: 'warning', parts: ['c-main-pos'], message: 'Drop over 3 %' },
    ],
  };

  it('gives per-battery currents and shares with their differences', () => {
    const d = diffResultsSummaries(a, b);
    expect(d.batteries.map((x) => x.id)).toEqual(['bat1', 'bat2', 'bat3', 'bat4']);
    expect(d.batteries[0].delta_current_A).toBeCloseTo(-8, 12);
    expect(d.batteries[0].delta_share).toBeCloseTo(-0.05, 12);
    expect(d.batteries[2]).toEqual({ id: 'bat3', label: 'Battery 3', a: { current_A: 40, share: 0.8 / 3 } });
    expect(d.batteries[3]).toEqual({ id: 'bat4', label: 'Battery 4', b: { current_A: 49, share: 0.33 } });
  });

  it('gives imbalance, drop and loss deltas, leaving out a delta with one side missing', () => {
    const d = diffResultsSummaries(a, b);
    expect(d.imbalance_pct).toEqual({ a: 40, b: 8, delta: -32 });
    expect(d.losses_W).toEqual({ a: 22, b: 18.5, delta: -3.5 });
    expect(d.loadVoltage_V).toEqual({ a: 12.9 });
    expect(d.drop_pct).toEqual({ a: 1.5 });
  });

  it('matches findings by rule and sorted parts, not by id or wording', () => {
    const d = diffResultsSummaries(a, b);
    expect(d.findingsKept.map((f) => f.id)).toEqual(['g7']);
    expect(d.findingsAdded.map((f) => f.id)).toEqual(['g8']);
    expect(d.findingsResolved.map((f) => f.id)).toEqual(['f2']);
  });

  it('counts repeated findings one for one', () => {
    const f = { rule: 'lug-torque', severity: 'note' as const, parts: ['c1'], message: 'm' };
    const x = { ...a, findings: [{ ...f, id: '1' }, { ...f, id: '2' }] };
    const y = { ...a, findings: [{ ...f, id: '3' }] };
    expect(diffResultsSummaries(x, y).findingsResolved.map((q) => q.id)).toEqual(['2']);
    expect(diffResultsSummaries(y, x).findingsAdded.map((q) => q.id)).toEqual(['2']);
  });

  it('validates stored summaries', () => {
    expect(resultsSummarySchema.safeParse(a).success).toBe(true);
    expect(resultsSummarySchema.safeParse({ ...a, findings: [{ ...a.findings[0], severity: 'fatal' }] }).success).toBe(false);
  });
});
