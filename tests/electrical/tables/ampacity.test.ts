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
