/** Where annotation marks sit, in canvas units, from the parts' boxes (no DOM measuring). */
import type { DiagramPart } from '@shared/diagram';
import type { Annotation } from '@shared/diagram/annotations';
import { partBox } from '@/features/editor/canvas/geometry';

export interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Space between a highlight's outline and the parts inside it. */
export const HIGHLIGHT_MARGIN = 14;
/** A callout bubble's width and where it sits from its part's top-right corner. */
export const CALLOUT_WIDTH = 180;
export const CALLOUT_OFFSET = { x: 28, y: -56 };
export const NOTE_WIDTH = 200;
export const STEP_DISC = 22;

export function boxOf(part: DiagramPart): Box {
  const b = partBox(part);
  return { x: part.position.x, y: part.position.y, w: b.w, h: b.h };
}

export function unionBox(boxes: Box[]): Box | null {
  if (boxes.length === 0) return null;
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  for (const b of boxes) {
    x0 = Math.min(x0, b.x);
    y0 = Math.min(y0, b.y);
    x1 = Math.max(x1, b.x + b.w);
    y1 = Math.max(y1, b.y + b.h);
  }
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}

export const grow = (b: Box, m: number): Box => ({ x: b.x - m, y: b.y - m, w: b.w + 2 * m, h: b.h + 2 * m });

export type PartBoxes = Map<string, Box>;

export function partBoxes(parts: readonly DiagramPart[]): PartBoxes {
  return new Map(parts.map((p) => [p.id, boxOf(p)]));
}

/** The highlight outline of an annotation, or null when none of its parts remain. */
export function highlightBox(ids: readonly string[], boxes: PartBoxes): Box | null {
  const u = unionBox(ids.flatMap((id) => (boxes.has(id) ? [boxes.get(id)!] : [])));
  return u ? grow(u, HIGHLIGHT_MARGIN) : null;
}

/** The callout bubble's top-left corner and its leader's anchor on the part. */
export function calloutPlacement(partBoxOf: Box): { bubble: { x: number; y: number }; anchor: { x: number; y: number } } {
  const anchor = { x: partBoxOf.x + partBoxOf.w, y: partBoxOf.y };
  return { anchor, bubble: { x: anchor.x + CALLOUT_OFFSET.x, y: anchor.y + CALLOUT_OFFSET.y } };
}

/** Roughly where the layer's marks reach (bubbles and notes are estimated at two lines of text). */
export function annotationExtent(annotations: readonly Annotation[], boxes: PartBoxes): Box | null {
  const out: Box[] = [];
  for (const a of annotations) {
    if (a.kind === 'highlight') {
      const b = highlightBox(a.partIds, boxes);
      if (b) out.push({ ...b, y: b.y - 18, h: b.h + 18 });
    } else if (a.kind === 'callout') {
      const pb = boxes.get(a.partId);
      if (pb) out.push({ ...calloutPlacement(pb).bubble, w: CALLOUT_WIDTH, h: 40 });
    } else if (a.kind === 'note') {
      out.push({ x: a.position.x, y: a.position.y, w: NOTE_WIDTH, h: 48 });
    }
  }
  return unionBox(out);
}
