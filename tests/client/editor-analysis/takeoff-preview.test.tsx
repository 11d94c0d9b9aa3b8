/**
 * The take-off explorer previews a layout on the canvas before it is applied: a row sets the preview
 * (ghost cables over the drawing), "Cancel preview" and Escape clear it, the document and its history
 * stay as they were until Apply, which is one undoable edit. Expected layouts come from the core's
 * optimizer, never from the components under test.
 */
import '../editor/flow-mocks';
import { act, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeEach, describe, expect, it } from 'vitest';
import { postToPostTemplate, type DiagramDocument } from '@shared/diagram';
import { optimizeTakeoff } from '@shared/electrical';
import { AnalysisPanel } from '@/features/editor/analysis';
import { resetCoreResults } from '@/features/editor/analysis/useCore';
import { clearPreview, usePreviewStore } from '@/features/editor/canvas/preview';
import { useEditorStore } from '@/features/editor/store';
import { openInEditor as openWithResults, renderWithCanvas } from './open-in-editor';

const openInEditor = (doc: DiagramDocument) => openWithResults(doc);

const renderEditor = () => renderWithCanvas(<AnalysisPanel />);

beforeEach(() => {
  resetCoreResults();
  clearPreview();
});

describe('take-off preview on the canvas', () => {
  it('a row click previews the layout over the drawing; cancel and Escape clear it; the document and history are untouched', async () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'same-end' });
    openInEditor(doc);
    const opt = optimizeTakeoff(doc);
    if (!opt.ok || opt.best.choice.kind !== 'post_to_post') throw new Error('optimizer failed');
    const best = opt.best.choice;
    const before = useEditorStore.getState();

    const user = userEvent.setup();
    renderEditor();
    await user.click(screen.getByRole('button', { name: 'Take-off explorer' }));
    const list = await screen.findByRole('list', { name: 'Lead pairs' });
    const row = within(list).getByTestId(`takeoff-p2p:${best.pos.battery},${best.neg.battery}`);
    await user.click(row);

    // The preview is set: the candidate's leads moved in the preview document, not in the editor's.
    await waitFor(() => expect(usePreviewStore.getState().preview?.key).toBe(`p2p:${best.pos.battery},${best.neg.battery}`));
    const preview = usePreviewStore.getState().preview!;
    const pos = preview.doc.cables.find((c) => c.id === best.pos.cable)!;
    expect([pos.from, pos.to]).toContainEqual({ part: best.pos.battery, terminal: 'pos' });
    expect(useEditorStore.getState().doc).toBe(before.doc);
    expect(useEditorStore.getState().past).toBe(before.past);
    expect(row).toHaveAttribute('aria-pressed', 'true');

    // The panel shows the core's check of the change: findings and loading before → after.
    const checks = await screen.findByLabelText('Checks before → after');
    expect(checks).toHaveTextContent(/Errors \d+ → \d+, warnings \d+ → \d+/);
    expect(screen.getByRole('button', { name: 'Apply this layout' })).toBeEnabled();

    // On the canvas: the bar, and a ghost for each moved lead naming where it goes.
    const bar = await screen.findByTestId('canvas-preview');
    expect(bar).toHaveTextContent('Preview, not applied');
    const moved = Object.keys(preview.cables);
    expect(moved.length).toBeGreaterThan(0);
    await waitFor(() => expect(screen.getByTestId(`preview-ghost-${best.pos.cable}`)).toHaveTextContent(/to Battery \d \+/));

    await user.click(within(bar).getByRole('button', { name: 'Cancel preview' }));
    expect(usePreviewStore.getState().preview).toBeNull();
    expect(screen.queryByTestId('canvas-preview')).toBeNull();
    expect(screen.queryByTestId(`preview-ghost-${best.pos.cable}`)).toBeNull();
    expect(row).toHaveAttribute('aria-pressed', 'false');

    // Escape clears it too.
    await user.click(row);
    await screen.findByTestId('canvas-preview');
    await user.keyboard('{Escape}');
    expect(usePreviewStore.getState().preview).toBeNull();
    expect(screen.queryByTestId('takeoff-preview')).toBeNull();
    expect(useEditorStore.getState().doc).toBe(before.doc);
    expect(useEditorStore.getState().past).toBe(before.past);
  });

  it('Apply on the canvas applies the previewed layout as one undoable edit and ends the preview', async () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'same-end' });
    openInEditor(doc);
    const opt = optimizeTakeoff(doc);
    if (!opt.ok || opt.best.choice.kind !== 'post_to_post') throw new Error('optimizer failed');
    const user = userEvent.setup();
    renderEditor();
    await user.click(screen.getByRole('button', { name: 'Take-off explorer' }));
    await user.click(await screen.findByRole('button', { name: 'Suggest' }));
    const bar = await screen.findByTestId('canvas-preview');
    const steps = useEditorStore.getState().past.length;
    await user.click(within(bar).getByRole('button', { name: 'Apply' }));
    expect(useEditorStore.getState().past).toHaveLength(steps + 1);
    expect(usePreviewStore.getState().preview).toBeNull();
    expect(useEditorStore.getState().doc.cables).toEqual(opt.document.cables);
    act(() => useEditorStore.getState().undo());
    expect(useEditorStore.getState().doc.cables).toEqual(doc.cables);
  });

  it('an edit to the document ends a preview made of the document as it was', async () => {
    const doc = postToPostTemplate({ count: 4, takeOff: 'same-end' });
    openInEditor(doc);
    const user = userEvent.setup();
    renderEditor();
    await user.click(screen.getByRole('button', { name: 'Take-off explorer' }));
    await user.click(await screen.findByRole('button', { name: 'Suggest' }));
    await screen.findByTestId('canvas-preview');
    act(() => useEditorStore.getState().updatePart('bat2', { label: 'Battery two' }));
    expect(usePreviewStore.getState().preview).toBeNull();
  });

  it('when the layout as drawn is already the best, it says so and marks no row "best"', async () => {
    // Two equal batteries with a diagonal take-off share equally (first principles: equal path resistance).
    const doc = postToPostTemplate({ count: 2, takeOff: 'diagonal' });
    openInEditor(doc);
    const user = userEvent.setup();
    renderEditor();
    await user.click(screen.getByRole('button', { name: 'Take-off explorer' }));
    const verdict = await screen.findByTestId('takeoff-verdict');
    expect(verdict).toHaveTextContent(/^The layout as drawn is already the best of 4 evaluated/);
    const list = screen.getByRole('list', { name: 'Lead pairs' });
    expect(within(list).queryByText('best')).toBeNull();
    expect(screen.queryByRole('button', { name: 'Suggest' })).toBeNull();
  });
});
