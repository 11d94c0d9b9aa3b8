import { describe, expect, it } from 'vitest';
import { CHEMISTRIES, CHEMISTRY_IDS, cellOcv_V, socFromCellOcv } from '../../../shared/electrical/tables/batteries';

describe('battery chemistries', () => {
  it('lead-acid 12 V resting voltages at 100/75/50/25/0 % (common practice, about 27 °C)', () => {
    const at = (soc: number) => cellOcv_V('flooded', soc) * 6;
    expect(at(1)).toBeCloseTo(12.65, 9);
    expect(at(0.75)).toBeCloseTo(12.45, 9);
    expect(at(0.5)).toBeCloseTo(12.24, 9);
    expect(at(0.25)).toBeCloseTo(12.06, 9);
    expect(at(0)).toBeCloseTo(11.89, 9);
  });

  it('LFP: 3.2 V nominal, 4 cells = 12.8 V, about 3.65 V full, about 2.5 V cut-off (common practice)', () => {
    const c = CHEMISTRIES.lfp;
    expect(c.cellNominal_V).toBe(3.2);
    expect(c.cellNominal_V * c.cellsPer12VBlock).toBeCloseTo(12.8, 9);
    expect(c.cellFull_V).toBeCloseTo(3.65, 2);
    expect(c.cellCutoff_V).toBeCloseTo(2.5, 2);
  });

  it('LFP resting voltage is flat between 20 % and 90 % and steep at the ends (common practice)', () => {
    const slope = (a: number, b: number) => (cellOcv_V('lfp', b) - cellOcv_V('lfp', a)) / (b - a);
    expect(slope(0.2, 0.9)).toBeLessThan(0.2); // V per cell per unit SoC
    expect(slope(0, 0.1)).toBeGreaterThan(5 * slope(0.2, 0.9));
    expect(slope(0.95, 1)).toBeGreaterThan(3 * slope(0.2, 0.9));
  });

  it.each(CHEMISTRY_IDS)('%s: the curve is strictly increasing and spans 0..1', (id) => {
    const curve = CHEMISTRIES[id].ocvCurve;
    expect(curve[0][0]).toBe(0);
    expect(curve[curve.length - 1][0]).toBe(1);
    for (let i = 1; i < curve.length; i++) {
      expect(curve[i][0]).toBeGreaterThan(curve[i - 1][0]);
      expect(curve[i][1]).toBeGreaterThan(curve[i - 1][1]);
    }
    for (const soc of [0.05, 0.33, 0.5, 0.87]) expect(socFromCellOcv(id, cellOcv_V(id, soc))).toBeCloseTo(soc, 9);
  });

  it('Peukert exponents sit in the quoted ranges (recalled)', () => {
    // AGM 1.05–1.15, gel 1.10–1.25, flooded 1.2–1.6, LFP about 1.05 (recalled).
    expect(CHEMISTRIES.agm.peukert).toBeGreaterThanOrEqual(1.05);
    expect(CHEMISTRIES.agm.peukert).toBeLessThanOrEqual(1.15);
    expect(CHEMISTRIES.gel.peukert).toBeGreaterThanOrEqual(1.1);
    expect(CHEMISTRIES.gel.peukert).toBeLessThanOrEqual(1.25);
    expect(CHEMISTRIES.flooded.peukert).toBeGreaterThanOrEqual(1.2);
    expect(CHEMISTRIES.flooded.peukert).toBeLessThanOrEqual(1.6);
    expect(CHEMISTRIES.lfp.peukert).toBeCloseTo(1.05, 2);
  });

  it('the mixing/age rule applies to lead-acid only', () => {
    expect(CHEMISTRY_IDS.filter((id) => CHEMISTRIES[id].mixingAgeRuleApplies)).toEqual(['agm', 'gel', 'flooded']);
  });
});
