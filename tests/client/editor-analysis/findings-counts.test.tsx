/**
 * One list of findings: the status bar's counts, the findings list and the badges on the canvas agree,
 * and no finding shows a raw id (a rule or structural code, a part or cable id, a table id). The store
 * holds the core's analysis as the editor's compute worker sends it; expected counts come from the
 * core's own result and from the document, never from the components under test.
 */
import '../editor/flow-mocks';
import { render, screen, waitFor, within } from '@testing-library/react';
import { beforeEach, describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate, type DiagramDocument } from '@shared/diagram';
import { analyzeDiagram } from '@shared/electrical';
import { cableRunDefaults } from '@shared/electrical/parts';
import { FindingsPanel } from '@/features/editor/analysis';
import { plainTextOf } from '@/features/editor/analysis/labels';
import { resetCoreResults } from '@/features/editor/analysis/useCore';
import { FindingCounts } from '@/features/editor/results/ModeStatus';
import { useEditorStore } from '@/features/editor/store';
import { openInEditor as openWithResults, renderWithCanvas } from './open-in-editor';

const openInEditor = (doc: DiagramDocument) => openWithResults(doc, { unitSystem: 'us' });

/** Two batteries post to post with a conductor drawn from battery 2's positive to its negative: a short. */
function shortedBank(): DiagramDocument {
  const doc = postToPostTemplate({ count: 2, takeOff: 'same-end' });
  return {
    ...doc,
    cables: [...doc.cables, { id: 'c-short', label: 'Spanner', from: { part: 'bat2', terminal: 'pos' }, to: { part: 'bat2', terminal: 'neg' }, props: { ...cableRunDefaults(), length_m: 0.2 } }],
  };
}

const countOf = (text: string, word: 'error' | 'warning') => Number(new RegExp(`(\\d+) ${word}s?`).exec(text)?.[1] ?? 0);

function renderEditorPieces() {
  return renderWithCanvas(
    <>
      <FindingCounts />
      <FindingsPanel />
    </>,
  );
}

/** What the findings list shows per part or cable id: the finding buttons whose parts include it. */
function listedPerPart(doc: DiagramDocument): Map<string, number> {
  const out = new Map<string, number>();
  const labels = new Map([...doc.parts, ...doc.cables].map((x) => [x.label ?? x.id, x.id]));
  for (const button of screen.getAllByRole('button').filter((b) => b.hasAttribute('data-finding'))) {
    const chips = [...button.querySelectorAll('span.flex-wrap > span')].map((c) => labels.get(c.textContent ?? '') ?? c.textContent ?? '');
    for (const id of new Set(chips)) out.set(id, (out.get(id) ?? 0) + 1);
  }
  return out;
}

beforeEach(() => {
  resetCoreResults();
});

describe('status bar, findings list and canvas badges count the same findings', () => {
  it('a short drawn in the diagram: each battery shorted is one error everywhere, not two', async () => {
    const doc = shortedBank();
    // The core: the diagram does not compile; the structural rule reports the short once (the run across
    // battery 2, fed by battery 1 through the jumpers).
    const raw = analyzeDiagram(doc);
    expect(raw.ok).toBe(false);
    const coreErrors = raw.findings.filter((f) => f.severity === 'error');
    expect(coreErrors.map((f) => f.id)).toEqual(['structure-shorted-source']);

    openInEditor(doc);
    renderEditorPieces();
    const status = screen.getByTestId('status-counts').textContent ?? '';
    const listed = screen.getByTestId('findings-counts').textContent ?? '';
    expect(countOf(status, 'error')).toBe(coreErrors.length);
    expect(countOf(listed, 'error')).toBe(coreErrors.length);
    expect(countOf(status, 'warning')).toBe(countOf(listed, 'warning'));
    expect(within(screen.getByRole('region', { name: /^Errors/ })).getAllByRole('button')).toHaveLength(coreErrors.length);

    // The badge on each part counts the findings the list names it in.
    const perPart = listedPerPart(doc);
    // (The short's conductors are named too; cables carry their badge on the label, counted here for parts only.)
    const isPart = (id: string) => doc.parts.some((p) => p.id === id);
    await waitFor(() => expect(document.querySelectorAll('.bw-badge').length).toBe([...perPart.keys()].filter(isPart).length));
    for (const [id, n] of perPart) {
      if (!isPart(id)) continue;
      const badge = document.querySelector(`[data-part-id="${id}"] .bw-badge`);
      expect(badge, id).not.toBeNull();
      expect(badge!.textContent).toMatch(new RegExp(`^${n}\\b`));
    }
  });

  it('a bank that solves with a load below its minimum voltage: the solver warning is counted and listed alike', () => {
    // 10 AWG runs feeding a 2 kW inverter at 12 V: far above ampacity, and the inverter below its cut-off.
    const doc = busbarBankTemplate({ count: 4, conductor: { system: 'awg', size: '10' } });
    const raw = analyzeDiagram(doc);
    if (!raw.ok || !raw.operating) throw new Error('did not solve');
    expect(raw.operating.solverNotes.length).toBeGreaterThan(0);
    const expected = {
      error: raw.findings.filter((f) => f.severity === 'error').length,
      warning: raw.findings.filter((f) => f.severity === 'warning').length + raw.operating.solverNotes.length,
    };
    openInEditor(doc);
    render(
      <>
        <FindingCounts />
        <FindingsPanel />
      </>,
    );
    const status = screen.getByTestId('status-counts').textContent ?? '';
    const listed = screen.getByTestId('findings-counts').textContent ?? '';
    expect(countOf(status, 'error')).toBe(expected.error);
    expect(countOf(status, 'warning')).toBe(expected.warning);
    expect(countOf(listed, 'error')).toBe(expected.error);
    expect(countOf(listed, 'warning')).toBe(expected.warning);
    expect(within(screen.getByRole('region', { name: /^Warnings/ })).getAllByRole('button')).toHaveLength(expected.warning);
  });
});

describe('no raw id is shown', () => {
  /** Ids in the document that are not plain words (a word-like id such as "inverter" reads as the word). */
  const idsOf = (doc: DiagramDocument) => [...doc.parts, ...doc.cables].map((x) => x.id).filter((id) => /[\d_/-]/.test(id));

  it('a drawn short offers the fault analysis, which shows every current with the short in place', async () => {
    openInEditor(shortedBank());
    render(<FindingsPanel />);
    const link = within(screen.getByRole('region', { name: /^Errors/ })).getByRole('link', { name: 'Show the fault currents (fault analysis)' });
    link.click();
    await waitFor(() => expect(useEditorStore.getState().analysis.mode).toBe('fault'));
  });

  it('structural findings carry a plain title and name parts by label', () => {
    const doc = shortedBank();
    openInEditor(doc);
    render(<FindingsPanel />);
    const errors = within(screen.getByRole('region', { name: /^Errors/ })).getAllByRole('button').filter((b) => b.hasAttribute('aria-pressed'));
    for (const b of errors) {
      expect(b).toHaveTextContent(/^Error: Short circuit/);
      expect(b.textContent).not.toMatch(/structure-|shorted[-_]source/);
    }
    expect(errors[0]).toHaveTextContent('Short circuit: Spanner joins the positive and negative of Battery 2 with no load between; Battery 1 feeds it');
    const text = document.body.textContent ?? '';
    for (const id of idsOf(doc)) expect(text, id).not.toMatch(new RegExp(`(^|[^\\w-])${id}([^\\w-]|$)`));
  });

  it('rule findings show the rule titles; unlabelled cables and ampacity tables are named in words', async () => {
    const doc = busbarBankTemplate({ count: 4, conductor: { system: 'awg', size: '10' } });
    openInEditor(doc);
    render(<FindingsPanel />);
    // The rule titles load with the registry; until then a code is written as words.
    const titles = (await import('@shared/electrical/rules/rules')).RULES;
    const overAmpacity = titles.find((r) => r.id === 'cable-over-ampacity')!.title;
    await waitFor(() => expect(screen.getAllByText(overAmpacity).length).toBeGreaterThan(0));
    const text = document.body.textContent ?? '';
    for (const id of idsOf(doc)) expect(text, id).not.toMatch(new RegExp(`(^|[^\\w-])${id}([^\\w-]|$)`));
    expect(text).not.toContain('nec-310.16');
    expect(text).not.toMatch(/below_v_min|v_min_V|current_limit/);
    // An unlabelled battery cable is named by its two ends.
    expect(text).toMatch(/cable from Fuse 1 to Positive busbar carries/i);
  });

  it('plainTextOf: "Label (id)" reads "Label", a lone id its name, a word-like id is left as the word', () => {
    const doc = busbarBankTemplate({ count: 2 });
    const plain = plainTextOf(doc);
    expect(plain('Fuse 1 (fuse1) is rated 60.0 A')).toBe('Fuse 1 is rated 60.0 A');
    expect(plain('When joined, bat2 exchanges 40.0 A')).toBe('When joined, Battery 2 exchanges 40.0 A');
    expect(plain('the inverter draws 170 A')).toBe('the inverter draws 170 A');
    expect(plain('bat1 leads')).toBe('Battery 1 leads');
    // Not part of a longer token.
    expect(plain('bat10 and xbat1')).toBe('bat10 and xbat1');
  });
});
