import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, emptyDiagram, type DiagramDocument } from '@shared/diagram';
import { batteryDefaults, cableRunDefaults } from '@shared/electrical/parts';
import { computeCanvas } from '@/features/editor/results/compute';

describe('canvas figures from the core', () => {
  it('splits the load evenly over identical batteries on equal cables (symmetry)', () => {
    const doc = busbarBankTemplate({ count: 4 });
    const { canvas } = computeCanvas(doc, { mode: 'load' });
    expect(canvas.solved).toBe(true);
    for (const id of ['bat1', 'bat2', 'bat3', 'bat4']) expect(canvas.batteries[id].share).toBeCloseTo(0.25, 2);
    expect(canvas.imbalance_pct!).toBeLessThan(2);
  });

  it('gives a lone battery the whole current of a constant-current load (Kirchhoff current law)', () => {
    const doc: DiagramDocument = {
      ...emptyDiagram('one', 12),
      parts: [
        { id: 'b', type: 'battery', label: 'B', position: { x: 0, y: 0 }, rotation: 0, props: batteryDefaults() },
        { id: 'l', type: 'dc_load', label: 'L', position: { x: 200, y: 0 }, rotation: 0, props: { mode: 'current', current_A: 20 } },
      ],
      cables: [
        { id: 'cp', from: { part: 'b', terminal: 'pos' }, to: { part: 'l', terminal: 'pos' }, props: { ...cableRunDefaults(), length_m: 2 } },
        { id: 'cn', from: { part: 'b', terminal: 'neg' }, to: { part: 'l', terminal: 'neg' }, props: { ...cableRunDefaults(), length_m: 2 } },
      ],
    };
    const { canvas } = computeCanvas(doc, { mode: 'load' });
    expect(canvas.batteries.b.current_A).toBeCloseTo(20, 6);
    expect(canvas.batteries.b.share).toBeCloseTo(1, 9);
    expect(Math.abs(canvas.cables.cp.current_A)).toBeCloseTo(20, 6);
    // 2/0 AWG in NEC 310.16 75 °C copper at 30 °C: 175 A; 20 / 175 = 0.114
    expect(canvas.cables.cp.ampacity_A).toBeCloseTo(175, 6);
    expect(canvas.cables.cp.loading!).toBeCloseTo(20 / 175, 6);
  });

  it('reports structural errors as findings on the parts involved, with badges', () => {
    const doc: DiagramDocument = {
      ...emptyDiagram('floating', 12),
      parts: [{ id: 'b', type: 'battery', label: 'B', position: { x: 0, y: 0 }, rotation: 0, props: batteryDefaults() }],
    };
    const { canvas } = computeCanvas(doc, { mode: 'load' });
    expect(canvas.solved).toBe(false);
    expect(canvas.findings.some((f) => f.code === 'floating_part' && f.parts.includes('b'))).toBe(true);
    expect(canvas.badges.b.severity).toBe('error');
  });
});
