import { describe, expect, it } from 'vitest';
import { AMPACITY_TABLES, ambientCorrectionFactor, ampacity, bundlingFactor } from '../../../shared/electrical/tables/ampacity';

const SIZES = ['14', '12', '10', '8', '6', '4', '2', '1', '1/0', '2/0', '3/0', '4/0'] as const;
// NEC Table 310.16, copper, 30 °C ambient, not more than three current-carrying conductors (2014+ editions).
const NEC_75C = [20, 25, 35, 50, 65, 85, 115, 130, 150, 175, 200, 230];
const NEC_90C = [25, 30, 40, 55, 75, 95, 130, 145, 170, 195, 225, 260];
// 33 CFR 183.425 Table 5, 105 °C insulation.
const CFR_OUTSIDE = [35, 45, 60, 80, 120, 160, 210, 245, 285, 330, 385, 445];
const CFR_ENGINE = [30, 38, 51, 68, 102, 136, 178, 208, 242, 280, 327, 378];

describe('ampacity tables', () => {
  it.each(SIZES.map((s, i) => [s, i] as const))('%s AWG matches the published rows', (size, i) => {
    expect(AMPACITY_TABLES['nec-310.16-75C'].amps[size]).toBe(NEC_75C[i]); // NEC Table 310.16, 75 °C
    expect(AMPACITY_TABLES['nec-310.16-90C'].amps[size]).toBe(NEC_90C[i]); // NEC Table 310.16, 90 °C
    expect(AMPACITY_TABLES['cfr-183.425-105C-outside'].amps[size]).toBe(CFR_OUTSIDE[i]); // 33 CFR 183.425 Table 5
    expect(AMPACITY_TABLES['cfr-183.425-105C-engine'].amps[size]).toBe(CFR_ENGINE[i]); // 33 CFR 183.425 Table 5
  });

  it('the engine-space column is the outside column × 0.85, rounded down (33 CFR 183.425 Table 5)', () => {
    SIZES.forEach((_, i) => expect(Math.abs(CFR_ENGINE[i] - CFR_OUTSIDE[i] * 0.85)).toBeLessThan(1));
  });

  it('reads a table and switches marine tables to the engine-space column for hot spaces', () => {
    const free = ampacity({ size: { system: 'awg', size: '2/0' }, table: 'cfr-183.425-105C-outside' });
    expect(free.ok && free.amps).toBe(330);
    const hot = ampacity({ size: { system: 'awg', size: '2/0' }, table: 'cfr-183.425-105C-outside', engineSpace: true });
    expect(hot.ok && hot.amps).toBe(280);
    expect(hot.ok && hot.table).toBe('cfr-183.425-105C-engine');
  });

  it('reads a mm² conductor at the AWG size at or below its area (conservative)', () => {
    const r = ampacity({ size: { system: 'mm2', size: 35 }, table: 'nec-310.16-75C' });
    expect(r.ok && r.readAsAwg).toBe('2');
    expect(r.ok && r.amps).toBe(115); // NEC Table 310.16, 75 °C, 2 AWG
    const tiny = ampacity({ size: { system: 'mm2', size: 1.5 }, table: 'nec-310.16-75C' });
    expect(tiny.ok).toBe(false);
  });

  it('reads a mm² conductor larger than 4/0 AWG at the kcmil row at or below its area', () => {
    // 1 kcmil = 0.5067 mm² (circular mil definition): 250 kcmil = 126.7 mm², 300 kcmil = 152.0 mm².
    // 150 mm² lies between them → 250 kcmil, 255 A at 75 °C (NEC Table 310.16, kcmil rows from memory).
    const r = ampacity({ size: { system: 'mm2', size: 150 }, table: 'nec-310.16-75C' });
    expect(r.ok && r.readAsKcmil).toBe(250);
    expect(r.ok && r.amps).toBe(255);
    // 120 mm² (< 126.7 mm²) is still read at 4/0 AWG (107.2 mm²), 230 A (NEC Table 310.16, 75 °C).
    const r120 = ampacity({ size: { system: 'mm2', size: 120 }, table: 'nec-310.16-75C' });
    expect(r120.ok && r120.readAsAwg).toBe('4/0');
    expect(r120.ok && r120.amps).toBe(230);
  });

  it('corrects for ambient with sqrt((Tc − Ta)/(Tc − 30)) (NEC 310.15(B) equation, from memory)', () => {
    // NEC 310.15(B)(1) correction table, 75 °C column, 36–40 °C: 0.88 (from memory).
    expect(ambientCorrectionFactor(75, 40)).toBeCloseTo(0.88, 2);
    // 90 °C column, 41–45 °C: 0.87 (from memory).
    expect(ambientCorrectionFactor(90, 45)).toBeCloseTo(0.87, 2);
    expect(ambientCorrectionFactor(75, 30)).toBe(1);
    expect(ambientCorrectionFactor(75, 80)).toBe(0);
    const r = ampacity({ size: { system: 'awg', size: '4/0' }, table: 'nec-310.16-75C', ambient_C: 40 });
    expect(r.ok && r.amps).toBeCloseTo(230 * Math.sqrt(35 / 45), 9);
  });

  it('derates bundles of more than three conductors (NEC 310.15(C)(1), from memory)', () => {
    expect(bundlingFactor(3)).toBe(1);
    expect(bundlingFactor(4)).toBe(0.8);
    expect(bundlingFactor(9)).toBe(0.7);
    expect(bundlingFactor(20)).toBe(0.5);
    expect(bundlingFactor(41)).toBe(0.35);
    const r = ampacity({ size: { system: 'awg', size: '2/0' }, table: 'nec-310.16-90C', bundledConductors: 6 });
    expect(r.ok && r.amps).toBeCloseTo(195 * 0.8, 9);
  });
});

describe('the insulation rating limits the column read', () => {
  // NEC Table 310.16, copper, 60 °C column, 30 °C ambient (2014+ editions) — from memory.
  const NEC_60C = [15, 20, 30, 40, 55, 70, 95, 110, 125, 145, 165, 195];
  // 33 CFR 183.425 Table 5, outside engine spaces, by insulation rating (read from the regulation's table).
  const CFR_60C = [20, 25, 40, 55, 80, 105, 140, 165, 195, 225, 260, 300];
  const CFR_75C = [20, 25, 40, 65, 95, 125, 170, 195, 230, 265, 310, 360];
  const CFR_90C = [30, 40, 55, 70, 100, 135, 180, 210, 245, 285, 330, 385];
  const awg = (size: (typeof SIZES)[number]) => ({ system: 'awg', size }) as const;

  it.each(SIZES.map((s, i) => [s, i] as const))('%s AWG, 60 °C insulation on either NEC table reads the 60 °C column', (size, i) => {
    for (const table of ['nec-310.16-75C', 'nec-310.16-90C'] as const) {
      const r = ampacity({ size: awg(size), table, insulation_C: 60 });
      expect(r.ok && r.amps).toBe(NEC_60C[i]); // NEC Table 310.16, 60 °C — from memory
      expect(r.ok && r.limitedBy).toBe('insulation');
      expect(r.ok && r.column_C).toBe(60);
    }
  });

  it('4 AWG, 60 °C insulation on the 75 °C table: 70 A, and the result says the insulation set it', () => {
    const r = ampacity({ size: awg('4'), table: 'nec-310.16-75C', insulation_C: 60 });
    if (!r.ok) throw new Error('not in table');
    expect(r.amps).toBe(70); // NEC Table 310.16, 60 °C, 4 AWG — from memory
    expect(r.baseAmps).toBe(70);
    expect(r.limitedBy).toBe('insulation');
    expect(r.note).toBe('60 °C insulation: read from the 60 °C column');
  });

  it('75 °C insulation on the 90 °C table reads the 75 °C column (4 AWG: 85 A, NEC Table 310.16)', () => {
    const r = ampacity({ size: awg('4'), table: 'nec-310.16-90C', insulation_C: 75 });
    expect(r.ok && r.amps).toBe(85);
    expect(r.ok && r.column_C).toBe(75);
  });

  it('insulation rated above the table is not credited: 90 °C 4 AWG on the 75 °C table stays 85 A (NEC Table 310.16, 75 °C)', () => {
    const r = ampacity({ size: awg('4'), table: 'nec-310.16-75C', insulation_C: 90 });
    if (!r.ok) throw new Error('not in table');
    expect(r.amps).toBe(85);
    expect(r.limitedBy).toBe('table');
    expect(r.column_C).toBe(75);
    expect(r.note).toMatch(/not credited/);
    const same = ampacity({ size: awg('4'), table: 'nec-310.16-75C', insulation_C: 75 });
    expect(same.ok && same.limitedBy).toBe('table');
    expect(same.ok && same.note).toBeUndefined();
  });

  it('the ambient correction is taken for the column read (NEC 310.15(B) equation, from memory)', () => {
    // 60 °C conductor at 40 °C ambient: sqrt((60 − 40)/(60 − 30)) = 0.816; NEC 310.15(B)(1) table, 60 °C
    // column, 36–40 °C: 0.82 (from memory).
    const r = ampacity({ size: awg('4'), table: 'nec-310.16-75C', insulation_C: 60, ambient_C: 40 });
    expect(r.ok && r.ambientFactor).toBeCloseTo(0.82, 2);
    expect(r.ok && r.amps).toBeCloseTo(70 * Math.sqrt(20 / 30), 9);
    // At or above the insulation rating the conductor carries nothing.
    const hot = ampacity({ size: awg('4'), table: 'nec-310.16-75C', insulation_C: 60, ambient_C: 65 });
    expect(hot.ok && hot.amps).toBe(0);
  });

  it.each(SIZES.map((s, i) => [s, i] as const))('%s AWG on the marine table reads the 33 CFR 183.425 Table 5 column of its insulation', (size, i) => {
    const read = (insulation_C: number) => ampacity({ size: awg(size), table: 'cfr-183.425-105C-outside', insulation_C });
    const r60 = read(60), r75 = read(75), r90 = read(90), r105 = read(105);
    expect(r60.ok && r60.amps).toBe(CFR_60C[i]); // 33 CFR 183.425 Table 5, 60 °C
    expect(r75.ok && r75.amps).toBe(CFR_75C[i]); // 33 CFR 183.425 Table 5, 75 °C
    expect(r90.ok && r90.amps).toBe(CFR_90C[i]); // 33 CFR 183.425 Table 5, 90 °C
    expect(r105.ok && r105.amps).toBe(CFR_OUTSIDE[i]); // 33 CFR 183.425 Table 5, 105 °C
    expect(r105.ok && r105.limitedBy).toBe('table');
  });

  it('in engine spaces a lower-rated insulation takes its own factor (33 CFR 183.425 note 1 to Table 5, from memory)', () => {
    // 2 AWG, 60 °C insulation: 140 A outside × 0.58 = 81.2 A; 90 °C: 180 A × 0.82 = 147.6 A.
    const r60 = ampacity({ size: awg('2'), table: 'cfr-183.425-105C-outside', engineSpace: true, insulation_C: 60 });
    expect(r60.ok && r60.amps).toBeCloseTo(81.2, 9);
    expect(r60.ok && r60.table).toBe('cfr-183.425-105C-engine');
    expect(r60.ok && r60.limitedBy).toBe('insulation');
    const r90 = ampacity({ size: awg('2'), table: 'cfr-183.425-105C-engine', insulation_C: 90 });
    expect(r90.ok && r90.amps).toBeCloseTo(147.6, 9);
    // 105 °C insulation keeps the printed engine-space column: 2 AWG 178 A (33 CFR 183.425 Table 5).
    const r105 = ampacity({ size: awg('2'), table: 'cfr-183.425-105C-engine', insulation_C: 105 });
    expect(r105.ok && r105.amps).toBe(178);
  });

  it('3 AWG rows: NEC 310.16 60 °C 85 A (from memory); 33 CFR 183.425 Table 5: 120 A at 60 °C, 180 A and 153 A at 105 °C', () => {
    const read = (table: Parameters<typeof ampacity>[0]['table'], insulation_C?: number) => {
      const r = ampacity({ size: { system: 'awg', size: '3' }, table, insulation_C });
      return r.ok ? r.amps : null;
    };
    expect(read('nec-310.16-75C', 60)).toBe(85);
    expect(read('cfr-183.425-105C-outside', 60)).toBe(120);
    expect(read('cfr-183.425-105C-outside')).toBe(180);
    expect(read('cfr-183.425-105C-engine')).toBe(153);
  });

  it('insulation rated below every column is an error, not a number', () => {
    const r = ampacity({ size: awg('4'), table: 'nec-310.16-75C', insulation_C: 50 });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.error.code).toBe('insulation_below_table');
  });
});

describe('the derating chain, factor by factor', () => {
  const awg = (size: (typeof SIZES)[number]) => ({ system: 'awg', size }) as const;
  const product = (r: ReturnType<typeof ampacity>) => (r.ok ? r.derating.factors.reduce((a, f) => a * f.factor, r.derating.base_A) : NaN);
  const factor = (r: ReturnType<typeof ampacity>, kind: string) => (r.ok ? r.derating.factors.find((f) => f.kind === kind)?.factor : undefined);

  it('10 AWG copper, 90 °C, bundled with 5: 40 A × 0.80 = 32 A (NEC Table 310.16; NEC 310.15(C)(1))', () => {
    const r = ampacity({ size: awg('10'), table: 'nec-310.16-90C', bundledConductors: 5 });
    if (!r.ok) throw new Error('not in table');
    expect(r.derating.base_A).toBe(40); // NEC Table 310.16, 90 °C, 10 AWG
    expect(r.derating.column_C).toBe(90);
    expect(r.derating.factors.map((f) => f.kind)).toEqual(['ambient', 'bundling']);
    expect(factor(r, 'ambient')).toBe(1); // 30 °C: the table's own ambient
    expect(factor(r, 'bundling')).toBe(0.8); // NEC 310.15(C)(1), 4–6 conductors
    expect(r.derating.final_A).toBeCloseTo(32, 9);
    expect(r.amps).toBeCloseTo(32, 9);
    expect(r.derating.factors[1].name).toContain('Bundled with 5');
    expect(r.derating.factors[1].basis).toContain('310.15(C)(1)');
  });

  it.each([
    // NEC 310.15(C)(1): 4–6 80 %, 7–9 70 %, 10–20 50 %, 21–30 45 %, 31–40 40 %, 41 and more 35 %.
    [3, 1], [4, 0.8], [6, 0.8], [7, 0.7], [9, 0.7], [10, 0.5], [20, 0.5], [21, 0.45], [30, 0.45], [31, 0.4], [40, 0.4], [41, 0.35], [100, 0.35],
  ] as const)('%i current-carrying conductors: × %f (NEC 310.15(C)(1))', (n, f) => {
    expect(bundlingFactor(n)).toBe(f);
    const r = ampacity({ size: awg('2/0'), table: 'nec-310.16-75C', bundledConductors: n });
    expect(factor(r, 'bundling')).toBe(f);
    expect(r.ok && r.amps).toBeCloseTo(175 * f, 9); // NEC Table 310.16, 75 °C, 2/0 AWG: 175 A
  });

  it('75 °C terminations cap a 90 °C conductor at the 75 °C column: 2/0 AWG 195 A → 175 A (NEC 110.14(C), from memory; NEC Table 310.16)', () => {
    const r = ampacity({ size: awg('2/0'), table: 'nec-310.16-90C', insulation_C: 90, terminal_C: 75 });
    if (!r.ok) throw new Error('not in table');
    expect(r.derating.base_A).toBe(195);
    expect(r.amps).toBe(175);
    expect(r.derating.factors.map((f) => f.kind)).toEqual(['ambient', 'bundling', 'terminal']);
    expect(factor(r, 'terminal')).toBeCloseTo(175 / 195, 12);
    expect(r.derating.factors[2].name).toContain('Terminations rated 75 °C: at most 175 A');
    expect(product(r)).toBeCloseTo(175, 9);
    // Without the termination limit the 90 °C column stands.
    const free = ampacity({ size: awg('2/0'), table: 'nec-310.16-90C', insulation_C: 90 });
    expect(free.ok && free.amps).toBe(195);
  });

  it('derating starts from the conductor column; the cap applies to the result: 2/0 AWG 90 °C bundled with 4 is 195 × 0.8 = 156 A, under the 175 A cap', () => {
    const r = ampacity({ size: awg('2/0'), table: 'nec-310.16-90C', bundledConductors: 4, terminal_C: 75 });
    expect(r.ok && r.amps).toBeCloseTo(156, 9);
    expect(factor(r, 'terminal')).toBe(1);
  });

  it('60 °C terminations on the 75 °C table: 4 AWG 85 A → 70 A (NEC Table 310.16, 60 °C column from memory)', () => {
    const r = ampacity({ size: awg('4'), table: 'nec-310.16-75C', terminal_C: 60 });
    expect(r.ok && r.amps).toBe(70);
    // Terminations rated above the column read change nothing.
    const hi = ampacity({ size: awg('4'), table: 'nec-310.16-75C', terminal_C: 90 });
    expect(hi.ok && hi.amps).toBe(85);
    expect(factor(hi, 'terminal')).toBe(1);
  });

  it('ambient: 4/0 AWG at 40 °C on the 75 °C column, √(35/45) (NEC 310.15(B) equation, from memory), then a 75 °C cap that does not bind', () => {
    const r = ampacity({ size: awg('4/0'), table: 'nec-310.16-75C', ambient_C: 40, terminal_C: 75 });
    expect(factor(r, 'ambient')).toBeCloseTo(Math.sqrt(35 / 45), 12);
    expect(r.ok && r.amps).toBeCloseTo(230 * Math.sqrt(35 / 45), 9); // NEC Table 310.16, 75 °C, 4/0: 230 A
    expect(product(r)).toBeCloseTo(230 * Math.sqrt(35 / 45), 9);
  });

  it('engine space shows as its own step from the outside column: 2/0 AWG 105 °C 330 A → 280 A (33 CFR 183.425 Table 5, × 0.85)', () => {
    const r = ampacity({ size: awg('2/0'), table: 'cfr-183.425-105C-outside', engineSpace: true });
    if (!r.ok) throw new Error('not in table');
    expect(r.derating.table).toBe('cfr-183.425-105C-outside');
    expect(r.derating.base_A).toBe(330); // outside engine spaces
    expect(r.derating.factors.map((f) => f.kind)).toEqual(['bundling', 'engine_space']);
    expect(factor(r, 'engine_space')).toBeCloseTo(0.85, 2);
    expect(r.amps).toBe(280); // inside engine spaces, as printed
    expect(product(r)).toBeCloseTo(280, 9);
  });
});
