/**
 * A read-only drawing of a diagram document with the editor's own part and cable components, plus diff
 * marks (outline, tag with glyph and word) and comment pins. The viewport is controlled by the caller so
 * two canvases can pan and zoom together.
 */
import { memo, useCallback, useMemo, useState, type ComponentType } from 'react';
import {
  Background, BackgroundVariant, ConnectionMode, EdgeLabelRenderer, getSmoothStepPath, ReactFlow,
  type EdgeProps, type NodeChange, type NodeMouseHandler, type NodeProps, type Viewport,
} from '@xyflow/react';
import type { DiagramDocument } from '@shared/diagram';
import { CableEdge, type CableFlowEdge } from '@/features/editor/canvas/CableEdge';
import { busbarTapSides, GRID, partBox } from '@/features/editor/canvas/geometry';
import { nodeTypes as editorNodeTypes, type PartNode, type PartNodeData } from '@/features/editor/canvas/nodes';
import { STATUS_TEXT, type DiffMark } from './marks';

export interface ViewNodeData extends PartNodeData {
  mark?: DiffMark;
  pins?: number;
  picked?: boolean;
}
type ViewNode = PartNode & { data: ViewNodeData };
type ViewEdge = CableFlowEdge & { data: CableFlowEdge['data'] & { mark?: DiffMark; pins?: number } };

function MarkTag({ mark }: { mark: DiffMark }) {
  const t = STATUS_TEXT[mark.status];
  const word = mark.status === 'changed' && mark.alsoMoved ? 'Changed, moved' : t.word;
  return (
    <span className={`bw-diff-tag bw-diff-tag-${mark.status}`} title={mark.details.join('\n') || t.word}>
      <span aria-hidden="true" className="bw-diff-glyph">{t.glyph}</span>
      {word}
    </span>
  );
}

function PinTag({ count }: { count: number }) {
  return (
    <span className="bw-pin-tag" title={`${count} open comment${count === 1 ? '' : 's'} pinned here`}>
      <svg width="10" height="10" viewBox="0 0 12 12" aria-hidden="true" focusable="false">
        <path d="M2 2h8v6H6l-2.5 2.2V8H2z" fill="currentColor" />
      </svg>
      {count}
      <span className="sr-only"> open comment{count === 1 ? '' : 's'}</span>
    </span>
  );
}

/** Each editor node, with the diff tag and comment pin drawn on top (module scope: stable types). */
const viewNodeTypes = Object.fromEntries(
  Object.entries(editorNodeTypes).map(([type, Inner]) => {
    const C = Inner as ComponentType<NodeProps<PartNode>>;
    const View = memo(function ViewNode(props: NodeProps<ViewNode>) {
      const { mark, pins } = props.data;
      return (
        <>
          <C {...(props as unknown as NodeProps<PartNode>)} />
          {mark || pins ? (
            <span className="bw-view-tags">
              {mark ? <MarkTag mark={mark} /> : null}
              {pins ? <PinTag count={pins} /> : null}
            </span>
          ) : null}
        </>
      );
    });
    return [type, View];
  }),
);

const ViewCableEdge = memo(function ViewCableEdge(props: EdgeProps<ViewEdge>) {
  const { sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, data } = props;
  const [, labelX, labelY] = getSmoothStepPath({ sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, borderRadius: 8, offset: 18 });
  return (
    <>
      <CableEdge {...(props as unknown as EdgeProps<CableFlowEdge>)} />
      {data?.mark || data?.pins ? (
        <EdgeLabelRenderer>
          <span className="bw-view-tags bw-edge-tags nodrag nopan" style={{ transform: `translate(-50%, -100%) translate(${labelX}px, ${labelY - 12}px)` }}>
            {data.mark ? <MarkTag mark={data.mark} /> : null}
            {data.pins ? <PinTag count={data.pins} /> : null}
          </span>
        </EdgeLabelRenderer>
      ) : null}
    </>
  );
});
const viewEdgeTypes = { cable: ViewCableEdge };

/** Bounds of the named parts (all parts when `ids` is empty) in canvas units, or null. */
export function partsBounds(doc: DiagramDocument, ids: readonly string[] = []) {
  const want = ids.length ? new Set(ids) : null;
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  for (const p of doc.parts) {
    if (want && !want.has(p.id)) continue;
    const b = partBox(p);
    x0 = Math.min(x0, p.position.x);
    y0 = Math.min(y0, p.position.y);
    x1 = Math.max(x1, p.position.x + b.w);
    y1 = Math.max(y1, p.position.y + b.h);
  }
  return Number.isFinite(x0) ? { x: x0, y: y0, width: x1 - x0, height: y1 - y0 } : null;
}

export function unionBounds(...rects: ({ x: number; y: number; width: number; height: number } | null)[]) {
  const rs = rects.filter((r): r is NonNullable<typeof r> => !!r);
  if (!rs.length) return null;
  const x0 = Math.min(...rs.map((r) => r.x));
  const y0 = Math.min(...rs.map((r) => r.y));
  const x1 = Math.max(...rs.map((r) => r.x + r.width));
  const y1 = Math.max(...rs.map((r) => r.y + r.height));
  return { x: x0, y: y0, width: x1 - x0, height: y1 - y0 };
}

export interface DiagramCanvasProps {
  doc: DiagramDocument;
  marks?: Map<string, DiffMark>;
  /** Open comments per part or cable id. */
  pins?: Map<string, number>;
  /** A part or cable picked for a comment (outlined). */
  picked?: string | null;
  viewport: Viewport;
  onViewportChange: (v: Viewport) => void;
  onPick?: (id: string) => void;
  label: string;
}

export function DiagramCanvas({ doc, marks, pins, picked = null, viewport, onViewportChange, onPick, label }: DiagramCanvasProps) {
  // Measured sizes go back into the node objects: a node object made anew (a mark or pin changed) keeps
  // its handles' positions, so its cables stay drawn.
  const [measured, setMeasured] = useState(() => new Map<string, { width: number; height: number }>());
  const onNodesChange = useCallback((changes: NodeChange<ViewNode>[]) => {
    const dims = changes.filter((c) => c.type === 'dimensions' && c.dimensions);
    if (!dims.length) return;
    setMeasured((prev) => {
      let next: Map<string, { width: number; height: number }> | null = null;
      for (const c of dims) {
        if (c.type !== 'dimensions' || !c.dimensions) continue;
        const old = prev.get(c.id);
        if (old && old.width === c.dimensions.width && old.height === c.dimensions.height) continue;
        next ??= new Map(prev);
        next.set(c.id, { width: c.dimensions.width, height: c.dimensions.height });
      }
      return next ?? prev;
    });
  }, []);

  const nodes = useMemo<ViewNode[]>(() => {
    const sides = busbarTapSides(doc.parts, doc.cables);
    return doc.parts.map((part) => {
      const mark = marks?.get(part.id);
      const pinCount = pins?.get(part.id) ?? 0;
      const m = measured.get(part.id);
      return {
        ...(m ? { measured: m } : {}),
        id: part.id,
        type: part.type,
        position: part.position,
        data: { part, tapSide: sides.get(part.id) ?? 'bottom', readOnly: true, mark, pins: pinCount, picked: picked === part.id },
        draggable: false,
        connectable: false,
        selectable: false,
        className: `${mark ? `bw-diff-node bw-diff-${mark.status}` : ''}${picked === part.id ? ' bw-picked' : ''}`,
      };
    });
  }, [doc, marks, pins, picked, measured]);

  const edges = useMemo<ViewEdge[]>(
    () =>
      doc.cables.map((cable) => {
        const mark = marks?.get(cable.id);
        return {
          id: cable.id, type: 'cable', source: cable.from.part, sourceHandle: cable.from.terminal,
          target: cable.to.part, targetHandle: cable.to.terminal, selectable: false, reconnectable: false,
          data: { cable, mark, pins: pins?.get(cable.id) ?? 0 },
          className: `${mark ? `bw-diff-edge bw-diff-${mark.status}` : ''}${picked === cable.id ? ' bw-picked' : ''}`,
        };
      }),
    [doc, marks, pins, picked],
  );

  const onNodeClick: NodeMouseHandler = (_, node) => onPick?.(node.id);

  return (
    <div className={`bw-canvas bw-view-canvas h-full w-full${onPick ? ' bw-pickable' : ''}`}>
      <ReactFlow<ViewNode, ViewEdge>
        nodes={nodes}
        edges={edges}
        nodeTypes={viewNodeTypes}
        edgeTypes={viewEdgeTypes}
        onNodesChange={onNodesChange}
        viewport={viewport}
        onViewportChange={onViewportChange}
        onNodeClick={onPick ? onNodeClick : undefined}
        onEdgeClick={onPick ? (_, e) => onPick(e.id) : undefined}
        // Every terminal is a source handle (as in the editor): cables land on sources only in loose mode.
        connectionMode={ConnectionMode.Loose}
        nodesDraggable={false}
        nodesConnectable={false}
        edgesReconnectable={false}
        elementsSelectable={false}
        deleteKeyCode={null}
        minZoom={0.1}
        maxZoom={3}
        proOptions={{ hideAttribution: true }}
        aria-label={label}
      >
        <Background variant={BackgroundVariant.Dots} gap={GRID * 2} size={1} color="var(--color-graphite-300)" />
      </ReactFlow>
    </div>
  );
}
