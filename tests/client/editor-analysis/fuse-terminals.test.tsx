/**
 * A fuse's terminals on the canvas are named for what they face: terminal a the battery side,
 * terminal b the bank side, in the handle's accessible name and tooltip, with a small mark beside each.
 */
import '../editor/flow-mocks';
import { render, screen } from '@testing-library/react';
import { ReactFlowProvider } from '@xyflow/react';
import { describe, expect, it } from 'vitest';
import { busbarBankTemplate } from '@shared/diagram';
import { Canvas } from '@/features/editor/canvas/Canvas';
import { resetEditor } from '../editor/flow-mocks';

describe('fuse terminals on the canvas', () => {
  it('names terminal a "battery side" and terminal b "bank side", matching how the bank is wired', async () => {
    const doc = busbarBankTemplate({ count: 2 });
    resetEditor(doc);
    render(
      <div style={{ width: 1200, height: 800 }}>
        <ReactFlowProvider>
          <Canvas />
        </ReactFlowProvider>
      </div>,
    );
    const batterySide = await screen.findByLabelText('Fuse 1 battery side');
    const bankSide = screen.getByLabelText('Fuse 1 bank side');
    expect(batterySide).toHaveAttribute('data-handleid', 'a');
    expect(bankSide).toHaveAttribute('data-handleid', 'b');
    expect(batterySide.getAttribute('title')).toBe('Fuse 1 battery side (terminal a)');
    // The drawing agrees: the battery's own cable lands on the battery side, the busbar's on the bank side.
    const fromBattery = doc.cables.find((c) => c.from.part === 'bat1' && c.to.part === 'fuse1')!;
    expect(fromBattery.to.terminal).toBe('a');
    const toBus = doc.cables.find((c) => c !== fromBattery && (c.from.part === 'fuse1' || c.to.part === 'fuse1'))!;
    expect([toBus.from, toBus.to].find((e) => e.part === 'fuse1')!.terminal).toBe('b');
    // The small visible marks.
    const node = document.querySelector('[data-part-id="fuse1"]')!;
    expect([...node.querySelectorAll('.bw-terminal-side')].map((m) => m.textContent)).toEqual(['batt', 'bank']);
    // Batteries keep their polarity names.
    expect(screen.getByLabelText('Battery 1 positive')).toHaveAttribute('data-handleid', 'pos');
  });
});
