import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, emptyDiagram, type DiagramCable, type DiagramDocument, type DiagramPart } from '@shared/diagram';
import { batteryDefaults, cableRunDefaults, chargerDefaults, fuseDefaults } from '@shared/electrical/parts';
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
    expect(canvas.findings.some((f) => f.code === 'structure-floating-part' && f.parts.includes('b'))).toBe(true);
    // Reported once: the structural rule's finding, not the compiler error beside it again.
    expect(canvas.findings.filter((f) => f.parts.includes('b') && f.severity === 'error')).toHaveLength(1);
    expect(canvas.badges.b.severity).toBe('error');
  });
});

// Two batteries joined post to post by short jumpers, optionally a charger or a load on battery 1.
function pair(opts: { ocv?: [number, number]; charger?: boolean; load?: boolean; soc?: [number, number]; fuse?: boolean } = {}): DiagramDocument {
  const bat = (id: string, k: number): DiagramPart => ({
    id, type: 'battery', label: `Battery ${k + 1}`, position: { x: k * 200, y: 0 }, rotation: 0,
    props: { ...batteryDefaults(), r_internal_ohm: 0.01, ...(opts.ocv ? { restingVoltage_V: opts.ocv[k] } : {}), ...(opts.soc ? { soc: opts.soc[k] } : {}) },
  });
  const jumper = (id: string, t: 'pos' | 'neg', from = 'b1'): DiagramCable => ({
    id, from: { part: from, terminal: t }, to: { part: 'b2', terminal: t }, props: { ...cableRunDefaults(), role: 'jumper', length_m: 0.3 },
  });
  const parts: DiagramPart[] = [bat('b1', 0), bat('b2', 1)];
  const cables: DiagramCable[] = [jumper('jn', 'neg')];
  if (opts.fuse) {
    parts.push({ id: 'f1', type: 'fuse', label: 'Fuse 1', position: { x: 100, y: -100 }, rotation: 0, props: fuseDefaults('class_t', 100) });
    cables.push({ id: 'jp1', from: { part: 'b1', terminal: 'pos' }, to: { part: 'f1', terminal: 'a' }, props: { ...cableRunDefaults(), role: 'jumper', length_m: 0.15 } });
    cables.push({ id: 'jp', from: { part: 'f1', terminal: 'b' }, to: { part: 'b2', terminal: 'pos' }, props: { ...cableRunDefaults(), role: 'jumper', length_m: 0.15 } });
  } else cables.push(jumper('jp', 'pos'));
  const feed = (id: string, type: 'charger' | 'dc_load', props: unknown) => {
    parts.push({ id, type, label: id, position: { x: 0, y: -200 }, rotation: 0, props } as DiagramPart);
    cables.push({ id: `${id}p`, from: { part: 'b1', terminal: 'pos' }, to: { part: id, terminal: 'pos' }, props: { ...cableRunDefaults(), length_m: 1 } });
    cables.push({ id: `${id}n`, from: { part: 'b1', terminal: 'neg' }, to: { part: id, terminal: 'neg' }, props: { ...cableRunDefaults(), length_m: 1 } });
  };
  if (opts.charger) feed('chg', 'charger', { ...chargerDefaults(), voltage_setpoint_V: 14.4, current_limit_A: 20 });
  if (opts.load) feed('load', 'dc_load', { mode: 'current', current_A: 20 });
  return { ...emptyDiagram('pair', 12), parts, cables };
}

describe('canvas figures follow the analysis mode', () => {
  it('charge: the batteries take the charger current between them (Kirchhoff current law), shown as negative', () => {
    const { canvas } = computeCanvas(pair({ charger: true }), { mode: 'charge' });
    expect(canvas.mode).toBe('charge');
    expect(canvas.solved).toBe(true);
    const { b1, b2 } = canvas.batteries;
    // 14.4 V into a 13.x V bank through milliohms would be hundreds of amperes: the charger sits at its 20 A limit.
    expect(b1.current_A + b2.current_A).toBeCloseTo(-20, 3);
    expect(b1.current_A).toBeLessThan(0);
    expect(b1.share + b2.share).toBeCloseTo(1, 6);
    expect(canvas.modeSummary).toMatchObject({ mode: 'charge', chargers: 1 });
    expect(Object.keys(canvas.loads)).toHaveLength(0);
  });

  it('charge without a charger: no figures and the reason, not the load case', () => {
    const { canvas } = computeCanvas(pair({ load: true }), { mode: 'charge' });
    expect(canvas.solved).toBe(false);
    expect(canvas.modeIssue).toMatch(/charger/i);
    expect(Object.keys(canvas.batteries)).toHaveLength(0);
  });

  it('equalize: equal and opposite currents between two batteries, bounded by their internal resistance', () => {
    const { canvas } = computeCanvas(pair({ ocv: [13.4, 13.2], load: true }), { mode: 'equalize' });
    const { b1, b2 } = canvas.batteries;
    expect(b1.current_A).toBeCloseTo(-b2.current_A, 6);
    // 0.2 V across 2 × 10 mΩ internal resistance is at most 10 A; two 0.3 m jumpers with their lugs add well under
    // 20 mΩ more (from memory: 2/0 AWG is about 0.3 mΩ/m), so more than 5 A.
    expect(b1.current_A).toBeGreaterThan(5);
    expect(b1.current_A).toBeLessThan(10);
    // The higher battery drives current out of its positive, through the positive jumper from b1 to b2.
    expect(canvas.cables.jp.current_A).toBeCloseTo(b1.current_A, 6);
    expect(canvas.cables.jn.current_A).toBeCloseTo(-b1.current_A, 6);
    expect(canvas.marks).toEqual({ b1: 'largest-exchange', b2: 'largest-exchange' });
    expect(canvas.imbalance_pct).toBeNull();
    expect(b1.share).toBe(0);
    // Loads are off in this case.
    expect(Object.keys(canvas.loads)).toHaveLength(0);
  });

  it('fault, one case: the shorted battery is marked and the other feeds it through the fuse, against its interrupting rating', () => {
    const doc = pair({ load: true, fuse: true });
    const { canvas } = computeCanvas(doc, { mode: 'fault', fault: { kind: 'battery', id: 'b2' } });
    expect(canvas.marks.b2).toBe('faulted');
    const fuse = canvas.fuses.f1;
    // Only b1 feeds b2's internal short, through the positive jumpers and the fuse (Kirchhoff current law).
    expect(Math.abs(fuse.current_A)).toBeCloseTo(Math.abs(canvas.batteries.b1.current_A), 3);
    expect(Math.abs(canvas.cables.jp.current_A)).toBeCloseTo(Math.abs(fuse.current_A), 3);
    // A 13 V battery of 10 mΩ into a short: at most 1300 A; with the fault's own 1 mΩ and the jumpers, hundreds of amperes.
    expect(Math.abs(fuse.current_A)).toBeGreaterThan(300);
    expect(Math.abs(fuse.current_A)).toBeLessThan(1300);
    const aic = (doc.parts.find((p) => p.id === 'f1')!.props as { interrupting_A: number }).interrupting_A;
    expect(fuse.interrupting_A).toBe(aic);
    expect(fuse.interruptingLoading).toBeCloseTo(Math.abs(fuse.current_A) / aic, 9);
    // No ampacity loading on a cable in a fault: the prospective current is the figure.
    expect(canvas.cables.jp.loading).toBeNull();
    expect(canvas.modeSummary).toMatchObject({ mode: 'fault', selected: { kind: 'battery', part: 'b2' } });
  });

  it('fault sweep: the largest prospective current at each fuse, and the worst case marked', () => {
    const { canvas, raw } = computeCanvas(pair({ load: true, fuse: true }), { mode: 'fault' });
    if (!raw?.ok || !raw.faults) throw new Error('no fault sweep');
    expect(canvas.fuses.f1.current_A).toBeCloseTo(raw.faults.maxByFuse.f1.current_A, 9);
    expect(canvas.fuses.f1.interruptingLoading).toBeCloseTo(canvas.fuses.f1.current_A / canvas.fuses.f1.interrupting_A!, 9);
    const worst = raw.faults.cases.reduce((a, b) => (b.faultCurrent_A > a.faultCurrent_A ? b : a));
    expect(canvas.marks[worst.part]).toBe('worst-fault');
    expect(Object.values(canvas.marks).filter((m) => m === 'faulted')).toHaveLength(0);
  });

  it('discharge: the load case at the start, and the battery starting lower empties first', () => {
    const doc = pair({ load: true, soc: [0.5, 1] });
    const { canvas } = computeCanvas(doc, { mode: 'discharge' });
    const load = computeCanvas(doc, { mode: 'load' }).canvas;
    expect(canvas.batteries.b1.current_A).toBeCloseTo(load.batteries.b1.current_A, 9);
    expect(canvas.batteries.b1.current_A + canvas.batteries.b2.current_A).toBeCloseTo(20, 3);
    expect(canvas.marks.b1).toBe('first-empty');
    expect(canvas.modeSummary).toMatchObject({ mode: 'discharge', firstEmpty: 'b1' });
    // The figures stage leaves the simulation to the full one.
    const quick = computeCanvas(doc, { mode: 'discharge' }, 'figures').canvas;
    expect(quick.marks.b1).toBeUndefined();
    expect(quick.batteries.b1.current_A).toBeCloseTo(load.batteries.b1.current_A, 9);
  });
});
