/**
 * Auto-arrange with elkjs (layered), run in elk's own web worker; this module is loaded lazily.
 * "Arrange all" lays out every part; "Arrange new parts" lays out only the given parts among
 * themselves and places the block to the right of the rest, leaving manual positions alone.
 */
import ELK, { type ElkNode } from 'elkjs/lib/elk-api';
import elkWorkerUrl from 'elkjs/lib/elk-worker.min.js?url';
import type { DiagramDocument } from '@shared/diagram';
import { partBox, rotatePlacement, terminalPlacements, GRID } from './canvas/geometry';

let elk: InstanceType<typeof ELK> | null = null;
function getElk() {
  elk ??= new ELK({ workerFactory: () => new Worker(elkWorkerUrl) });
  return elk;
}

const ELK_SIDE = { top: 'NORTH', right: 'EAST', bottom: 'SOUTH', left: 'WEST' } as const;
const snap = (v: number) => Math.round(v / GRID) * GRID;

/** New positions for `ids` (all parts when omitted), keyed by part id. */
export async function arrange(doc: DiagramDocument, ids?: string[]): Promise<Map<string, { x: number; y: number }>> {
  const only = ids ? new Set(ids) : null;
  const parts = doc.parts.filter((p) => !only || only.has(p.id));
  const inSet = new Set(parts.map((p) => p.id));
  const graph: ElkNode = {
    id: 'root',
    layoutOptions: {
      'elk.algorithm': 'layered',
      'elk.direction': 'DOWN',
      'elk.layered.spacing.nodeNodeBetweenLayers': '90',
      'elk.spacing.nodeNode': '60',
      'elk.edgeRouting': 'ORTHOGONAL',
      'elk.layered.nodePlacement.strategy': 'BRANDES_KOEPF',
      'elk.separateConnectedComponents': 'true',
    },
    children: parts.map((p) => {
      const box = partBox(p);
      return {
        id: p.id,
        width: box.w,
        height: box.h,
        layoutOptions: { 'elk.portConstraints': 'FIXED_SIDE' },
        ports: terminalPlacements(p).map((t) => ({
          id: `${p.id}\u0000${t.terminal}`,
          width: 6,
          height: 6,
          layoutOptions: { 'elk.port.side': ELK_SIDE[rotatePlacement(t, p.rotation).side] },
        })),
      };
    }),
    edges: doc.cables
      .filter((c) => inSet.has(c.from.part) && inSet.has(c.to.part) && c.from.part !== c.to.part)
      .map((c) => ({ id: c.id, sources: [`${c.from.part}\u0000${c.from.terminal}`], targets: [`${c.to.part}\u0000${c.to.terminal}`] })),
  };
  const out = await getElk().layout(graph);
  let dx = 0;
  let dy = 0;
  if (only) {
    // Beside the parts that keep their places.
    const rest = doc.parts.filter((p) => !inSet.has(p.id));
    if (rest.length) {
      dx = Math.max(...rest.map((p) => p.position.x + partBox(p).w)) + 120;
      dy = Math.min(...rest.map((p) => p.position.y));
    }
  }
  const positions = new Map<string, { x: number; y: number }>();
  for (const n of out.children ?? []) positions.set(n.id, { x: snap((n.x ?? 0) + dx), y: snap((n.y ?? 0) + dy) });
  return positions;
}
