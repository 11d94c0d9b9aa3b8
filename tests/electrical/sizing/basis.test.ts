/**
 * What the sizing rests on, each against a value worked by hand: the N-1 current, the fuse class made at
 * the rating, the voltage and interrupting ratings, the battery's continuous limit, the team's size
 * series, the fuse at the post, and the checked transaction that refuses a change for the worse.
 */
import { describe, expect, it } from 'vitest';
import { postToPostTemplate } from '../../../shared/diagram';
import { buildContext } from '../../../shared/electrical/analysis';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { fuseDefaults } from '../../../shared/electrical/parts';
import { FUSE_CLASSES } from '../../../shared/electrical/tables/fuses';
import { MM2_SIZES } from '../../../shared/units/conductor';
import { applySizing, checkChange, planSizing, sizeDiagram, suggestSizing } from '../../../shared/electrical/sizing';
import { battery, currentLoad, diagram, end, run } from '../analysis/helpers';

const bus = (id: string, y: number, taps: number) => ({
  id, type: 'busbar' as const, position: { x: 0, y }, props: { material: 'copper' as const, width_mm: 40, thickness_mm: 10, tapCount: taps, tapSpacing_m: 0.04, rating_A: 1000 },
});

/**
 * n equal batteries, each with equal 1 m runs of `mm2` to the first tap of a positive and a negative busbar
 * (all on one stud, so every path is the same), a constant-current load from the second taps.
 */
function busbarBank(n: number, load_A: number, o: { mm2?: number; battery?: Parameters<typeof battery>[2]; fuse?: ReturnType<typeof fuseDefaults> } = {}) {
  const parts: Parameters<typeof diagram>[0] = [bus('bp', -300, 2), bus('bn', 300, 2), currentLoad('load', load_A)];
  const cables: Parameters<typeof diagram>[1] = [];
  for (let k = 1; k <= n; k++) {
    parts.push(battery(`b${k}`, k * 200, o.battery));
    if (o.fuse) {
      parts.push({ id: `f${k}`, type: 'fuse', position: { x: k * 200, y: -120 }, props: o.fuse });
      cables.push({ id: `l${k}`, from: end(`b${k}`, 'pos'), to: end(`f${k}`, 'a'), props: run(o.mm2 ?? 50, 0.1) });
      cables.push({ id: `p${k}`, from: end(`f${k}`, 'b'), to: end('bp', 't1'), props: run(o.mm2 ?? 50, 1) });
    } else {
      cables.push({ id: `p${k}`, from: end(`b${k}`, 'pos'), to: end('bp', 't1'), props: run(o.mm2 ?? 50, 1) });
    }
    cables.push({ id: `n${k}`, from: end(`b${k}`, 'neg'), to: end('bn', 't1'), props: run(o.mm2 ?? 50, 1) });
  }
  cables.push({ id: 'lp', from: end('bp', 't2'), to: end('load', 'pos'), props: run(95, 1) });
  cables.push({ id: 'ln', from: end('bn', 't2'), to: end('load', 'neg'), props: run(95, 1) });
  return diagram(parts, cables);
}

function sized(doc: ReturnType<typeof diagram>, unitSystem?: 'metric' | 'us') {
  const r = suggestSizing(doc, unitSystem ? { unitSystem } : {});
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
  return r.branches;
}

describe('sizing basis', () => {
  it('N-1: three equal batteries share a 90 A constant-current load 30 A each, 45 A each with one out; 45 A > 30 × 1.25 = 37.5 A sets the 45 A fuse', () => {
    // First principles: equal paths share equally (90 / 3 = 30 A); with one out the other two carry 90 / 2 = 45 A.
    // NEC 240.6(A) lists 45 A; Class T is made at 45 A (common practice, from memory).
    const b = sized(busbarBank(3, 90, { fuse: fuseDefaults('class_t', 200) }))[0];
    expect(b.share_A).toBeCloseTo(30, 6);
    expect(b.nMinusOne_A).toBeCloseTo(45, 4); // the open battery is modelled as a 10 MΩ leakage
    expect(b.required_A).toBeCloseTo(45, 4);
    expect(b.fuse.rating_A).toBe(45);
    expect(b.fuse.fuseClass).toBe('class_t');
  });

  it('the class offered is made at the rating: a 60 A suggestion is never a Class T list that starts at 100 A', () => {
    for (const b of sized(postToPostTemplate({ count: 4, takeOff: 'diagonal' }))) {
      expect(FUSE_CLASSES[b.fuse.fuseClass].ratings_A).toContain(b.fuse.rating_A);
    }
  });

  it('the voltage rating covers the charging voltage, not the nominal: 16 LFP cells reach 16 × 3.65 = 58.4 V, above a 58 V terminal fuse', () => {
    // LFP full charge 3.65 V per cell (common practice). A 51.2 V battery of 16 cells.
    const doc = busbarBank(2, 40, { battery: { nominal_V: 51.2, cells_in_series: 16, restingVoltage_V: 53.2, r_internal_ohm: 0.02 }, fuse: fuseDefaults('battery_terminal', 100) });
    doc.settings.systemVoltage_V = 48;
    const b = sized(doc)[0];
    expect(b.bankMax_V).toBeCloseTo(58.4, 6);
    expect(FUSE_CLASSES[b.fuse.fuseClass].voltage_V).toBeGreaterThanOrEqual(58.4);
    expect(b.fuse.fuseClass).not.toBe('battery_terminal');
  });

  it('the interrupting rating covers what the rest of the bank pushes into a failed battery: 3 × 13.2 V / 4 mΩ = 9,900 A rules out a 3 kA ANL', () => {
    // First principles: each battery's short-circuit current is V_oc / R_int = 13.2 / 0.004 = 3,300 A; the other three add to 9,900 A.
    const doc = busbarBank(4, 100, { battery: { restingVoltage_V: 13.2, r_internal_ohm: 0.004 }, fuse: fuseDefaults('anl', 100) });
    const b = sized(doc)[0];
    expect(b.prospective_A).toBeCloseTo(9900, 6);
    expect(b.fuse.fuseClass).not.toBe('anl');
    expect(FUSE_CLASSES[b.fuse.fuseClass].interrupting_A).toBeGreaterThanOrEqual(9900);
  });

  it('at most the battery\'s continuous limit; a battery already above it is a conflict that is never applied', () => {
    // 2 batteries, 190 A: 95 A each; 95 × 1.25 = 118.75 A, but the batteries are limited to 100 A: held at 100 A (NEC 240.6(A)).
    const held = sized(busbarBank(2, 190, { battery: { max_continuous_A: 100 }, fuse: fuseDefaults('class_t', 200) }))[0];
    expect(held.status).toBe('ok');
    expect(held.fuse.rating_A).toBe(100);
    expect(held.reasoning).toMatch(/held to 100 A/);
    // 2 batteries, 220 A: 110 A each, above the 100 A limit: no fuse can carry it and stay within the limit.
    const doc = busbarBank(2, 220, { battery: { max_continuous_A: 100 }, fuse: fuseDefaults('class_t', 200) });
    const over = sized(doc)[0];
    expect(over.status).toBe('conflict');
    expect(over.reasoning).toMatch(/above its maximum continuous current of 100/);
    expect(applySizing(doc, over)).toEqual(doc);
  });

  it('a metric team is offered IEC 60228 sizes, a US team AWG/kcmil, whatever the drawing holds', () => {
    const doc = busbarBank(2, 120, { mm2: 1.5, battery: { max_continuous_A: 300 } });
    const metric = sized(doc, 'metric')[0];
    expect(metric.minimumConductor?.system).toBe('mm2');
    expect(MM2_SIZES as readonly number[]).toContain(metric.minimumConductor?.size);
    const us = sized(doc, 'us')[0];
    expect(['awg', 'kcmil']).toContain(us.minimumConductor?.system);
  });
});

describe('the fuse at the post', () => {
  it('post to post: each added fuse takes everything on the post onto its bank side and carries its battery alone', () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'diagonal' });
    const r = sizeDiagram(doc);
    if (!r.ok) throw new Error('sizing failed');
    const next = applySizing(doc, r.branches);
    // No cable is left on a battery's positive post but the link to its own fuse's battery side (terminal a).
    for (const k of [1, 2, 3, 4]) {
      const onPost = next.cables.filter((c) => (c.from.part === `bat${k}` && c.from.terminal === 'pos') || (c.to.part === `bat${k}` && c.to.terminal === 'pos'));
      expect(onPost).toHaveLength(1);
      const other = onPost[0].from.part === `bat${k}` ? onPost[0].to : onPost[0].from;
      expect(other).toEqual({ part: `fuse-bat${k}`, terminal: 'a' });
    }
    const a = analyzeDiagram(next);
    if (!a.ok || !a.operating) throw new Error('no solution');
    for (const k of [1, 2, 3, 4]) {
      const iBat = a.operating.sources[`bat${k}`].current_A;
      expect(Math.abs(a.operating.parts[`fuse-bat${k}`].current_A ?? 0)).toBeCloseTo(Math.abs(iBat), 9); // Kirchhoff's current law: in series
      expect(a.operating.cables[`c-bat${k}-fuse`].current_A).not.toBe(0);
    }
    expect(a.findings.map((f) => f.id)).not.toContain('parallel-battery-without-fuse');
    const ctx = buildContext(next);
    if (!ctx.ok) throw new Error('no context');
    expect(ctx.ctx.units.every((u) => u.fuses.length === 1)).toBe(true);
  });
});

describe('apply is a checked transaction', () => {
  it('checkChange refuses a change that pushes a cable above its ampacity, naming it and the figure', () => {
    const doc = busbarBank(2, 100, { mm2: 35, fuse: fuseDefaults('class_t', 70) });
    const worse = structuredClone(doc);
    // 2.5 mm² is read as 14 AWG (the largest AWG at or below its area), 20 A at 75 °C (NEC 310.16).
    worse.cables.find((c) => c.id === 'p1')!.props.conductor = { system: 'mm2', size: 2.5 };
    const check = checkChange(doc, worse);
    expect(check.safe).toBe(false);
    expect(check.reasons.join(' ')).toMatch(/p1 would run at \d+ % of its ampacity/);
    expect(check.loading.some((l) => l.id === 'p1' && (l.after_pct ?? 0) > 100)).toBe(true);
    expect(check.errors.after).toBeGreaterThan(check.errors.before);
    expect(check.appeared.some((f) => f.id === 'cable-over-ampacity')).toBe(true);
    // The same change undone is safe, and the finding disappears.
    const back = checkChange(worse, doc);
    expect(back.safe).toBe(true);
    expect(back.disappeared.some((f) => f.id === 'cable-over-ampacity')).toBe(true);
  });

  it('the plan applies the safe suggestions and refuses the unsafe one with its reason', () => {
    // 95 mm² is read as 3/0 AWG, 200 A at 75 °C (NEC 310.16): the 200 A fuses are within it, so no error before.
    const doc = busbarBank(3, 90, { mm2: 95, fuse: fuseDefaults('class_t', 200) });
    expect(analyzeDiagram(doc).findings.filter((f) => f.id === 'fuse-above-ampacity')).toEqual([]);
    const r = suggestSizing(doc);
    if (!r.ok) throw new Error('sizing failed');
    // Tamper with one suggestion so that it would fit a conductor far too small for its current.
    const bad = r.branches.map((b) => (b.source === 'b2' ? { ...b, cables: b.cables.map((c) => ({ ...c, conductor: { system: 'mm2' as const, size: 2.5 } })) } : b));
    const plan = planSizing(doc, bad);
    expect(plan.all?.safe).toBe(false);
    expect(plan.safe).toEqual(['b1', 'b3']);
    expect(plan.refused.map((x) => x.source)).toEqual(['b2']);
    expect(plan.refused[0].reasons.length).toBeGreaterThan(0);
    expect(plan.safeCheck?.safe).toBe(true);
  });
});

describe('a fuse of its own is one in series with that battery alone', () => {
  it('a fuse in the jumper chain is nobody\u2019s own fuse; the same fuse at the post is', () => {
    // Two batteries post to post, leads from battery 1; a fuse between battery 1's post and the jumper to battery 2.
    const inChain = diagram(
      [battery('b1', 0), battery('b2', 200), { id: 'f', type: 'fuse', position: { x: 100, y: -120 }, props: fuseDefaults('class_t', 100) }, currentLoad('load', 100)],
      [
        { id: 'l1', from: end('b1', 'pos'), to: end('f', 'a'), props: run(35, 0.1) },
        { id: 'j', from: end('f', 'b'), to: end('b2', 'pos'), props: run(35, 0.3, { role: 'jumper' }) },
        { id: 'jn', from: end('b1', 'neg'), to: end('b2', 'neg'), props: run(35, 0.3, { role: 'jumper' }) },
        { id: 'lp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(50, 1) },
        { id: 'ln', from: end('b2', 'neg'), to: end('load', 'neg'), props: run(50, 1) },
      ],
    );
    const a = analyzeDiagram(inChain);
    const without = a.findings.filter((f) => f.id === 'parallel-battery-without-fuse').flatMap((f) => f.parts);
    // The fuse carries battery 2's current on its way to the leads at battery 1's post — not battery 1's.
    expect(without).toContain('b1');
    // Battery 2's post holds only the jumper from the fuse: the fuse is in series with battery 2 alone, so it is battery 2's own.
    expect(without).not.toContain('b2');
    if (!a.ok || !a.operating) throw new Error('no solution');
    expect(Math.abs(a.operating.parts.f.current_A ?? 0)).toBeCloseTo(Math.abs(a.operating.sources.b2.current_A), 9); // in series (KCL)
  });
});
