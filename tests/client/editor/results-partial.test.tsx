/**
 * The canvas keeps its figures when a change leaves something unconnected or unsolvable: an open
 * terminal shows the connected remainder's figures with the loose part marked; a change that solves
 * nothing keeps the last figures, greyed, with the reason; a drawn short marks its conductors with the
 * prospective current. Expected currents come from first principles, never from the code under test.
 */
import './flow-mocks';
import { act, render, screen, waitFor } from '@testing-library/react';
import { ReactFlowProvider } from '@xyflow/react';
import { describe, expect, it } from 'vitest';
import { emptyDiagram, type DiagramCable, type DiagramDocument, type DiagramPart } from '@shared/diagram';
import type { AnalysisResult } from '@shared/electrical/analysis';
import { batteryDefaults, cableRunDefaults, fuseDefaults } from '@shared/electrical/parts';
import { Canvas } from '@/features/editor/canvas/Canvas';
import { computeCanvas } from '@/features/editor/results/compute';
import { withStale } from '@/features/editor/results/stale';
import type { EditorResults } from '@/features/editor/results/types';
import { useEditorStore } from '@/features/editor/store';

/** Two batteries post to post (12.8 V at rest, 10 mΩ), a 20 A load on battery 1; optionally a fuse in the positive jumper. */
function pair(opts: { fuse?: boolean } = {}): DiagramDocument {
  const bat = (id: string, k: number): DiagramPart => ({
    id, type: 'battery', label: `Battery ${k + 1}`, position: { x: k * 240, y: 0 }, rotation: 0,
    props: { ...batteryDefaults(), r_internal_ohm: 0.01, restingVoltage_V: 12.8 },
  });
  const run = (id: string, from: [string, string], to: [string, string], length_m: number, role: 'jumper' | 'cable' = 'jumper'): DiagramCable => ({
    id, label: id, from: { part: from[0], terminal: from[1] }, to: { part: to[0], terminal: to[1] }, props: { ...cableRunDefaults(), role, length_m },
  });
  const parts: DiagramPart[] = [bat('b1', 0), bat('b2', 1), { id: 'load', type: 'dc_load', label: 'Load', position: { x: 0, y: -240 }, rotation: 0, props: { mode: 'current', current_A: 20 } }];
  const cables: DiagramCable[] = [run('jn', ['b1', 'neg'], ['b2', 'neg'], 0.3), run('lp', ['b1', 'pos'], ['load', 'pos'], 1, 'cable'), run('ln', ['b1', 'neg'], ['load', 'neg'], 1, 'cable')];
  if (opts.fuse) {
    parts.push({ id: 'f1', type: 'fuse', label: 'Fuse 1', position: { x: 120, y: -120 }, rotation: 0, props: fuseDefaults('class_t', 100) });
    cables.push(run('jp1', ['b1', 'pos'], ['f1', 'a'], 0.15), run('jp', ['f1', 'b'], ['b2', 'pos'], 0.15));
  } else cables.push(run('jp', ['b1', 'pos'], ['b2', 'pos'], 0.3));
  return { ...emptyDiagram('pair', 12), parts, cables };
}

const without = (doc: DiagramDocument, id: string): DiagramDocument => ({ ...doc, cables: doc.cables.filter((c) => c.id !== id) });
/** A 0.5 m run drawn from battery 2's positive to its negative. */
const withShort = (doc: DiagramDocument): DiagramDocument => ({
  ...doc,
  cables: [...doc.cables, { id: 'x', label: 'Spanner', from: { part: 'b2', terminal: 'pos' }, to: { part: 'b2', terminal: 'neg' }, props: { ...cableRunDefaults(), length_m: 0.5 } }],
});
const results = (doc: DiagramDocument, seq: number, mode: 'load' | 'fault' = 'load'): EditorResults => {
  const { canvas, raw } = computeCanvas(doc, { mode });
  return { seq, stage: 'full', mode, canvas, raw, elapsed_ms: 0 };
};

describe('an open terminal keeps the other figures', () => {
  it('battery 2 with its negative jumper deleted: battery 1 carries the whole load, battery 2 is marked not connected', () => {
    const doc = without(pair(), 'jn');
    for (const stage of ['figures', 'full'] as const) {
      const { canvas } = computeCanvas(doc, { mode: 'load' }, stage);
      expect(canvas.solved).toBe(true);
      // Kirchhoff's current law: the 20 A load has one battery left to feed it.
      expect(canvas.batteries.b1.current_A).toBeCloseTo(20, 6);
      expect(canvas.batteries.b2).toBeUndefined();
      expect(Math.abs(canvas.cables.lp.current_A)).toBeCloseTo(20, 6);
      expect(canvas.marks.b2).toBe('not-connected');
      // The positive jumper now leads only to battery 2: left out, marked, no figure.
      expect(canvas.marks.jp).toBe('open-circuit');
      expect(canvas.cables.jp).toBeUndefined();
    }
    const full = computeCanvas(doc, { mode: 'load' }).canvas;
    expect(full.findings).toEqual(expect.arrayContaining([expect.objectContaining({ severity: 'error', parts: ['b2'], message: 'Battery 2 is not connected: negative terminal' })]));
  });

  it('on the canvas: battery 1’s strip keeps its figure and battery 2 carries a “Not connected” tag', async () => {
    const before = pair();
    const doc = without(before, 'jn');
    const store = useEditorStore.getState();
    store.load(before, { diagramId: 'd1', readOnly: false, unitSystem: 'metric' });
    store.setResults(results(before, 1), 'ready');
    render(
      <div style={{ width: 1200, height: 800 }}>
        <ReactFlowProvider>
          <Canvas />
        </ReactFlowProvider>
      </div>,
    );
    await waitFor(() => expect(screen.getByTestId('share-b1').textContent).toMatch(/A ·/));
    act(() => {
      useEditorStore.setState({ doc });
      useEditorStore.getState().setResults(withStale(useEditorStore.getState().results, results(doc, 2)), 'ready');
    });
    await waitFor(() => expect(screen.getByTestId('share-b1').textContent).toBe('20.0 A · 100 %'));
    expect(screen.getByTestId('mark-b2').textContent).toBe('Not connected');
    expect(screen.queryByTestId('share-b2')).toBeNull();
    expect(document.querySelector('[data-part-id="b2"]')!.className).toContain('bw-left-out');
  });
});

describe('nothing solves: the last figures stay, greyed, with the reason', () => {
  const unsolvable = () => {
    // A 24 V battery beside a 12 V one: the analysis stops on unequal voltages in parallel.
    const doc = pair();
    const b2 = doc.parts.find((p) => p.id === 'b2')!;
    if (b2.type === 'battery') b2.props = { ...b2.props, nominal_V: 25.6, restingVoltage_V: 26 };
    return doc;
  };

  it('carries the figures of the last solved result and says why', () => {
    const prev = results(pair(), 1);
    const next = results(unsolvable(), 2);
    expect(next.canvas.solved).toBe(false);
    expect(next.canvas.batteries).toEqual({});
    const shown = withStale(prev, next);
    expect(shown.seq).toBe(2);
    expect(shown.canvas.solved).toBe(false);
    expect(shown.canvas.batteries).toEqual(prev.canvas.batteries);
    expect(shown.canvas.cables).toEqual(prev.canvas.cables);
    expect(shown.canvas.stale?.reason).toMatch(/apart/);
    expect(shown.canvas.modeIssue).toMatch(/Greyed figures: from before this change\.$/);
    // The findings are the new result's.
    expect(shown.canvas.findings).toEqual(next.canvas.findings);
    // A second unsolvable change keeps the same figures.
    expect(withStale(shown, results(unsolvable(), 3)).canvas.batteries).toEqual(prev.canvas.batteries);
  });

  it('does not carry across modes, over nothing, or over a result that solved', () => {
    const next = results(unsolvable(), 2);
    expect(withStale(null, next)).toBe(next);
    expect(withStale(results(pair(), 1, 'fault'), next)).toBe(next);
    const solved = results(pair(), 2);
    expect(withStale(results(pair(), 1), solved)).toBe(solved);
  });
});

describe('a drawn short is highlighted with its prospective current', () => {
  it('load mode: the short’s battery and run are marked, the run carries the short’s current, the rest stays greyed', () => {
    const prev = results(pair(), 1);
    const next = results(withShort(pair()), 2);
    const raw = next.raw as Extract<AnalysisResult, { ok: false }>;
    expect(raw.shorts).toHaveLength(1);
    expect(next.canvas.marks).toMatchObject({ b2: 'short', x: 'short', b1: 'short', jp: 'short', jn: 'short' });
    expect(next.canvas.shorts!.x).toBeCloseTo(raw.shorts![0].currents_A.x, 9);
    // First principles: at least battery 2's own current into the run, 12.8 V / (10 mΩ + R_run) with R_run ≥ 0.
    expect(next.canvas.shorts!.x).toBeGreaterThan(12.8 / (0.01 + 0.01));
    expect(next.canvas.modeIssue).toMatch(/^Short circuit drawn: about [\d.]+ kA through Spanner; Fault mode/);
    const shown = withStale(prev, next);
    expect(shown.canvas.stale).toBeDefined();
    expect(shown.canvas.batteries).toEqual(prev.canvas.batteries);
    expect(shown.canvas.cables.x.current_A).toBeCloseTo(next.canvas.shorts!.x, 9);
    expect(shown.canvas.cables.lp).toEqual(prev.canvas.cables.lp);
  });

  it('on the canvas: the last figures greyed, the short’s run live with its current', async () => {
    const before = pair();
    const doc = withShort(before);
    const store = useEditorStore.getState();
    store.load(before, { diagramId: 'd1', readOnly: false, unitSystem: 'metric' });
    store.setResults(results(before, 1), 'ready');
    render(
      <div style={{ width: 1200, height: 800 }}>
        <ReactFlowProvider>
          <Canvas />
        </ReactFlowProvider>
      </div>,
    );
    await waitFor(() => expect(screen.getByTestId('share-b2').textContent).toMatch(/A ·/));
    const shownBefore = screen.getByTestId('share-b2').textContent;
    act(() => {
      useEditorStore.setState({ doc });
      useEditorStore.getState().setResults(withStale(useEditorStore.getState().results, results(doc, 2)), 'ready');
    });
    await waitFor(() => expect(document.querySelector('[data-cable-id="x"]')?.textContent).toMatch(/kA short circuit/));
    expect(document.querySelector('[data-cable-id="x"]')!.className).not.toContain('bw-figures-stale');
    // Battery 2 keeps its last figure, greyed, under its short-circuit tag; so does battery 1.
    expect(screen.getByTestId('share-b2').textContent).toBe(shownBefore);
    expect(document.querySelector('[data-part-id="b2"]')!.className).toContain('bw-figures-stale');
    expect(document.querySelector('[data-part-id="b1"]')!.className).toContain('bw-figures-stale');
    expect(screen.getByTestId('mark-b2').textContent).toBe('Short circuit');
    expect(document.querySelector('[data-cable-id="lp"]')!.className).toContain('bw-figures-stale');
  });

  it('fault mode: every current with the short in place, the fuse against its interrupting rating', () => {
    const doc = withShort(pair({ fuse: true }));
    const { canvas, raw } = computeCanvas(doc, { mode: 'fault' });
    const r = raw as Extract<AnalysisResult, { ok: false }>;
    expect(canvas.solved).toBe(true);
    // Battery 1 feeds the short through the fuse: the fuse carries battery 1's current (Kirchhoff current law).
    expect(canvas.fuses.f1.current_A).toBeCloseTo(Math.abs(r.shortCircuit!.sources.b1), 6);
    expect(canvas.fuses.f1.interruptingLoading).toBeCloseTo(canvas.fuses.f1.current_A / fuseDefaults('class_t', 100).interrupting_A, 9);
    expect(canvas.batteries.b2.current_A).toBeCloseTo(r.shortCircuit!.sources.b2, 9);
    expect(canvas.modeIssue).toMatch(/currents with it in place/);
  });
});
