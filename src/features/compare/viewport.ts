/** One viewport shared by the compare canvases: fitted to both drawings at first, framed on a change when asked. */
import { useCallback, useEffect, useRef, useState } from 'react';
import { getViewportForBounds, type Viewport } from '@xyflow/react';
import { useEditorStore } from '@/features/editor/store';
import type { UnitSystem } from '@shared/units';

type Rect = { x: number; y: number; width: number; height: number };

const MIN_ZOOM = 0.1;
const MAX_ZOOM = 3;

export function useSharedViewport(initialBounds: Rect | null) {
  const [viewport, setViewport] = useState<Viewport>({ x: 0, y: 0, zoom: 1 });
  const boxRef = useRef<HTMLDivElement | null>(null);
  const fitted = useRef(false);

  const frame = useCallback((bounds: Rect | null, maxZoom = 1.2) => {
    const el = boxRef.current;
    if (!bounds || !el) return;
    const w = el.clientWidth || 600;
    const h = el.clientHeight || 400;
    setViewport(getViewportForBounds(bounds, w, h, MIN_ZOOM, Math.min(maxZoom, MAX_ZOOM), 0.15));
  }, []);

  useEffect(() => {
    if (fitted.current || !initialBounds) return;
    const el = boxRef.current;
    if (!el) return;
    const fit = () => {
      if (fitted.current || !el.clientWidth) return;
      fitted.current = true;
      frame(initialBounds, 1);
    };
    fit();
    if (fitted.current || typeof ResizeObserver === 'undefined') return;
    const ro = new ResizeObserver(fit);
    ro.observe(el);
    return () => ro.disconnect();
  }, [initialBounds, frame]);

  return { viewport, setViewport, frame, boxRef };
}

/**
 * The editor's part and cable components read figures and units from the editor store. On the read-only
 * canvases there are no live figures (the results table carries them), and labels use the team's units.
 * The editor loads its own state again whenever it opens.
 */
export function useViewOnlyEditorStore(unitSystem: UnitSystem) {
  useEffect(() => {
    const s = useEditorStore.getState();
    if (s.results) s.setResults(null, 'idle');
    if (s.unitSystem !== unitSystem) s.setUnitSystem(unitSystem);
  }, [unitSystem]);
}
