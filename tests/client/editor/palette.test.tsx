import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { ReactFlowProvider } from '@xyflow/react';
import { describe, expect, it } from 'vitest';
import { Palette } from '@/features/editor/Palette';
import { editor, resetEditor } from './flow-mocks';

function renderPalette() {
  return render(
    <ReactFlowProvider>
      <Palette />
    </ReactFlowProvider>,
  );
}

describe('parts palette', () => {
  it('places a battery with the keyboard (focus, Enter) and selects it', async () => {
    resetEditor();
    renderPalette();
    const user = userEvent.setup();
    const item = screen.getByRole('button', { name: /^Battery / });
    item.focus();
    await user.keyboard('{Enter}');
    const parts = editor().doc.parts;
    expect(parts).toHaveLength(1);
    expect(parts[0].type).toBe('battery');
    expect(parts[0].label).toBe('Battery 1');
    expect(editor().selection).toEqual([parts[0].id]);
  });

  it('places a second part beside, not on top of, the first', async () => {
    resetEditor();
    renderPalette();
    const user = userEvent.setup();
    const item = screen.getByRole('button', { name: /^Fuse / });
    item.focus();
    await user.keyboard('{Enter}');
    await user.keyboard('{Enter}');
    const [a, b] = editor().doc.parts;
    expect(b.label).toBe('Fuse 2');
    expect(b.position).not.toEqual(a.position);
  });

  it('lists every part type of the issue, reachable with Tab', async () => {
    resetEditor();
    renderPalette();
    const names = screen.getAllByRole('button').map((b) => b.querySelector('.font-medium')!.textContent);
    expect(names).toEqual([
      'Battery', 'Series string', 'Busbar', 'Fuse', 'Switch / disconnect', 'Shunt', 'Lug / terminal joint', 'Inverter', 'DC load', 'Charger', 'Note',
    ]);
  });

  it('is hidden for a read-only role', () => {
    resetEditor(undefined, { readOnly: true });
    renderPalette();
    expect(screen.queryByRole('navigation', { name: 'Parts palette' })).not.toBeInTheDocument();
  });
});
