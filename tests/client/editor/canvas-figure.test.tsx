// useCanvasFigure: a canvas figure re-renders only when one of its fields changes, not on every result.
import { useRef, useState } from 'react';
import { act, fireEvent, render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { useCanvasFigure, useCanvasView, useResultsText } from '@/features/editor/store';
import type { EditorResults } from '@/features/editor/results/types';

const withBattery = (current_A: number, share: number) =>
  ({ canvas: { batteries: { b1: { current_A, share } } } }) as unknown as EditorResults;

describe('useCanvasFigure', () => {
  it('keeps the same figure (no re-render) while its fields are equal, and re-renders when one changes', () => {
    let renders = 0;
    function Figure() {
      renders++;
      const f = useCanvasFigure((s) => {
        const b = s.results?.canvas.batteries.b1;
        return b ? { i: Math.round(b.current_A * 10) / 10, share: Math.round(b.share * 1000) / 1000 } : null;
      });
      return <span data-testid="fig">{f ? `${f.i} A ${f.share}` : 'none'}</span>;
    }
    act(() => useCanvasView.setState({ results: withBattery(10.01, 0.25) }));
    render(<Figure />);
    expect(screen.getByTestId('fig').textContent).toBe('10 A 0.25');
    const before = renders;
    // A new results object whose rounded figures are the same: no re-render.
    act(() => useCanvasView.setState({ results: withBattery(10.02, 0.2501) }));
    expect(renders).toBe(before);
    // The current moves by more than the shown precision: one re-render with the new figure.
    act(() => useCanvasView.setState({ results: withBattery(12.5, 0.3) }));
    expect(renders).toBe(before + 1);
    expect(screen.getByTestId('fig').textContent).toBe('12.5 A 0.3');
    act(() => useCanvasView.setState({ results: null }));
    expect(screen.getByTestId('fig').textContent).toBe('none');
  });

  it('useResultsText writes the figure into the DOM on each result without a React render, and after one', () => {
    let renders = 0;
    function Label() {
      renders++;
      const [wide, setWide] = useState(false);
      const span = useRef<HTMLSpanElement>(null);
      const amps = (s: ReturnType<typeof useCanvasView.getState>) => {
        const b = s.results?.canvas.batteries.b1;
        return b ? `${b.current_A.toFixed(1)} A` : '—';
      };
      useResultsText((s) => [amps(s)], ([text]) => {
        if (span.current) span.current.textContent = text;
      }, []);
      return (
        <button type="button" className={wide ? 'wide' : ''} onClick={() => setWide((w) => !w)}>
          <span data-testid="amps" ref={span} />
        </button>
      );
    }
    act(() => useCanvasView.setState({ results: withBattery(10, 0.25) }));
    render(<Label />);
    expect(screen.getByTestId('amps').textContent).toBe('10.0 A');
    const before = renders;
    act(() => useCanvasView.setState({ results: withBattery(12.34, 0.3) }));
    expect(screen.getByTestId('amps').textContent).toBe('12.3 A');
    expect(renders).toBe(before);
    // A render for another reason (here a click) keeps the written text, and later results still land.
    fireEvent.click(screen.getByRole('button'));
    expect(renders).toBe(before + 1);
    expect(screen.getByTestId('amps').textContent).toBe('12.3 A');
    act(() => useCanvasView.setState({ results: withBattery(7.06, 0.3) }));
    expect(screen.getByTestId('amps').textContent).toBe('7.1 A');
  });
});
