import { describe, expect, it } from 'vitest';
import {
  DIAGRAM_FORMAT_VERSION, DIAGRAM_LIMITS, MAX_REPORTED_ISSUES, busbarBankTemplate, diagramSchema, emptyDiagram,
  jsonPath, migrateDiagram, parseDiagram, postToPostTemplate, seriesParallelTemplate,
} from '../../../shared/diagram';
import { batteryDefaults } from '../../../shared/electrical/parts';

const minimal = () => ({
  formatVersion: 1,
  settings: { systemVoltage_V: 12 },
  parts: [
    { id: 'b1', type: 'battery', position: { x: 0, y: 0 }, props: batteryDefaults() },
    { id: 'load', type: 'dc_load', position: { x: 200, y: 0 }, props: { mode: 'current', current_A: 10 } },
  ],
  cables: [
    { id: 'c1', from: { part: 'b1', terminal: 'pos' }, to: { part: 'load', terminal: 'pos' }, props: { conductor: { system: 'awg', size: '6' }, length_m: 2 } },
    { id: 'c2', from: { part: 'b1', terminal: 'neg' }, to: { part: 'load', terminal: 'neg' }, props: { conductor: { system: 'awg', size: '6' }, length_m: 2 } },
  ],
});

describe('diagram document schema', () => {
  it('fills the documented defaults', () => {
    const r = parseDiagram(minimal());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.doc.settings).toEqual({
      systemVoltage_V: 12, designMargin: 1.25, voltageDropLimit_pct: 3, ampacityTable: 'nec-310.16-75C', ambient_C: 30,
      maxPostToPost: 4, busbarLengthTolerance_pct: 10, imbalanceThreshold_pct: 10, ruleSet: 'general',
    });
    expect(r.doc.parts[0]).toMatchObject({ label: '', rotation: 0 });
    expect(r.doc.annotations).toEqual([]);
  });

  it('round-trips through JSON unchanged', () => {
    const doc = busbarBankTemplate({ count: 3 });
    const again = parseDiagram(JSON.stringify(doc));
    expect(again.ok && again.doc).toEqual(doc);
  });

  it('reports errors with JSON paths', () => {
    const bad = minimal();
    (bad.parts[0].props as { capacity_Ah: number }).capacity_Ah = -5;
    bad.cables[1].to.terminal = 'minus';
    const r = parseDiagram(bad);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => e.path)).toContain('$.parts[0].props.capacity_Ah');
  });

  it('checks cable ends name real parts and terminals, and ids are unique', () => {
    const bad = minimal();
    bad.cables[1].to.terminal = 'minus';
    bad.cables[0].from.part = 'ghost';
    bad.parts[1].id = 'c1';
    const r = parseDiagram(bad);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const paths = r.errors.map((e) => e.path);
    expect(paths).toContain('$.cables[0].from.part');
    expect(paths).toContain('$.cables[0].id'); // duplicates part id "c1"
    expect(r.errors.find((e) => e.path === '$.cables[0].id')?.message).toMatch(/Duplicate id "c1"/);
    // The load was renamed, so cable 1's "to" no longer resolves either.
    expect(paths).toContain('$.cables[1].to.part');

    const wrongTerminal = minimal();
    wrongTerminal.cables[1].to.terminal = 'minus';
    const t = parseDiagram(wrongTerminal);
    expect(!t.ok && t.errors).toEqual([{ path: '$.cables[1].to.terminal', message: expect.stringMatching(/no terminal "minus".*pos, neg/) }]);
  });

  it('reports at most 20 errors with the total', () => {
    const bad = minimal();
    bad.parts = Array.from({ length: 30 }, (_, i) => ({ id: `b${i}`, type: 'battery', position: { x: 0, y: 0 }, props: { ...batteryDefaults(), soc: 2 } }));
    bad.cables = [];
    const r = parseDiagram(bad);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toHaveLength(MAX_REPORTED_ISSUES);
    expect(r.totalErrors).toBe(30);
  });

  it('enforces the size limits', () => {
    const big = minimal();
    big.parts = Array.from({ length: DIAGRAM_LIMITS.maxParts + 1 }, (_, i) => ({ id: `n${i}`, type: 'note', position: { x: 0, y: 0 }, props: { text: '' } })) as never;
    big.cables = [];
    const r = parseDiagram(big);
    expect(!r.ok && r.errors[0].path).toBe('$.parts');
    const longName = { ...minimal(), name: 'x'.repeat(DIAGRAM_LIMITS.maxNameLength + 1) };
    expect(parseDiagram(longName).ok).toBe(false);
    const badId = minimal();
    badId.parts[0].id = 'has space';
    expect(parseDiagram(badId).ok).toBe(false);
  });

  it('keeps annotations open: id and kind required, other fields kept', () => {
    const doc = { ...minimal(), annotations: [{ id: 'a1', kind: 'dimension', from: 'b1', to: 'load', text: '2 m' }] };
    const r = parseDiagram(doc);
    expect(r.ok && r.doc.annotations[0]).toEqual({ id: 'a1', kind: 'dimension', from: 'b1', to: 'load', text: '2 m' });
    expect(parseDiagram({ ...minimal(), annotations: [{ id: 'a1' }] }).ok).toBe(false);
  });
});

describe('format versions', () => {
  it('rejects non-JSON, a missing version and a newer version, naming the path', () => {
    expect(parseDiagram('{not json')).toMatchObject({ ok: false, errors: [{ path: '$' }] });
    const { formatVersion: _v, ...noVersion } = minimal();
    expect(parseDiagram(noVersion)).toMatchObject({ ok: false, errors: [{ path: '$.formatVersion' }] });
    const newer = parseDiagram({ ...minimal(), formatVersion: 2 });
    expect(newer).toMatchObject({ ok: false, errors: [{ path: '$.formatVersion', message: expect.stringMatching(/version 2/) }] });
    expect(migrateDiagram([])).toMatchObject({ ok: false });
  });

  it('passes the current version through', () => {
    expect(DIAGRAM_FORMAT_VERSION).toBe(1);
    expect(migrateDiagram(minimal())).toMatchObject({ ok: true, from: 1 });
  });

  it('writes JSON paths with brackets for indices and odd keys', () => {
    expect(jsonPath(['parts', 3, 'props', 'capacity_Ah'])).toBe('$.parts[3].props.capacity_Ah');
    expect(jsonPath(['a b'])).toBe('$["a b"]');
  });
});

describe('templates', () => {
  it('post to post: N batteries, jumpers between neighbours, laid out left to right', () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'diagonal' });
    expect(diagramSchema.safeParse(doc).success).toBe(true);
    const batteries = doc.parts.filter((p) => p.type === 'battery');
    expect(batteries).toHaveLength(4);
    const xs = batteries.map((p) => p.position.x);
    expect([...xs].sort((a, b) => a - b)).toEqual(xs);
    expect(new Set(xs).size).toBe(4);
    expect(doc.cables.filter((c) => c.props.role === 'jumper')).toHaveLength(6);
    // Diagonal: positive from battery 1 (through the main fuse), negative from battery 4.
    expect(doc.cables.find((c) => c.id === 'c-main-fuse')?.from).toEqual({ part: 'bat1', terminal: 'pos' });
    expect(doc.cables.find((c) => c.id === 'c-main-neg')?.from).toEqual({ part: 'bat4', terminal: 'neg' });
  });

  it('post to post with an inner take-off uses the chosen batteries', () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'inner', takeOffIndices: { pos: 2, neg: 3 } });
    expect(doc.cables.find((c) => c.id === 'c-main-fuse')?.from).toEqual({ part: 'bat2', terminal: 'pos' });
    expect(doc.cables.find((c) => c.id === 'c-main-neg')?.from).toEqual({ part: 'bat3', terminal: 'neg' });
    expect(() => postToPostTemplate({ count: 4, takeOff: 'inner', takeOffIndices: { pos: 5, neg: 1 } })).toThrow(RangeError);
    const same = postToPostTemplate({ count: 3, takeOff: 'same-end', mainFuse: null });
    expect(same.parts.some((p) => p.type === 'fuse')).toBe(false);
    expect(same.cables.find((c) => c.id === 'c-main-pos')?.from).toEqual({ part: 'bat1', terminal: 'pos' });
    expect(same.cables.find((c) => c.id === 'c-main-neg')?.from).toEqual({ part: 'bat1', terminal: 'neg' });
  });

  it('busbar bank: equal battery cables, a fuse per battery, the protected cable covers its fuse', () => {
    const doc = busbarBankTemplate({ count: 3, batteryCable_m: 1.2 });
    expect(diagramSchema.safeParse(doc).success).toBe(true);
    const pos = doc.cables.filter((c) => /^c-pos\d$/.test(c.id));
    const neg = doc.cables.filter((c) => /^c-neg\d$/.test(c.id));
    expect(pos).toHaveLength(3);
    expect(new Set([...pos, ...neg].map((c) => c.props.length_m))).toEqual(new Set([1.2]));
    const fuses = doc.parts.filter((p) => p.type === 'fuse' && p.id.startsWith('fuse'));
    expect(fuses).toHaveLength(3);
    // 2 kW at 90 % on 12.8 V is 173.6 A; a third is 57.9 A; × 1.25 = 72.3 A → 80 A (NEC 240.6(A)).
    for (const f of fuses) expect(f.type === 'fuse' && f.props.rating_A).toBe(80);
    // NEC Table 310.16 75 °C: 4 AWG carries 85 A ≥ 80 A, 6 AWG only 65 A.
    expect(pos[0].props.conductor).toEqual({ system: 'awg', size: '4' });
  });

  it('series-parallel 4S2P: two strings of four, a fuse per string, a 48 V system', () => {
    const doc = seriesParallelTemplate({ seriesCount: 4, parallelCount: 2 });
    expect(diagramSchema.safeParse(doc).success).toBe(true);
    expect(doc.settings.systemVoltage_V).toBe(48);
    const strings = doc.parts.filter((p) => p.type === 'series_string');
    expect(strings).toHaveLength(2);
    for (const s of strings) expect(s.type === 'series_string' && s.props.count).toBe(4);
    expect(doc.parts.filter((p) => p.type === 'fuse')).toHaveLength(3); // two string fuses and the main fuse
  });

  it('an empty diagram is valid', () => {
    expect(diagramSchema.safeParse(emptyDiagram('New bank')).success).toBe(true);
  });
});
