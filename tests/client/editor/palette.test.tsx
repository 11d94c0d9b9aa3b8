import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { ReactFlowProvider } from '@xyflow/react';
import { describe, expect, it } from 'vitest';
import { CASCADE_STEP, Palette, resetCascade } from '@/features/editor/Palette';
import { partBox } from '@/features/editor/canvas/geometry';
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

  it('places any part with a click, centred on the view, and cascades repeated clicks down and right', async () => {
    resetEditor();
    resetCascade();
    renderPalette();
    const user = userEvent.setup();
    await user.click(screen.getByRole('button', { name: /^Inverter / }));
    await user.click(screen.getByRole('button', { name: /^DC load / }));
    await user.click(screen.getByRole('button', { name: /^Busbar / }));
    const parts = editor().doc.parts;
    expect(parts.map((p) => p.type)).toEqual(['inverter', 'dc_load', 'busbar']);
    // Centres (jsdom has no laid-out canvas, so the view centre is the origin): 0, then one step, then two.
    const centre = (p: (typeof parts)[number]) => {
      const box = partBox(p);
      return { x: p.position.x + box.w / 2, y: p.position.y + box.h / 2 };
    };
    parts.forEach((p, i) => {
      expect(Math.abs(centre(p).x - i * CASCADE_STEP)).toBeLessThanOrEqual(10); // snapped to the 10-unit grid
      expect(Math.abs(centre(p).y - i * CASCADE_STEP)).toBeLessThanOrEqual(10);
    });
    expect(editor().selection).toEqual([parts[2].id]);
  });

  it('places with Space as well as Enter, one part per key press', async () => {
    resetEditor();
    renderPalette();
    const user = userEvent.setup();
    screen.getByRole('button', { name: /^Shunt / }).focus();
    await user.keyboard(' ');
    await user.keyboard('{Enter}');
    expect(editor().doc.parts.map((p) => p.type)).toEqual(['shunt', 'shunt']);
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
