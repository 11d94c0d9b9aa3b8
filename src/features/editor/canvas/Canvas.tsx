/**
 * The drawing surface. Nodes and edges are derived from the document (memoised, with unchanged parts
 * keeping their node objects so memoised nodes skip rendering); React Flow's changes are turned into
 * store edits (moves, selection) rather than stored. A drag's positions stay local to the canvas until
 * the drop, which commits them to the store as one step.
 */
import { useCallback, useEffect, useMemo, useRef, useState, type DragEvent } from 'react';
import {
  Background, BackgroundVariant, ConnectionMode, Controls, MiniMap, ReactFlow, useNodesInitialized, useReactFlow,
  type Connection, type Edge, type EdgeChange, type IsValidConnection, type NodeChange,
} from '@xyflow/react';
import type { DiagramCable, DiagramDocument, DiagramPart } from '@shared/diagram';
import { compileDiagram } from '@shared/electrical/compile';
import { PART_TYPE_IDS, type PartType } from '@shared/electrical/parts';
import { AnnotationLayer } from '@/features/annotations/AnnotationLayer';
import { useEditorStore } from '../store';
import { toast } from '../toasts';
import { edgeTypes, type CableFlowEdge } from './CableEdge';
import { busbarTapSides, GRID, partBox } from './geometry';
import { LivePartsContext, nodeTypes, terminalPolarity, type PartNode } from './nodes';
import { PreviewBar, withPreviewEdges, type PreviewFlowEdge } from './PreviewEdge';
import { usePreviewStore } from './preview';

export const PART_DRAG_MIME = 'application/x-bankwright-part';

type Measured = { width: number; height: number };
type CanvasEdge = CableFlowEdge | PreviewFlowEdge;

/**
 * React Flow nodes from the parts. A node object is replaced only when what React Flow lays out
 * changes (position, type, rotation, selection, tap side, read-only, measured size): node components
 * read the rest of their part from the store (LivePartsContext), so a props or label edit leaves
 * React Flow's nodes untouched, and the array itself is kept when no node changed.
 */
function useDerivedNodes(parts: DiagramPart[], cables: DiagramCable[], selection: Set<string>, readOnly: boolean, measured: Map<string, Measured>, measureTick: number) {
  type Entry = { part: DiagramPart; selected: boolean; side: string; readOnly: boolean; m?: Measured; node: PartNode };
  const cache = useRef(new Map<string, Entry>());
  const last = useRef<PartNode[]>([]);
  const sides = useMemo(() => busbarTapSides(parts, cables), [parts, cables]);
  return useMemo(() => {
    void measureTick;
    const next = new Map<string, Entry>();
    let same = parts.length === last.current.length;
    const nodes = parts.map((part, i) => {
      const selected = selection.has(part.id);
      const side = sides.get(part.id) ?? 'bottom';
      const m = measured.get(part.id);
      const prev = cache.current.get(part.id);
      if (
        prev && prev.selected === selected && prev.side === side && prev.readOnly === readOnly && prev.m === m &&
        (prev.part === part || (prev.part.position === part.position && prev.part.type === part.type && prev.part.rotation === part.rotation))
      ) {
        next.set(part.id, prev);
        if (same && last.current[i] !== prev.node) same = false;
        return prev.node;
      }
      same = false;
      const node: PartNode = {
        id: part.id,
        type: part.type,
        position: part.position,
        data: { part, tapSide: side as 'top' | 'bottom', readOnly },
        selected,
        draggable: !readOnly,
        connectable: !readOnly,
        ...(m ? { measured: m } : {}),
      };
      next.set(part.id, { part, selected, side, readOnly, m, node });
      return node;
    });
    cache.current = next;
    if (same) return last.current;
    last.current = nodes;
    return nodes;
  }, [parts, sides, selection, readOnly, measured, measureTick]);
}

type Positions = ReadonlyMap<string, { x: number; y: number }>;

/** The derived nodes with the positions of a drag in progress (only the dragged nodes are new objects). */
function useDraggedNodes(nodes: PartNode[], dragged: Positions | null): PartNode[] {
  return useMemo(() => {
    if (!dragged || dragged.size === 0) return nodes;
    return nodes.map((n) => {
      const at = dragged.get(n.id);
      return at && (at.x !== n.position.x || at.y !== n.position.y) ? { ...n, position: at, dragging: true } : n;
    });
  }, [nodes, dragged]);
}

function useDerivedEdges(cables: DiagramCable[], selection: Set<string>) {
  const cache = useRef(new Map<string, { cable: DiagramCable; selected: boolean; edge: CableFlowEdge }>());
  return useMemo(() => {
    const next = new Map<string, { cable: DiagramCable; selected: boolean; edge: CableFlowEdge }>();
    const edges = cables.map((cable) => {
      const selected = selection.has(cable.id);
      const prev = cache.current.get(cable.id);
      if (prev && prev.cable === cable && prev.selected === selected) {
        next.set(cable.id, prev);
        return prev.edge;
      }
      const edge: CableFlowEdge = {
        id: cable.id, type: 'cable', source: cable.from.part, sourceHandle: cable.from.terminal,
        target: cable.to.part, targetHandle: cable.to.terminal, data: { cable }, selected,
      };
      next.set(cable.id, { cable, selected, edge });
      return edge;
    });
    cache.current = next;
    return edges;
  }, [cables, selection]);
}

/** After a new cable, say so when it makes a short through a battery (the core's structural check). */
function warnIfShort(doc: DiagramDocument, ends: string[]) {
  const compiled = compileDiagram(doc);
  if (compiled.ok) return;
  const short = compiled.errors.find((e) => (e.code === 'shorted_source' || e.code === 'reversed_polarity') && e.parts.some((p) => ends.includes(p)));
  if (short) toast('error', `Short circuit: ${short.message}`);
}

const snap = (v: number) => Math.round(v / GRID) * GRID;

export function Canvas() {
  const parts = useEditorStore((s) => s.doc.parts);
  const cables = useEditorStore((s) => s.doc.cables);
  const selectionList = useEditorStore((s) => s.selection);
  const readOnly = useEditorStore((s) => s.readOnly);
  const focusRequest = useEditorStore((s) => s.focusRequest);
  const selection = useMemo(() => new Set(selectionList), [selectionList]);
  const measured = useRef(new Map<string, Measured>()).current;
  const [measureTick, setMeasureTick] = useState(0);
  const dragKey = useRef<string | undefined>(undefined);
  const dragCount = useRef(0);
  // Positions of a drag in progress, kept here (not in the store) until the drop commits them as one
  // step: a drag frame then re-renders the canvas only, not every component that reads the document.
  const [dragged, setDragged] = useState<Positions | null>(null);
  const draggedRef = useRef<Positions | null>(null);
  const rf = useReactFlow();

  const derived = useDerivedNodes(parts, cables, selection, readOnly, measured, measureTick);
  const nodes = useDraggedNodes(derived, dragged);
  const drawn = useDerivedEdges(cables, selection);
  // A layout preview (take-off explorer) draws its ghosts over the cables; the document is untouched.
  const preview = usePreviewStore((s) => s.preview);
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const edges = useMemo(() => withPreviewEdges(drawn, preview, unitSystem), [drawn, preview, unitSystem]);

  /** Commit the drag's positions to the store (one history step) and drop the local copy. */
  const commitDrag = useCallback(() => {
    const live = draggedRef.current;
    draggedRef.current = null;
    setDragged(null);
    if (!live || live.size === 0) return;
    const store = useEditorStore.getState();
    if (!store.readOnly) store.moveParts([...live].map(([id, position]) => ({ id, position })), dragKey.current);
  }, []);

  const onNodesChange = useCallback((changes: NodeChange<PartNode>[]) => {
    const store = useEditorStore.getState();
    const moves: { id: string; position: { x: number; y: number } }[] = [];
    const live: { id: string; position: { x: number; y: number } }[] = [];
    let dropped = false;
    const sel: { id: string; selected: boolean }[] = [];
    let dims = false;
    for (const c of changes) {
      if (c.type === 'position' && c.position) {
        if (c.dragging) live.push({ id: c.id, position: c.position });
        else if (draggedRef.current) {
          // The drop: the drag's last positions, committed with the rest below.
          live.push({ id: c.id, position: c.position });
          dropped = true;
        } else moves.push({ id: c.id, position: c.position });
      } else if (c.type === 'dimensions' && c.dimensions) {
        const prev = measured.get(c.id);
        if (!prev || prev.width !== c.dimensions.width || prev.height !== c.dimensions.height) {
          measured.set(c.id, { width: c.dimensions.width, height: c.dimensions.height });
          dims = true;
        }
      } else if (c.type === 'select') sel.push({ id: c.id, selected: c.selected });
    }
    if (live.length && !store.readOnly) {
      const next = new Map(draggedRef.current ?? []);
      for (const m of live) next.set(m.id, m.position);
      draggedRef.current = next;
      if (dropped) commitDrag();
      else setDragged(next);
    }
    if (moves.length && !store.readOnly) store.moveParts(moves, dragKey.current);
    if (sel.length) store.setSelectedMany(sel);
    if (dims) setMeasureTick((t) => t + 1);
  }, [measured, commitDrag]);

  const onEdgesChange = useCallback((changes: EdgeChange<CanvasEdge>[]) => {
    const sel = changes.flatMap((c) => (c.type === 'select' && !c.id.startsWith('preview:') ? [{ id: c.id, selected: c.selected }] : []));
    if (sel.length) useEditorStore.getState().setSelectedMany(sel);
  }, []);

  const onDragStart = useCallback(() => {
    dragCount.current += 1;
    dragKey.current = String(dragCount.current);
  }, []);
  const onDragStop = useCallback(() => {
    // React Flow reports the drop as a position change first; commit here too in case it did not.
    commitDrag();
    dragKey.current = undefined;
  }, [commitDrag]);

  const isValidConnection = useCallback<IsValidConnection<Edge>>((c) => {
    // Never a terminal to itself, nor to the same part's other terminal.
    return !!c.source && !!c.target && c.source !== c.target && !!c.sourceHandle && !!c.targetHandle;
  }, []);

  const onConnect = useCallback((c: Connection) => {
    if (!c.sourceHandle || !c.targetHandle || c.source === c.target) return;
    const store = useEditorStore.getState();
    const id = store.addCable({ part: c.source, terminal: c.sourceHandle }, { part: c.target, terminal: c.targetHandle });
    if (!id) return;
    const doc = useEditorStore.getState().doc;
    const a = doc.parts.find((p) => p.id === c.source);
    const b = doc.parts.find((p) => p.id === c.target);
    const pa = terminalPolarity(a, c.sourceHandle);
    const pb = terminalPolarity(b, c.targetHandle);
    if (pa && pb && pa !== pb) {
      warnIfShort(doc, [c.source, c.target]);
    }
    store.select([id]);
  }, []);

  const onReconnect = useCallback((old: Edge, c: Connection) => {
    if (!c.sourceHandle || !c.targetHandle) return;
    const store = useEditorStore.getState();
    if (c.source === old.source && c.sourceHandle === old.sourceHandle) store.moveCableEnd(old.id, 'to', { part: c.target, terminal: c.targetHandle });
    else store.moveCableEnd(old.id, 'from', { part: c.source, terminal: c.sourceHandle });
  }, []);

  const onDragOver = useCallback((e: DragEvent) => {
    if (e.dataTransfer.types.includes(PART_DRAG_MIME)) {
      e.preventDefault();
      e.dataTransfer.dropEffect = 'copy';
    }
  }, []);

  const onDrop = useCallback((e: DragEvent) => {
    const type = e.dataTransfer.getData(PART_DRAG_MIME) as PartType;
    if (!(PART_TYPE_IDS as readonly string[]).includes(type)) return;
    e.preventDefault();
    const at = rf.screenToFlowPosition({ x: e.clientX, y: e.clientY });
    const id = placePart(type, at);
    // Dropped where the user wanted it: not a candidate for "Arrange new parts".
    if (id) useEditorStore.getState().clearFresh([id]);
  }, [rf]);

  // Fit once, when the first nodes have been measured.
  const initialized = useNodesInitialized();
  // An empty canvas at open is not fitted later, when the first part is placed.
  const fitted = useRef(parts.length === 0);
  useEffect(() => {
    if (initialized && !fitted.current) {
      fitted.current = true;
      void rf.fitView({ padding: 0.15, maxZoom: 1.25 });
    }
  }, [initialized, rf]);

  useEffect(() => {
    if (!focusRequest) return;
    const doc = useEditorStore.getState().doc;
    let ids = focusRequest.ids;
    if (ids.length) {
      // Cables are framed by the parts at their ends.
      const partIds = new Set(doc.parts.map((p) => p.id));
      ids = [...new Set(ids.flatMap((id) => (partIds.has(id) ? [id] : doc.cables.filter((c) => c.id === id).flatMap((c) => [c.from.part, c.to.part]))))];
    }
    // Wait a frame so freshly added nodes are measured.
    const t = requestAnimationFrame(() => {
      void rf.fitView({ ...(ids.length ? { nodes: ids.map((id) => ({ id })) } : {}), padding: 0.25, duration: 250, maxZoom: 1.4 });
    });
    return () => cancelAnimationFrame(t);
  }, [focusRequest, rf]);

  // The flow element is kept while its inputs are: a props edit re-renders the canvas (its parts
  // changed) but hands React Flow the same nodes, so nothing under it needs to render again.
  const flow = useMemo(
    () => (
      <ReactFlow<PartNode, CanvasEdge>
        nodes={nodes}
        edges={edges}
        nodeTypes={nodeTypes}
        edgeTypes={edgeTypes}
        onNodesChange={onNodesChange}
        onEdgesChange={onEdgesChange}
        onNodeDragStart={onDragStart}
        onNodeDragStop={onDragStop}
        onSelectionDragStart={onDragStart}
        onSelectionDragStop={onDragStop}
        onConnect={onConnect}
        onReconnect={onReconnect}
        isValidConnection={isValidConnection}
        connectionMode={ConnectionMode.Loose}
        nodesDraggable={!readOnly}
        nodesConnectable={!readOnly}
        edgesReconnectable={!readOnly}
        deleteKeyCode={null}
        multiSelectionKeyCode={['Shift', 'Meta', 'Control']}
        selectionKeyCode="Shift"
        snapToGrid
        snapGrid={[GRID, GRID]}
        minZoom={0.1}
        maxZoom={3}
        proOptions={{ hideAttribution: true }}
        connectionRadius={24}
        aria-label="Diagram canvas"
      >
        <Background variant={BackgroundVariant.Dots} gap={GRID * 2} size={1} color="var(--color-graphite-300)" />
        <MiniMap pannable zoomable ariaLabel="Overview of the diagram" nodeStrokeWidth={2} className="bw-minimap" />
        <Controls showInteractive={false} aria-label="Zoom controls" />
        <AnnotationLayer />
        <PreviewBar />
      </ReactFlow>
    ),
    [nodes, edges, readOnly, onNodesChange, onEdgesChange, onDragStart, onDragStop, onConnect, onReconnect, isValidConnection],
  );

  return (
    <div className="bw-canvas h-full w-full" onDragOver={onDragOver} onDrop={onDrop}>
      <LivePartsContext.Provider value={true}>
        {flow}
      </LivePartsContext.Provider>
    </div>
  );
}

/** Add a part centred on a canvas point (snapped to the grid). */
export function placePart(type: PartType, centre: { x: number; y: number }): string | null {
  const store = useEditorStore.getState();
  const probe = { type, rotation: 0, props: type === 'busbar' ? { tapCount: 6 } : {} } as DiagramPart;
  const box = partBox(probe);
  let at = { x: snap(centre.x - box.w / 2), y: snap(centre.y - box.h / 2) };
  // Do not stack a new part exactly on one already there: step down and right until free.
  const taken = new Set(store.doc.parts.map((p) => `${p.position.x},${p.position.y}`));
  for (let i = 0; i < 50 && taken.has(`${at.x},${at.y}`); i++) at = { x: at.x + GRID * 3, y: at.y + GRID * 3 };
  return store.addPart(type, at);
}
