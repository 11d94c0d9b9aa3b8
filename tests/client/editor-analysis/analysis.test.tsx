/**
 * The analysis side of the editor, driven by the real electrical core: the store holds a template
 * document and the core's own analysis of it (as the editor's compute worker sends it); the expected
 * figures below come from calling the core directly, never from the panels under test.
 */
import { render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeEach, describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate, type DiagramDocument } from '@shared/diagram';
import { analyzeDiagram, fuseDefaults, optimizeTakeoff, suggestSizing, type AnalysisMode } from '@shared/electrical';
import { AnalysisPanel, FindingsPanel } from '@/features/editor/analysis';
import { resetCoreResults } from '@/features/editor/analysis/useCore';
import { useEditorStore } from '@/features/editor/store';
import { openInEditor as openWithResults } from './open-in-editor';
import { computeCanvas } from '@/features/editor/results/compute';

/** Put a document in the editor with the core's analysis of it in `mode`, as the compute worker would (a US team). */
function openInEditor(doc: DiagramDocument, mode: AnalysisMode = 'load', opts: { readOnly?: boolean } = {}) {
  return openWithResults(doc, { mode, readOnly: opts.readOnly ?? false, unitSystem: 'us' });
}

/** Keep the store's analysis in step with its document after an edit (the compute worker's job in the app). */
function recompute() {
  const s = useEditorStore.getState();
  const mode = s.analysis.mode;
  s.setResults({ seq: 2, stage: 'full', mode, canvas: computeCanvas(s.doc, { mode }).canvas, raw: analyzeDiagram(s.doc, { mode }), elapsed_ms: 0 }, 'ready');
}

beforeEach(() => {
  resetCoreResults();
});

describe('findings list', () => {
  // 10 AWG cables behind Class T fuses sized for the share: fuses above ampacity (errors) and warnings.
  const doc = busbarBankTemplate({ count: 4, conductor: { system: 'awg', size: '10' } });

  it('groups the findings by severity, errors first, each with icon and word', () => {
    const raw = openInEditor(doc);
    if (!raw.ok || !raw.operating) throw new Error('did not solve');
    // The rule findings, and the solver's notes (a load held at its minimum voltage) as warnings.
    const notes = raw.operating.solverNotes.map(() => ({ severity: 'warning' }));
    const bySeverity = (s: string) => [...raw.findings, ...notes, ...raw.notes.map(() => ({ severity: 'note' }))].filter((f) => f.severity === s);
    expect(bySeverity('error').length).toBeGreaterThan(0);
    expect(bySeverity('warning').length).toBeGreaterThan(0);
    render(<FindingsPanel />);
    const errors = screen.getByRole('region', { name: /^Errors/ });
    const warnings = screen.getByRole('region', { name: /^Warnings/ });
    expect(within(errors).getAllByRole('button')).toHaveLength(bySeverity('error').length);
    expect(within(warnings).getAllByRole('button')).toHaveLength(bySeverity('warning').length);
    const noteRegion = screen.queryByRole('region', { name: /^Notes/ });
    if (bySeverity('note').length) expect(within(noteRegion!).getAllByRole('button')).toHaveLength(bySeverity('note').length);
    else expect(noteRegion).toBeNull();
    // Errors come before warnings in the document.
    expect(errors.compareDocumentPosition(warnings) & Node.DOCUMENT_POSITION_FOLLOWING).toBeTruthy();
    // Every error is in its own severity's group, in the core's order, with the word (not only colour).
    const errorIds = raw.findings.filter((f) => f.severity === 'error').map((f) => f.id);
    expect(within(errors).getAllByRole('button').map((b) => b.getAttribute('data-finding'))).toEqual(errorIds);
    expect(within(errors).getAllByRole('button')[0]).toHaveTextContent(/^Error:/);
  });

  it('selects and frames the parts of a finding on click and with Enter', async () => {
    const raw = openInEditor(doc);
    const user = userEvent.setup();
    render(<FindingsPanel />);
    // The panel lists the rule findings in the core's order within each severity.
    const warnings = raw.findings.filter((f) => f.severity === 'warning');
    const k = warnings.findIndex((f) => f.parts.length > 0);
    const warning = warnings[k];
    const button = within(screen.getByRole('region', { name: /^Warnings/ })).getAllByRole('button')[k];
    await user.click(button);
    expect(useEditorStore.getState().selection).toEqual(warning.parts);
    expect(useEditorStore.getState().focusRequest?.ids).toEqual(warning.parts);

    const errorList = raw.findings.filter((f) => f.severity === 'error');
    const e = errorList.findIndex((f) => f.parts.length > 0 && f.parts.join() !== warning.parts.join());
    const error = errorList[e];
    const errButton = within(screen.getByRole('region', { name: /^Errors/ })).getAllByRole('button')[e];
    errButton.focus();
    const seq = useEditorStore.getState().focusRequest!.seq;
    await user.keyboard('{Enter}');
    expect(useEditorStore.getState().focusRequest).toEqual({ ids: error.parts, seq: seq + 1 });
  });
});

describe('sizing assistant', () => {
  it('applies one branch as a single undoable edit', async () => {
    // 200 A Class T fuses on a 2 kW, 4-battery bank: each is re-rated to its share.
    const doc = busbarBankTemplate({ count: 4, batteryFuse: fuseDefaults('class_t', 200), conductor: { system: 'awg', size: '4/0' } });
    openInEditor(doc);
    const sizing = suggestSizing(doc, { unitSystem: 'us' });
    if (!sizing.ok) throw new Error('sizing failed');
    const branch = sizing.branches.find((b) => b.source === 'bat2')!;
    expect(branch.fuse.rating_A).toBeLessThan(200);

    const user = userEvent.setup();
    render(<AnalysisPanel />);
    await user.click(screen.getByRole('button', { name: 'Sizing assistant' }));
    const apply = await screen.findByRole('button', { name: 'Apply sizing to Battery 2' });
    await waitFor(() => expect(apply).toBeEnabled());
    const before = useEditorStore.getState();
    await user.click(apply);
    await waitFor(() => expect(useEditorStore.getState().past).toHaveLength(before.past.length + 1));
    const after = useEditorStore.getState().doc;
    expect(after.parts.find((p) => p.id === 'fuse2')!.props).toMatchObject({ rating_A: branch.fuse.rating_A });
    // Other branches untouched; cables larger than needed are kept.
    expect(after.parts.find((p) => p.id === 'fuse1')!.props).toMatchObject({ rating_A: 200 });
    expect(after.cables.find((x) => x.id === 'c-pos2')!.props.conductor).toEqual({ system: 'awg', size: '4/0' });
    useEditorStore.getState().undo();
    expect(useEditorStore.getState().doc.cables).toEqual(doc.cables);
    expect(useEditorStore.getState().doc.parts).toEqual(doc.parts);
  });

  it('refuses, with the reason, a suggestion that would make the design worse on its own', async () => {
    // 10 AWG battery cables on 3 batteries: enlarging one battery's cables alone sends it more than its
    // 100 A continuous limit; together they are safe.
    const doc = busbarBankTemplate({ count: 3, conductor: { system: 'awg', size: '10' } });
    openInEditor(doc);
    const user = userEvent.setup();
    render(<AnalysisPanel />);
    await user.click(screen.getByRole('button', { name: 'Sizing assistant' }));
    const row = await screen.findByTestId('sizing-bat1');
    await waitFor(() => expect(within(row).getByRole('alert')).toHaveTextContent(/Not applied:.*continuous limit/));
    expect(within(row).getByRole('button', { name: 'Apply sizing to Battery 1' })).toBeDisabled();
    // The preview shows the battery's share before and after.
    await user.click(within(row).getByRole('button', { name: 'Preview the sizing of Battery 1' }));
    expect(within(row).getByLabelText('Preview: Battery 1 as suggested')).toHaveTextContent(/Errors \d+ → \d+/);
    expect(screen.getByRole('button', { name: 'Apply all' })).toBeInTheDocument();
  });

  it('"Apply all" sizes every branch in one step, and shows conductors in the team units', async () => {
    const doc = busbarBankTemplate({ count: 3, conductor: { system: 'awg', size: '10' } });
    openInEditor(doc);
    const sizing = suggestSizing(doc, { unitSystem: 'us' });
    if (!sizing.ok) throw new Error('sizing failed');
    const user = userEvent.setup();
    render(<AnalysisPanel />);
    await user.click(screen.getByRole('button', { name: 'Sizing assistant' }));
    const all = await screen.findByRole('button', { name: 'Apply all' });
    // US team: AWG as written.
    await waitFor(() => expect(screen.getByTestId('sizing-bat1')).toHaveTextContent(`becomes ${sizing.branches[0].cables[0].conductor.size} AWG`));
    const steps = useEditorStore.getState().past.length;
    await user.click(all);
    await waitFor(() => expect(useEditorStore.getState().past).toHaveLength(steps + 1));
    const after = useEditorStore.getState().doc;
    for (const b of sizing.branches) for (const c of b.cables) expect(after.cables.find((x) => x.id === c.id)!.props.conductor).toEqual(c.conductor);
  });

  it('"Apply all" adds the missing battery fuses to a post-to-post bank in one step, overloading no cable', async () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'same-end' });
    const before = analyzeDiagram(doc);
    expect(before.findings.filter((f) => f.id === 'cable-over-ampacity')).toHaveLength(0);
    openInEditor(doc);
    const user = userEvent.setup();
    render(<AnalysisPanel />);
    await user.click(screen.getByRole('button', { name: 'Sizing assistant' }));
    const steps = useEditorStore.getState().past.length;
    await user.click(await screen.findByRole('button', { name: 'Apply all' }));
    await waitFor(() => expect(useEditorStore.getState().past).toHaveLength(steps + 1));
    const after = analyzeDiagram(useEditorStore.getState().doc);
    expect(after.findings.filter((f) => f.id === 'cable-over-ampacity')).toEqual([]);
    expect(useEditorStore.getState().doc.parts.filter((p) => p.type === 'fuse').length).toBeGreaterThan(doc.parts.filter((p) => p.type === 'fuse').length);
  });

  it('offers no apply buttons to a role without diagram.edit', async () => {
    openInEditor(busbarBankTemplate({ count: 3, conductor: { system: 'awg', size: '10' } }), 'load', { readOnly: true });
    const user = userEvent.setup();
    render(<AnalysisPanel />);
    await user.click(screen.getByRole('button', { name: 'Sizing assistant' }));
    await screen.findByTestId('sizing-bat1');
    expect(screen.queryByRole('button', { name: /^Apply/ })).toBeNull();
    expect(screen.getByText(/not apply them/)).toBeInTheDocument();
  });
});

describe('take-off explorer', () => {
  it('lists the lead pairs with the layout as drawn marked, suggests the best and applies it in one step', async () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'same-end' });
    openInEditor(doc);
    const opt = optimizeTakeoff(doc);
    if (!opt.ok || opt.best.choice.kind !== 'post_to_post') throw new Error('optimizer failed');
    const best = opt.best.choice;

    const user = userEvent.setup();
    render(<AnalysisPanel />);
    await user.click(screen.getByRole('button', { name: 'Take-off explorer' }));
    const list = await screen.findByRole('list', { name: 'Lead pairs' });
    // 4 × 4 pairs, 8 shown plus the one as drawn when it is not among them.
    const rows = within(list).getAllByRole('button');
    expect(rows.length).toBeGreaterThanOrEqual(8);
    const drawn = rows.filter((r) => r.textContent?.includes('as drawn'));
    expect(drawn).toHaveLength(1);
    expect(drawn[0]).toHaveTextContent('positive from Battery 1, negative from Battery 1');
    await user.click(screen.getByRole('button', { name: `Show all ${opt.options.length}` }));
    expect(within(list).getAllByRole('button')).toHaveLength(opt.options.length);

    await user.click(screen.getByRole('button', { name: 'Suggest' }));
    const preview = await screen.findByTestId('takeoff-preview');
    expect(within(preview).getByTestId('preview-imbalance')).toHaveTextContent(`${opt.best.imbalance_pct.toFixed(1)} %`);
    expect(preview).toHaveTextContent(opt.explanation);

    const steps = useEditorStore.getState().past.length;
    await user.click(within(preview).getByRole('button', { name: 'Apply this layout' }));
    await waitFor(() => expect(useEditorStore.getState().past).toHaveLength(steps + 1));
    const cables = useEditorStore.getState().doc.cables;
    const pos = cables.find((c) => c.id === best.pos.cable)!;
    const neg = cables.find((c) => c.id === best.neg.cable)!;
    expect([pos.from, pos.to]).toContainEqual({ part: best.pos.battery, terminal: 'pos' });
    expect([neg.from, neg.to]).toContainEqual({ part: best.neg.battery, terminal: 'neg' });
    // The core agrees the applied layout is the better one.
    recompute();
    const op = analyzeDiagram(useEditorStore.getState().doc, { mode: 'load', rules: false });
    expect(op.ok && op.operating!.imbalance_pct).toBeCloseTo(opt.best.imbalance_pct, 6);
  });

  it('moves busbar main leads to other taps and sees the imbalance change', async () => {
    const doc = busbarBankTemplate({ count: 4 });
    openInEditor(doc);
    const user = userEvent.setup();
    render(<AnalysisPanel />);
    await user.click(screen.getByRole('button', { name: 'Take-off explorer' }));
    const taps = await screen.findByRole('list', { name: 'Main lead taps' });
    // 5 taps on each busbar: 25 pairs; the template takes both leads from the last taps.
    await user.click(screen.getByRole('button', { name: 'Show all 25' }));
    const rows = within(taps).getAllByRole('button');
    expect(rows).toHaveLength(25);
    const pick = rows.find((r) => r.textContent?.startsWith('positive on Positive busbar t3, negative on Negative busbar t2'))!;
    await user.click(pick);
    const preview = await screen.findByTestId('takeoff-preview');
    // The same move made by hand and solved by the core gives the previewed imbalance.
    const moved: DiagramDocument = {
      ...doc,
      cables: doc.cables.map((c) =>
        c.id === 'c-main-fuse' ? { ...c, from: { part: 'bus-pos', terminal: 't3' } } : c.id === 'c-main-neg' ? { ...c, from: { part: 'bus-neg', terminal: 't2' } } : c,
      ),
    };
    const r = analyzeDiagram(moved, { mode: 'load', rules: false });
    if (!r.ok || !r.operating) throw new Error('did not solve');
    expect(within(preview).getByTestId('preview-imbalance')).toHaveTextContent(`${r.operating.imbalance_pct.toFixed(1)} %`);
    await user.click(within(preview).getByRole('button', { name: 'Apply this layout' }));
    await waitFor(() => expect(useEditorStore.getState().doc.cables).toEqual(moved.cables));
  });
});

describe('discharge chart', () => {
  it('draws current and state of charge for each battery, with a legend and which empties first', async () => {
    const doc = postToPostTemplate({ count: 3, takeOff: 'same-end' });
    const raw = openInEditor(doc, 'discharge');
    if (!raw.ok || !raw.discharge) throw new Error('no discharge');
    render(<AnalysisPanel />);
    const current = screen.getByTestId('chart-current');
    const soc = screen.getByTestId('chart-soc');
    for (const id of ['bat1', 'bat2', 'bat3']) {
      expect(current.querySelector(`path[data-series="${id}"]`)).not.toBeNull();
      expect(soc.querySelector(`path[data-series="${id}"]`)).not.toBeNull();
    }
    // One point per sample in each series.
    const d = current.querySelector('path[data-series="bat1"]')!.getAttribute('d')!;
    expect(d.split(/[ML]/).filter(Boolean)).toHaveLength(raw.discharge.samples.length);
    expect(within(screen.getByRole('list', { name: 'Legend' })).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['Battery 1', 'Battery 2', 'Battery 3']);
    expect(current).toHaveTextContent('current (A)');
    expect(soc).toHaveTextContent('SoC (%)');
    expect(current).toHaveTextContent('time (h)');
    const label = doc.parts.find((p) => p.id === raw.discharge!.firstEmpty)!.label;
    expect(screen.getByTestId('first-empty')).toHaveTextContent(`${label} empties first`);
    expect(screen.getByText(`${raw.discharge.usable_Ah.toFixed(0)} Ah of ${raw.discharge.nameplate_Ah.toFixed(0)} Ah nameplate`)).toBeInTheDocument();
  });
});

describe('results and fault target', () => {
  it('shows each battery share with its ideal share, and picks a faulted battery', async () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'same-end' });
    const raw = openInEditor(doc);
    if (!raw.ok || !raw.operating) throw new Error('did not solve');
    const user = userEvent.setup();
    render(<AnalysisPanel />);
    const row = screen.getByTestId('battery-row-bat1');
    expect(row).toHaveTextContent(`${raw.operating.sources.bat1.share_pct.toFixed(1)} %`);
    expect(row).toHaveTextContent(`${raw.operating.sources.bat1.idealShare_pct.toFixed(1)} %`);
    await user.click(screen.getByRole('radio', { name: 'Fault' }));
    expect(useEditorStore.getState().analysis).toEqual({ mode: 'fault' });
    await user.selectOptions(screen.getByLabelText('Faulted part'), 'battery:bat2');
    expect(useEditorStore.getState().analysis).toEqual({ mode: 'fault', fault: { kind: 'battery', id: 'bat2' } });
  });
});
