/**
 * Image export with html-to-image (1.11.11, pinned: it keeps React Flow's edges).
 *
 * 1. Bounds of the whole drawing: `getNodesBounds` over every node, widened to the labels that hang
 *    outside their nodes, the cable labels and (when included) the annotation marks.
 * 2. `getViewportForBounds` at zoom 1 for an image of bounds + padding, and `toPng` / `toSvg` of
 *    `.react-flow__viewport` with that transform — the whole diagram, not the visible part.
 *    The shipped font is passed as `fontEmbedCSS`; minimap, controls and panels are filtered out.
 * 3. The briefing sheet (title block, legend, caution, "not reviewed" mark) is rendered off screen
 *    around that image and captured again at the same pixel ratio (the diagram image already holds
 *    that many pixels, so nothing is lost).
 */
import { getNodesBounds, getViewportForBounds, type ReactFlowInstance, type Rect } from '@xyflow/react';
import { toPng, toSvg } from 'html-to-image';
import type { Options } from 'html-to-image/lib/types';
import { fontEmbedCss } from './fonts';
import { DIAGRAM_PADDING } from './layout';

export type ImageFormat = 'png' | 'svg';

/** Elements never drawn into an export. */
const LEFT_OUT = ['react-flow__minimap', 'react-flow__controls', 'react-flow__panel', 'react-flow__attribution', 'react-flow__selection'];

function keep(includeAnnotations: boolean) {
  return (node: HTMLElement) => {
    const cl = (node as Element).classList;
    if (!cl) return true;
    for (const c of LEFT_OUT) if (cl.contains(c)) return false;
    return includeAnnotations || !cl.contains('bw-annotations');
  };
}

const union = (a: Rect, b: Rect): Rect => {
  const x = Math.min(a.x, b.x);
  const y = Math.min(a.y, b.y);
  return { x, y, width: Math.max(a.x + a.width, b.x + b.width) - x, height: Math.max(a.y + a.height, b.y + b.height) - y };
};

/** Selectors of what may stick out of the nodes' boxes: part labels, cable labels, annotation marks. */
const OVERHANG = '.bw-part-label, .bw-cable-label';
const ANNOTATION_MARKS = '.bw-annotations [data-annotation-id], .bw-annotations .bw-ann-svg line';

/** The drawing's bounds in canvas units (zoom 1). */
export function drawingBounds(rf: ReactFlowInstance, viewportEl: HTMLElement, includeAnnotations: boolean): Rect | null {
  const nodes = rf.getNodes();
  const marks = includeAnnotations ? Array.from(viewportEl.querySelectorAll<Element>(ANNOTATION_MARKS)) : [];
  if (nodes.length === 0 && marks.length === 0) return null;
  let b: Rect | null = nodes.length ? getNodesBounds(nodes) : null;
  const toFlow = (r: DOMRect): Rect => {
    const p = rf.screenToFlowPosition({ x: r.left, y: r.top }, { snapToGrid: false });
    const q = rf.screenToFlowPosition({ x: r.right, y: r.bottom }, { snapToGrid: false });
    return { x: p.x, y: p.y, width: q.x - p.x, height: q.y - p.y };
  };
  for (const el of [...viewportEl.querySelectorAll<Element>(OVERHANG), ...marks]) {
    const r = el.getBoundingClientRect();
    if (r.width === 0 && r.height === 0) continue;
    b = b ? union(b, toFlow(r)) : toFlow(r);
  }
  return b;
}

export interface DiagramImage {
  src: string;
  /** CSS pixels at zoom 1 (the PNG holds width × pixelRatio device pixels). */
  width: number;
  height: number;
}

export function diagramImageSize(bounds: Rect) {
  return { width: Math.ceil(bounds.width + 2 * DIAGRAM_PADDING), height: Math.ceil(bounds.height + 2 * DIAGRAM_PADDING) };
}

/** The whole drawing as an image (PNG at `pixelRatio`, or SVG). */
export async function captureDiagram(
  rf: ReactFlowInstance,
  viewportEl: HTMLElement,
  opts: { format: ImageFormat; pixelRatio: number; includeAnnotations: boolean },
): Promise<DiagramImage> {
  // Labels show their full detail at zoom 1 (they shorten when zoomed out): draw at zoom 1 while capturing.
  const before = rf.getViewport();
  if (before.zoom !== 1) {
    await rf.setViewport({ x: before.x, y: before.y, zoom: 1 });
    await nextPaint();
  }
  try {
    return await captureAtZoom1(rf, viewportEl, opts);
  } finally {
    if (before.zoom !== 1) await rf.setViewport(before);
  }
}

async function captureAtZoom1(rf: ReactFlowInstance, viewportEl: HTMLElement, opts: { format: ImageFormat; pixelRatio: number; includeAnnotations: boolean }): Promise<DiagramImage> {
  const bounds = drawingBounds(rf, viewportEl, opts.includeAnnotations) ?? { x: 0, y: 0, width: 200, height: 120 };
  const { width, height } = diagramImageSize(bounds);
  const vp = getViewportForBounds(bounds, width, height, 1, 1, 0);
  const options: Options = {
    backgroundColor: '#ffffff',
    width,
    height,
    pixelRatio: opts.pixelRatio,
    fontEmbedCSS: await fontEmbedCss(viewportEl),
    filter: keep(opts.includeAnnotations),
    style: { width: `${width}px`, height: `${height}px`, transform: `translate(${vp.x}px, ${vp.y}px) scale(${vp.zoom})` },
  };
  const src = opts.format === 'png' ? await toPng(viewportEl, options) : svgAsBase64(await toSvg(viewportEl, options));
  return { src, width, height };
}

/** html-to-image's percent-encoded SVG data URL as base64 (a third smaller once nested in the sheet). */
function svgAsBase64(url: string): string {
  const text = decodeURIComponent(url.slice(url.indexOf(',') + 1));
  const bytes = new TextEncoder().encode(text);
  let bin = '';
  for (let i = 0; i < bytes.length; i += 0x8000) bin += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return `data:image/svg+xml;base64,${btoa(bin)}`;
}

/** The composed sheet element as the final image. */
export async function captureSheet(sheet: HTMLElement, format: ImageFormat, pixelRatio: number): Promise<string> {
  await Promise.all(Array.from(sheet.querySelectorAll('img')).map((img) => img.decode().catch(() => undefined)));
  const options: Options = { backgroundColor: '#ffffff', pixelRatio, fontEmbedCSS: await fontEmbedCss(sheet) };
  return format === 'png' ? toPng(sheet, options) : toSvg(sheet, options);
}

/** A data: URL as a Blob, without fetch (the page's CSP keeps connect-src to 'self'). */
export function dataUrlToBlob(url: string): Blob {
  const comma = url.indexOf(',');
  const head = url.slice(0, comma);
  const body = url.slice(comma + 1);
  const type = /^data:([^;,]+)/.exec(head)?.[1] ?? 'application/octet-stream';
  if (head.endsWith(';base64')) {
    const bin = atob(body);
    const bytes = new Uint8Array(bin.length);
    for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
    return new Blob([bytes], { type });
  }
  return new Blob([decodeURIComponent(body)], { type });
}

/** Save a Blob under a file name through a temporary link. */
export function downloadBlob(blob: Blob, fileName: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** A file-name-safe slug. */
export function slug(text: string): string {
  return text.normalize('NFKD').replace(/[^\w\s-]/g, '').trim().replace(/[\s_]+/g, '-').toLowerCase().slice(0, 60) || 'diagram';
}

/** Wait for React to paint (two frames). */
export const nextPaint = () => new Promise<void>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r())));
