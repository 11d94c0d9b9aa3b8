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

  it('places any part with a click at the centre of the view, each repeat cascading down and right, clear of the others', async () => {
    resetEditor();
    resetCascade();
    renderPalette();
    const user = userEvent.setup();
    await user.click(screen.getByRole('button', { name: /^Inverter / }));
    await user.click(screen.getByRole('button', { name: /^DC load / }));
    await user.click(screen.getByRole('button', { name: /^Busbar / }));
    await user.click(screen.getByRole('button', { name: /^Busbar / }));
    const parts = editor().doc.parts;
    expect(parts.map((p) => p.type)).toEqual(['inverter', 'dc_load', 'busbar', 'busbar']);
    const boxes = parts.map((p) => ({ ...p.position, ...partBox(p) }));
    // The first is centred on the view (jsdom lays nothing out, so the view centre is the origin), within the 10-unit grid.
    expect(Math.abs(boxes[0].x + boxes[0].w / 2)).toBeLessThanOrEqual(10);
    expect(Math.abs(boxes[0].y + boxes[0].h / 2)).toBeLessThanOrEqual(10);
    for (let i = 1; i < boxes.length; i++) {
      expect(boxes[i].x).toBeGreaterThan(boxes[i - 1].x - boxes[i].w); // moved on, down and right
      expect(boxes[i].y).toBeGreaterThan(boxes[i - 1].y);
      expect((boxes[i].x - boxes[0].x) % CASCADE_STEP).toBe(0);
    }
    for (const a of boxes) for (const b of boxes) if (a !== b) expect(a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h).toBe(false);
    expect(editor().selection).toEqual([parts[3].id]);
  });

  it('steps a clicked part off a part already at the centre of the view', async () => {
    resetEditor();
    resetCascade();
    renderPalette();
    const user = userEvent.setup();
    editor().addPart('battery', { x: -60, y: -40 });
    await user.click(screen.getByRole('button', { name: /^Fuse / }));
    const [battery, fuse] = editor().doc.parts.map((p) => ({ ...p.position, ...partBox(p) }));
    expect(fuse.x < battery.x + battery.w && battery.x < fuse.x + fuse.w && fuse.y < battery.y + battery.h && battery.y < fuse.y + fuse.h).toBe(false);
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
