/**
 * Sizing never makes a bank worse: over banks drawn from the templates (2 to 8 batteries, every take-off
 * layout, busbars, series strings, with and without fuses of their own, inverters from 500 W to 4 kW,
 * lithium and lead-acid), the suggestions the plan accepts are applied and:
 * - the error count never rises;
 * - every battery fuse the sizing placed or re-rated carries its own battery's current alone (a fuse in
 *   series with one battery and nothing else carries that battery's current: Kirchhoff's current law),
 *   within 0.1 %;
 * - no fuse or cable ends above 100 % of its rating or ampacity (nor above where it was before).
 * Fixed seed (tests/helpers/fast-check-config.ts); FC_SEED=random explores.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate, seriesParallelTemplate } from '../../../shared/diagram';
import type { DiagramDocument } from '../../../shared/diagram';
import { buildContext, type AnalysisResult } from '../../../shared/electrical/analysis';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { batteryDefaults, inverterDefaults } from '../../../shared/electrical/parts';
import { applySafeSizing, sizeDiagram } from '../../../shared/electrical/sizing';

const chemistry = fc.constantFrom(['lfp', 100], ['lfp', 200], ['lfp', 280], ['agm', 100], ['agm', 200]) as fc.Arbitrary<['lfp' | 'agm', number]>;
const power = fc.integer({ min: 5, max: 40 }).map((x) => x * 100);

const bank: fc.Arbitrary<{ name: string; doc: DiagramDocument }> = fc.oneof(
  fc.record({ n: fc.integer({ min: 2, max: 8 }), takeOff: fc.constantFrom('same-end', 'diagonal', 'inner'), chem: chemistry, p: power, pos: fc.nat(), neg: fc.nat() }).map(({ n, takeOff, chem, p, pos, neg }) => ({
    name: `post to post ${n} ${takeOff} ${chem.join(' ')} ${p} W`,
    doc: postToPostTemplate({
      count: n, takeOff: takeOff as 'same-end' | 'diagonal' | 'inner', battery: batteryDefaults(chem[0], chem[1]),
      inverter: { ...inverterDefaults(), power_W: p, rated_W: p },
      ...(takeOff === 'inner' ? { takeOffIndices: { pos: 1 + (pos % n), neg: 1 + (neg % n) } } : {}),
    }),
  })),
  fc.record({ n: fc.integer({ min: 2, max: 8 }), fused: fc.boolean(), chem: chemistry, p: power }).map(({ n, fused, chem, p }) => ({
    name: `busbars ${n} ${fused ? 'fused' : 'unfused'} ${chem.join(' ')} ${p} W`,
    doc: busbarBankTemplate({ count: n, battery: batteryDefaults(chem[0], chem[1]), inverter: { ...inverterDefaults(), power_W: p, rated_W: p }, ...(fused ? {} : { batteryFuse: null }) }),
  })),
  fc.record({ s: fc.integer({ min: 2, max: 4 }), n: fc.integer({ min: 2, max: 4 }), fused: fc.boolean(), p: power }).map(({ s, n, fused, p }) => ({
    name: `${s}S${n}P ${fused ? 'fused' : 'unfused'} ${p * 2} W`,
    doc: seriesParallelTemplate({ seriesCount: s, parallelCount: n, inverter: { ...inverterDefaults(), power_W: p * 2, rated_W: p * 2 }, ...(fused ? {} : { stringFuse: null }) }),
  })),
);

const errors = (r: AnalysisResult) => r.findings.filter((f) => f.severity === 'error').length;

function loadings(r: AnalysisResult): Map<string, number> {
  const out = new Map<string, number>();
  if (!r.ok || !r.operating) return out;
  for (const [id, c] of Object.entries(r.operating.cables)) if (c.utilisation_pct !== null) out.set(id, c.utilisation_pct);
  for (const [id, p] of Object.entries(r.operating.parts)) if (p.type === 'fuse' && p.utilisation_pct !== undefined) out.set(id, p.utilisation_pct);
  return out;
}

describe('applying the sizing plan', () => {
  it('never adds an error, puts each battery fuse in series with its battery alone, and overloads nothing', () => {
    fc.assert(
      fc.property(bank, ({ doc }) => {
        const sized = sizeDiagram(doc);
        if (!sized.ok) throw new Error(`sizing failed: ${sized.errors.map((e) => e.message).join('; ')}`);
        const after = applySafeSizing(doc, sized);
        const rb = analyzeDiagram(doc);
        const ra = analyzeDiagram(after);
        expect(ra.ok).toBe(true);
        expect(errors(ra)).toBeLessThanOrEqual(errors(rb));
        const before = loadings(rb);
        for (const [id, pct] of loadings(ra)) expect(pct, id).toBeLessThanOrEqual(Math.max(100, before.get(id) ?? 0) + 1e-6);
        // Each battery the plan applied has a fuse of its own, carrying that battery's current alone.
        const built = buildContext(after);
        if (!built.ok || !ra.ok || !ra.operating) throw new Error('after does not compile');
        for (const source of sized.plan.safe) {
          const unit = built.ctx.unitById.get(source)!;
          expect(unit.fuses.length, `${source} has a fuse of its own`).toBeGreaterThan(0);
          const iBattery = ra.operating.sources[source].current_A;
          for (const f of unit.fuses) {
            const iFuse = Math.abs(ra.operating.parts[f].current_A ?? 0);
            expect(Math.abs(iFuse - Math.abs(iBattery))).toBeLessThanOrEqual(0.001 * Math.abs(iBattery) + 1e-9);
          }
        }
        // Everything the plan refused says why.
        for (const r of sized.plan.refused) expect(r.reasons.length).toBeGreaterThan(0);
      }),
      { numRuns: 60 },
    );
  }, 120_000);
});
