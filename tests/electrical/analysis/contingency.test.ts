/**
 * The N-1 study: the load case with each unit disconnected in turn, checked against hand solutions of
 * small banks (first principles: batteries of equal EMF in parallel feeding a current sink share it in
 * proportion to their branch conductances; with one branch open the others take all of it).
 */
import { describe, expect, it } from 'vitest';
import type { DiagramDocumentInput } from '../../../shared/diagram';
import { buildContext, modeNetwork, operatingPoint, type AnalysisContext } from '../../../shared/electrical/analysis';
import { contingencyStudy, parallelUnits, type ContingencyCase } from '../../../shared/electrical/analysis/contingency';
import { prepareNetwork } from '../../../shared/electrical/network/fast';
import { batteryDefaults, type FuseProps } from '../../../shared/electrical/parts';
import { runRules, type Rule } from '../../../shared/electrical/rules/registry';
import { battery, currentLoad, diagram, end, run, runOhm } from './helpers';

const fuse = (id: string, x: number, props: Partial<FuseProps> = {}) => ({
  id, type: 'fuse' as const, position: { x, y: -100 },
  props: { fuseClass: 'class_t' as const, rating_A: 125, voltage_rating_V: 160, interrupting_A: 20_000, cold_r_ohm: 0.001, ...props },
});

function context(doc: ReturnType<typeof diagram>): AnalysisContext {
  const built = buildContext(doc);
  if (!built.ok) throw new Error(JSON.stringify(built.errors));
  return built.ctx;
}

function study(doc: ReturnType<typeof diagram>) {
  const ctx = context(doc);
  const prep = prepareNetwork(modeNetwork(ctx, 'load'));
  if ('ok' in prep) throw new Error(prep.error.message);
  return contingencyStudy(ctx, prep);
}

function solved(c: ContingencyCase | undefined): Extract<ContingencyCase, { ok: true }> {
  if (!c || !c.ok) throw new Error(`case did not solve: ${JSON.stringify(c)}`);
  return c;
}

/**
 * Each battery's positive bolted to its own fuse (terminal a, the battery side), each fuse's bank side
 * (terminal b) and each battery's negative joined to the load by `leads` (zero length: bolted).
 */
function starBank(r_mohm: number[], load_A: number, leads: { pos_m: number; neg_m: number }[] | null = null, batteryProps: Record<string, unknown> = {}) {
  const parts: DiagramDocumentInput['parts'] = [];
  const cables: DiagramDocumentInput['cables'] = [];
  r_mohm.forEach((r, i) => {
    const k = i + 1;
    parts.push(battery(`b${k}`, k * 200, { r_internal_ohm: r / 1000, ...batteryProps }));
    parts.push(fuse(`f${k}`, k * 200));
    cables.push({ id: `post${k}`, from: end(`b${k}`, 'pos'), to: end(`f${k}`, 'a'), props: run(50, 0) });
    cables.push({ id: `cp${k}`, from: end(`f${k}`, 'b'), to: end('load', 'pos'), props: run(50, leads?.[i].pos_m ?? 0) });
    cables.push({ id: `cn${k}`, from: end(`b${k}`, 'neg'), to: end('load', 'neg'), props: run(50, leads?.[i].neg_m ?? 0) });
  });
  parts.push(currentLoad('load', load_A));
  return diagram(parts, cables);
}

/** Leakage of the open battery (10 MΩ across about 13 V, about 1.3 µA) is far below this tolerance, A. */
const DIGITS = 4;

describe('N-1 study: hand-solvable banks (first principles)', () => {
  it('three batteries, branches 2, 3 and 6 mΩ, 120 A sink: each case matches the exact rational split', () => {
    // Branch resistance = internal (1, 2, 5 mΩ) + fuse cold resistance (1 mΩ) = 2, 3, 6 mΩ; all joints
    // bolted. Equal EMFs feeding a current sink: I_k = I × G_k / ΣG (first principles), so the
    // conductances 500, 333⅓, 166⅔ S split 120 A in the ratio 3 : 2 : 1 → 60, 40, 20 A.
    // Case b1 open: b2 : b3 = 2 : 1 → 80, 40 A. Case b2 open: b1 : b3 = 3 : 1 → 90, 30 A.
    // Case b3 open: b1 : b2 = 3 : 2 → 72, 48 A.
    const s = study(starBank([1, 2, 5], 120))!;
    expect(s.cases.map((c) => c.unit)).toEqual(['b1', 'b2', 'b3']);
    const expected: Record<string, Record<string, number>> = {
      b1: { b2: 80, b3: 40 },
      b2: { b1: 90, b3: 30 },
      b3: { b1: 72, b2: 48 },
    };
    for (const c of s.cases.map(solved)) {
      const want = expected[c.unit];
      expect(Object.keys(c.sources).sort()).toEqual(Object.keys(want).sort());
      for (const [id, amps] of Object.entries(want)) {
        expect(c.sources[id]).toBeCloseTo(amps, DIGITS);
        // Each fuse is in series with its battery alone: it carries that battery's current, a → b.
        expect(c.fuses[`f${id.slice(1)}`]).toBeCloseTo(amps, DIGITS);
      }
      // The disconnected battery's own fuse carries (next to) nothing.
      expect(c.fuses[`f${c.unit.slice(1)}`]).toBeCloseTo(0, DIGITS);
      expect(c.loadsBelowCutoff).toEqual([]);
    }
  });

  it('two equal batteries with real leads: the one left carries the whole load through its fuse and cables', () => {
    // Kirchhoff's current law: with b2 open, every ampere of the 150 A sink comes from b1, whatever
    // the resistances. The positive lead runs fuse → load (+150 A from its `from` end); the negative
    // lead is drawn battery → load, and the current returns load → battery (−150 A).
    const s = study(starBank([4, 4], 150, [{ pos_m: 1.5, neg_m: 1.5 }, { pos_m: 1.5, neg_m: 1.5 }]))!;
    const c = solved(s.cases.find((x) => x.unit === 'b2'));
    expect(c.sources.b1).toBeCloseTo(150, DIGITS);
    expect(c.fuses.f1).toBeCloseTo(150, DIGITS);
    expect(c.cables.cp1).toBeCloseTo(150, DIGITS);
    expect(c.cables.cn1).toBeCloseTo(-150, DIGITS);
    expect(c.cables.cp2).toBeCloseTo(0, DIGITS);
    expect(c.cables.cn2).toBeCloseTo(0, DIGITS);
    expect(c.fuses.f2).toBeCloseTo(0, DIGITS);
  });

  it('three batteries with leads of different lengths: the split follows the branch conductances', () => {
    // Branch k: internal r_k + fuse 1 mΩ + positive and negative leads of 50 mm² solid copper at the
    // bank's 30 °C ambient (R = ρ20 (1 + α (T − 20)) L / A, IEC 60028: ρ20 0.017241 Ω·mm²/m, α 0.00393/K).
    const r_mohm = [3, 4, 5];
    const leads = [{ pos_m: 1, neg_m: 1 }, { pos_m: 2, neg_m: 1.5 }, { pos_m: 3, neg_m: 2.5 }];
    const R = r_mohm.map((r, i) => r / 1000 + 0.001 + runOhm(50, leads[i].pos_m) + runOhm(50, leads[i].neg_m));
    const G = R.map((x) => 1 / x);
    const I = 200;
    const s = study(starBank(r_mohm, I, leads))!;
    for (let open = 0; open < 3; open++) {
      const c = solved(s.cases[open]);
      const rest = G.reduce((sum, g, j) => (j === open ? sum : sum + g), 0);
      for (let j = 0; j < 3; j++) {
        if (j === open) continue;
        const want = (I * G[j]) / rest;
        expect(c.sources[`b${j + 1}`]).toBeCloseTo(want, DIGITS);
        expect(c.cables[`cp${j + 1}`]).toBeCloseTo(want, DIGITS);
      }
    }
  });

  it('a series string is disconnected as a whole; its partner string takes the load', () => {
    // Two strings of 2 × 12.8 V LFP in parallel feeding 60 A: with either string open the other carries
    // all 60 A (Kirchhoff's current law).
    const member = { ...batteryDefaults('lfp', 100), r_internal_ohm: 0.004 };
    const str = (id: string, x: number) => ({ id, type: 'series_string' as const, position: { x, y: 0 }, props: { count: 2, member } });
    const doc = diagram(
      [str('s1', 0), str('s2', 300), currentLoad('load', 60)],
      [
        { id: 'p1', from: end('s1', 'pos'), to: end('load', 'pos'), props: run(35, 1) },
        { id: 'n1', from: end('s1', 'neg'), to: end('load', 'neg'), props: run(35, 1) },
        { id: 'p2', from: end('s2', 'pos'), to: end('load', 'pos'), props: run(35, 1.2) },
        { id: 'n2', from: end('s2', 'neg'), to: end('load', 'neg'), props: run(35, 1.2) },
      ],
      { systemVoltage_V: 24 },
    );
    const s = study(doc)!;
    expect(s.cases.map((c) => c.unit)).toEqual(['s1', 's2']);
    expect(solved(s.cases[0]).sources.s2).toBeCloseTo(60, DIGITS);
    expect(solved(s.cases[1]).sources.s1).toBeCloseTo(60, DIGITS);
    expect(solved(s.cases[0]).cables.p1).toBeCloseTo(0, DIGITS);
  });

  it('batteries wired in series as separate parts are not alternatives: no study', () => {
    // Two 12.8 V batteries in series make a 25.6 V bank; neither spans the bank voltage (first principles).
    const doc = diagram(
      [battery('lo', 0), battery('hi', 200), currentLoad('load', 40)],
      [
        { id: 'mid', from: end('lo', 'pos'), to: end('hi', 'neg'), props: run(35, 0.3) },
        { id: 'p', from: end('hi', 'pos'), to: end('load', 'pos'), props: run(35, 1) },
        { id: 'n', from: end('lo', 'neg'), to: end('load', 'neg'), props: run(35, 1) },
      ],
      { systemVoltage_V: 24 },
    );
    expect(parallelUnits(context(doc))).toEqual([]);
    expect(study(doc)).toBeNull();
  });

  it('one battery alone has no N-1 case', () => {
    expect(study(starBank([4], 50))).toBeNull();
  });
});

describe("rules with needs 'n1'", () => {
  const probe = (calls: string[]): Rule => ({
    id: 'probe', title: 'probe', severity: 'note', basis: 'test', needs: 'n1',
    check: () => {
      calls.push('ran');
      return [];
    },
  });

  it('are skipped when the study is missing and run when it is there', () => {
    const doc = starBank([2, 2], 40);
    const ctx = context(doc);
    const prep = prepareNetwork(modeNetwork(ctx, 'load'));
    if ('ok' in prep || !prep.base.ok) throw new Error('load case did not solve');
    const calls: string[] = [];
    const base = { doc, topo: ctx.topo, ctx, load: null, faults: null, compileErrors: [] };
    runRules([probe(calls)], base);
    expect(calls).toEqual([]);
    runRules([probe(calls)], { ...base, contingency: contingencyStudy(ctx, prep) });
    expect(calls).toEqual([]); // still no load case
    runRules([probe(calls)], { ...base, load: operatingPoint(ctx, prep.base) });
    expect(calls).toEqual([]); // a load case but no study
    runRules([probe(calls)], { ...base, load: operatingPoint(ctx, prep.base), contingency: contingencyStudy(ctx, prep) });
    expect(calls).toEqual(['ran']);
  });
});
