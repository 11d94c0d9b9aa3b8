/** Test helpers: a document in the editor with its results as the compute worker would post them, and the canvas at a fixed size. */
import { render } from '@testing-library/react';
import { ReactFlowProvider } from '@xyflow/react';
import type { ReactNode } from 'react';
import type { DiagramDocument } from '@shared/diagram';
import type { AnalysisMode, AnalysisResult } from '@shared/electrical';
import { Canvas } from '@/features/editor/canvas/Canvas';
import { computeCanvas } from '@/features/editor/results/compute';
import { useEditorStore } from '@/features/editor/store';

/** Load `doc` into the editor with the core's analysis of it in `mode`; returns that analysis. */
export function openInEditor(
  doc: DiagramDocument,
  { mode = 'load', readOnly = false, unitSystem = 'metric' }: { mode?: AnalysisMode; readOnly?: boolean; unitSystem?: 'metric' | 'us' } = {},
): AnalysisResult {
  const store = useEditorStore.getState();
  store.load(doc, { diagramId: 'd1', readOnly, unitSystem });
  store.setAnalysis({ mode });
  const { canvas, raw } = computeCanvas(doc, { mode });
  store.setResults({ seq: 1, stage: 'full', mode, canvas, raw, elapsed_ms: 0 }, 'ready');
  return raw as AnalysisResult;
}

/** The canvas at 1200 × 800 (React Flow needs a sized parent), after any other panels. */
export function renderWithCanvas(before: ReactNode = null) {
  return render(
    <>
      {before}
      <div style={{ width: 1200, height: 800 }}>
        <ReactFlowProvider>
          <Canvas />
        </ReactFlowProvider>
      </div>
    </>,
  );
}
