/**
 * The annotation layer over the canvas: highlights, callouts with their leaders, step discs on their
 * parts, free notes. Drawn inside React Flow's viewport (canvas units), so it pans and zooms with the
 * drawing and an export of the viewport carries it. It takes no pointer events.
 */
import './annotations.css';
import { memo, useMemo } from 'react';
import { ViewportPortal } from '@xyflow/react';
import { drawableAnnotations, type Annotation } from '@shared/diagram/annotations';
import { useEditorStore } from '@/features/editor/store';
import { selectLayerShown, useAnnotationUi } from './state';
import { CALLOUT_WIDTH, NOTE_WIDTH, STEP_DISC, calloutPlacement, highlightBox, partBoxes, type PartBoxes } from './geometry';

function Marks({ annotations, boxes, activeId }: { annotations: Annotation[]; boxes: PartBoxes; activeId: string | null }) {
  const leaders: { id: string; x1: number; y1: number; x2: number; y2: number }[] = [];
  const items: React.ReactNode[] = [];
  for (const a of annotations) {
    const active = a.id === activeId ? ' bw-ann-active' : '';
    switch (a.kind) {
      case 'highlight': {
        const b = highlightBox(a.partIds, boxes);
        if (!b) break;
        items.push(
          <div key={a.id} className={`bw-ann-highlight${active}`} data-annotation-id={a.id} style={{ left: b.x, top: b.y, width: b.w, height: b.h }}>
            {a.label ? <span className="bw-ann-highlight-label">{a.label}</span> : null}
          </div>,
        );
        break;
      }
      case 'callout': {
        const pb = boxes.get(a.partId);
        if (!pb) break;
        const { anchor, bubble } = calloutPlacement(pb);
        leaders.push({ id: a.id, x1: anchor.x, y1: anchor.y, x2: bubble.x + 10, y2: bubble.y + 18 });
        items.push(
          <div key={a.id} className={`bw-ann-callout${active}`} data-annotation-id={a.id} style={{ left: bubble.x, top: bubble.y, width: 'max-content', maxWidth: CALLOUT_WIDTH }}>
            {a.text}
          </div>,
        );
        break;
      }
      case 'step':
        a.partIds.forEach((pid, i) => {
          const pb = boxes.get(pid);
          if (!pb) return;
          items.push(
            <div
              key={`${a.id}:${i}`}
              className={`bw-ann-step${active}`}
              data-annotation-id={a.id}
              title={`Step ${a.number}: ${a.text}`}
              style={{ left: pb.x - STEP_DISC / 2, top: pb.y - STEP_DISC / 2, width: STEP_DISC, height: STEP_DISC }}
            >
              {a.number}
            </div>,
          );
        });
        break;
      case 'note':
        items.push(
          <div key={a.id} className={`bw-ann-note${active}`} data-annotation-id={a.id} style={{ left: a.position.x, top: a.position.y, width: NOTE_WIDTH }}>
            {a.text}
          </div>,
        );
        break;
    }
  }
  return (
    <>
      {leaders.length ? (
        <svg className="bw-ann-svg" width="1" height="1" aria-hidden="true" focusable="false">
          {leaders.map((l) => (
            <g key={l.id}>
              <line x1={l.x1} y1={l.y1} x2={l.x2} y2={l.y2} stroke="var(--color-note-600)" strokeWidth="1.5" />
              <circle cx={l.x1} cy={l.y1} r="3" fill="var(--color-note-600)" />
            </g>
          ))}
        </svg>
      ) : null}
      {items}
    </>
  );
}

/** The layer's contents for the current document (outside React Flow too, e.g. in tests). */
export const AnnotationMarks = memo(function AnnotationMarks() {
  const entries = useEditorStore((s) => s.doc.annotations);
  const parts = useEditorStore((s) => s.doc.parts);
  const activeId = useAnnotationUi((s) => s.activeId);
  const annotations = useMemo(() => drawableAnnotations(entries), [entries]);
  const boxes = useMemo(() => partBoxes(parts), [parts]);
  if (annotations.length === 0) return null;
  return (
    <div className="bw-annotations" aria-label="Annotations" data-testid="annotation-layer">
      <Marks annotations={annotations} boxes={boxes} activeId={activeId} />
    </div>
  );
});

/** Mount inside <ReactFlow>: the layer in the viewport, when shown. */
export function AnnotationLayer() {
  const shown = useAnnotationUi(selectLayerShown);
  if (!shown) return null;
  return (
    <ViewportPortal>
      <AnnotationMarks />
    </ViewportPortal>
  );
}
