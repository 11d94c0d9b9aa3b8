import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type DiagramDocument, busbarBankTemplate, postToPostTemplate, seriesParallelTemplate } from '../../../shared/diagram';
import { buildContext } from '../../../shared/electrical/analysis';
import { analyzeDiagram } from '../../../shared/electrical/study';

const template = fc.oneof(
  fc.record({ count: fc.integer({ min: 1, max: 8 }), takeOff: fc.constantFrom('same-end' as const, 'diagonal' as const), power: fc.integer({ min: 100, max: 3000 }) })
    .map((o) => postToPostTemplate({ count: o.count, takeOff: o.takeOff, inverter: { power_W: o.power, efficiency: 0.9, cutoff_V: 10 } })),
  fc.record({ count: fc.integer({ min: 1, max: 8 }), len: fc.double({ min: 0.2, max: 3, noNaN: true }) })
    .map((o) => busbarBankTemplate({ count: o.count, batteryCable_m: o.len })),
  fc.record({ s: fc.integer({ min: 1, max: 4 }), p: fc.integer({ min: 1, max: 4 }) })
    .map((o) => seriesParallelTemplate({ seriesCount: o.s, parallelCount: o.p })),
);

function rename(doc: DiagramDocument, f: (id: string) => string): DiagramDocument {
  return {
    ...doc,
    parts: doc.parts.map((p) => ({ ...p, id: f(p.id) })),
    cables: doc.cables.map((c) => ({ ...c, id: f(c.id), from: { ...c.from, part: f(c.from.part) }, to: { ...c.to, part: f(c.to.part) } })),
  };
}

describe('properties over random templates (fast-check)', () => {
  it('shares sum to 100 %; ideal shares sum to 100 %', () => {
    fc.assert(fc.property(template, (doc) => {
      const r = analyzeDiagram(doc, { rules: false });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const s = Object.values(r.operating!.sources);
      expect(s.reduce((a, x) => a + x.share_pct, 0)).toBeCloseTo(100, 6);
      expect(s.reduce((a, x) => a + x.idealShare_pct, 0)).toBeCloseTo(100, 6);
    }), { numRuns: 40 });
  });

  it("Kirchhoff's current law holds at every node of the compiled network", () => {
    fc.assert(fc.property(template, (doc) => {
      const r = analyzeDiagram(doc, { rules: false });
      const built = buildContext(doc);
      if (!r.ok || !built.ok) throw new Error('analysis failed');
      const net = built.ctx.network;
      const sum = new Map<string, number>();
      const add = (n: string, x: number) => sum.set(n, (sum.get(n) ?? 0) + x);
      let scale = 0;
      for (const el of net.elements) {
        const i = r.operating!.elements[el.id]?.current_A;
        if (i === undefined) continue; // chargers are off in the load case
        scale = Math.max(scale, Math.abs(i));
        // Current leaving the first node into the element (batteries deliver at pos: sign flipped).
        if (el.kind === 'battery' || el.kind === 'constant_power' || el.kind === 'voltage_source') {
          const out = el.kind === 'constant_power' ? i : -i;
          add(el.pos, out);
          add(el.neg, -out);
        } else if (el.kind === 'current_source') {
          add(el.from, i);
          add(el.to, -i);
        } else {
          add(el.a, i);
          add(el.b, -i);
        }
      }
      for (const v of sum.values()) expect(Math.abs(v)).toBeLessThan(1e-9 * Math.max(1, scale));
    }), { numRuns: 40 });
  });

  it('power balance: battery EMF power = losses + load power', () => {
    fc.assert(fc.property(template, (doc) => {
      const r = analyzeDiagram(doc, { rules: false });
      if (!r.ok) throw new Error('analysis failed');
      const op = r.operating!;
      const emf = Object.values(op.sources).reduce((a, s) => a + s.ocv_V * s.current_A, 0);
      const loads = Object.values(op.parts).filter((p) => p.type === 'inverter' || p.type === 'dc_load').reduce((a, p) => a + (p.power_W ?? 0), 0);
      expect(emf).toBeCloseTo(op.losses.total_W + loads, 6);
    }), { numRuns: 40 });
  });

  it('renaming part and cable ids changes nothing but the keys', () => {
    fc.assert(fc.property(template, fc.stringMatching(/^[a-z][a-z0-9]{0,5}$/), (doc, prefix) => {
      const f = (id: string) => `${prefix}_${id}`;
      const a = analyzeDiagram(doc);
      const b = analyzeDiagram(rename(doc, f));
      if (!a.ok || !b.ok) throw new Error('analysis failed');
      for (const [id, s] of Object.entries(a.operating!.sources)) expect(b.operating!.sources[f(id)].current_A).toBeCloseTo(s.current_A, 9);
      for (const [id, c] of Object.entries(a.operating!.cables)) expect(b.operating!.cables[f(id)].current_A).toBeCloseTo(c.current_A, 9);
      expect(b.findings.map((x) => x.id)).toEqual(a.findings.map((x) => x.id));
      for (const [id, m] of Object.entries(a.faults!.maxByFuse)) expect(b.faults!.maxByFuse[f(id)].current_A).toBeCloseTo(m.current_A, 6);
    }), { numRuns: 25 });
  });
});
