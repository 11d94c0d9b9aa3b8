import '../editor/flow-mocks';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { mockApi, renderApp } from '../helpers';
import { DIAGRAM_ID, diagramAnswer, meAs, meta, revisionAnswer, summary, versionA, versionB } from './fixtures';

const a = versionA();
const b = versionB(a);
const capacityA = (() => {
  const p = a.parts.find((x) => x.id === 'bat3');
  return p && p.type === 'battery' ? p.props.capacity_Ah : NaN;
})();

// Invented figures: the diagonal take-off evens the shares out.
const summaryA = summary([0.4, 0.25, 0.2, 0.15], [40, 25, 20, 15], { imbalance_pct: 100, drop_pct: 2.5, losses_W: 30, findings: [{ rule: 'take-off-same-end', parts: ['bat1'], message: 'Both main cables leave one battery' }] });
const summaryB = summary([0.27, 0.24, 0.24, 0.25], [27, 24, 24, 25], { imbalance_pct: 12, drop_pct: 2.1, losses_W: 24 });

function api(role: 'designer' | 'reviewer') {
  return mockApi({
    'GET /api/auth/me': { body: meAs(role) },
    [`GET /api/diagrams/${DIAGRAM_ID}`]: diagramAnswer(role),
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions`]: { body: { revisions: [meta(2, 'in_review', 'Diagonal'), meta(1, 'draft', 'First')] } },
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions/1`]: revisionAnswer(1, 'draft', a, summaryA),
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions/2`]: revisionAnswer(2, 'in_review', b, summaryB),
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions/2/comments`]: { body: { comments: [] } },
  });
}

async function openCompare() {
  api('reviewer');
  const utils = renderApp(`/diagrams/${DIAGRAM_ID}/compare?a=1&b=2`);
  await screen.findByRole('list', { name: 'Changes' }, { timeout: 20_000 });
  return utils;
}

// Generous limit: the first test loads the lazy compare route and React Flow.
describe('compare two revisions', { timeout: 30_000 }, () => {
  it('lists each change with its status in words and the changed fields', async () => {
    await openCompare();
    const items = within(screen.getByRole('list', { name: 'Changes' })).getAllByRole('listitem').filter((li) => li.querySelector('button'));
    const text = items.map((li) => li.textContent ?? '');
    // Written out from the edit in fixtures.ts: one part added, one removed, one moved, one changed, one cable reconnected.
    expect(text.some((t) => t.startsWith('+Added') && t.includes('Take-off note'))).toBe(true);
    expect(text.some((t) => t.startsWith('−Removed') && t.includes('Old note'))).toBe(true);
    expect(text.some((t) => t.startsWith('↗Moved') && t.includes('Battery 2'))).toBe(true);
    expect(text.some((t) => t.startsWith('ΔChanged') && t.includes('Battery 3') && t.includes(`Capacity ${capacityA} Ah → ${capacityA * 2} Ah`))).toBe(true);
    expect(text.some((t) => t.startsWith('ΔChanged') && t.includes('Main negative') && t.includes('Reconnected bat1.neg → bat4.neg'))).toBe(true);
    expect(items).toHaveLength(5);
  });

  it('shows a legend with the count of each kind of change', async () => {
    await openCompare();
    const legend = screen.getByRole('list', { name: 'Legend' });
    expect(within(legend).getByTestId('legend-added')).toHaveTextContent(/Added.*solid outline · 1/);
    expect(within(legend).getByTestId('legend-removed')).toHaveTextContent(/Removed.*dashed outline · 1/);
    expect(within(legend).getByTestId('legend-moved')).toHaveTextContent(/Moved.*dotted outline · 1/);
    expect(within(legend).getByTestId('legend-changed')).toHaveTextContent(/Changed.*double outline · 2/);
  });

  it('marks removed parts on A and added parts on B, by tag text', async () => {
    await openCompare();
    const canvasA = screen.getByTestId('canvas-a');
    const canvasB = screen.getByTestId('canvas-b');
    await waitFor(() => expect(canvasA.querySelector('[data-id="note-old"]')).not.toBeNull());
    expect(canvasA.querySelector('[data-id="note-old"]')).toHaveTextContent('Removed');
    expect(canvasA.querySelector('[data-id="note-old"]')).toHaveClass('bw-diff-removed');
    expect(canvasB.querySelector('[data-id="note-old"]')).toBeNull();
    expect(canvasB.querySelector('[data-id="note-new"]')).toHaveTextContent('Added');
    expect(canvasB.querySelector('[data-id="bat3"]')).toHaveTextContent('Changed');
    expect(canvasA.querySelector('[data-id="bat2"]')).toHaveTextContent('Moved');
    // Unchanged parts carry no mark.
    expect(canvasB.querySelector('[data-id="bat1"]')).not.toHaveClass('bw-diff-node');
    // Every cable is drawn, and the reconnected take-off is marked on both sides.
    await waitFor(() => expect(canvasB.querySelectorAll('.react-flow__edge')).toHaveLength(b.cables.length));
    expect(canvasA.querySelector('.react-flow__edge[data-id="c-main-neg"]')).toHaveClass('bw-diff-changed');
    expect(canvasB.querySelector('.react-flow__edge[data-id="c-main-neg"]')).toHaveClass('bw-diff-changed');
  });

  it('frames a clicked change in both canvases with one shared viewport', async () => {
    await openCompare();
    const user = userEvent.setup();
    const vp = (id: string) => (screen.getByTestId(id).querySelector('.react-flow__viewport') as HTMLElement).style.transform;
    await waitFor(() => expect(vp('canvas-a')).not.toBe(''));
    const before = vp('canvas-a');
    const item = within(screen.getByRole('list', { name: 'Changes' })).getByText('Take-off note (note)');
    await user.click(item);
    await waitFor(() => expect(vp('canvas-a')).not.toBe(before));
    expect(vp('canvas-b')).toBe(vp('canvas-a'));
  });

  it('puts A and B battery shares, their difference, and findings resolved in the results table', async () => {
    await openCompare();
    const table = screen.getByRole('table', { name: 'Battery currents and shares' });
    const row1 = within(table).getByTestId('share-row-bat1');
    // Battery 1: 40 A, 40.0 % in r1; 27 A, 27.0 % in r2; Δ −13.0 A, −13.0 pts.
    expect(within(row1).getAllByRole('cell').map((c) => c.textContent)).toEqual(['40.0 A', '40.0 %', '27.0 A', '27.0 %', '−13.0 A', '−13.0 pts']);
    const figures = screen.getByRole('table', { name: 'Bank figures' });
    expect(within(figures).getByRole('row', { name: /Imbalance/ })).toHaveTextContent('100.0 %12.0 %−88.0 pts');
    expect(within(figures).getByRole('row', { name: /Wiring losses/ })).toHaveTextContent('30.0 W24.0 W−6.0 W');
    const resolved = screen.getByRole('heading', { name: /Findings resolved/ }).parentElement!;
    expect(resolved).toHaveTextContent('Both main cables leave one battery');
  });
});
